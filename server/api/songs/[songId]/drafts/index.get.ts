import { z } from 'zod'

const QuerySchema = z.object({ archived: z.enum(['0', '1']).optional() })

export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'song.view')
  const { archived } = validQuery(event, QuerySchema)
  return listDrafts(useDb(), song.id, archived === '1')
})

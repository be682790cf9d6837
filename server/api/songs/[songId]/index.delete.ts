import { eq } from 'drizzle-orm'
import { songs } from '../../../database/schema'

export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'song.delete')
  await useDb().delete(songs).where(eq(songs.id, song.id))
  setResponseStatus(event, 204)
  return null
})

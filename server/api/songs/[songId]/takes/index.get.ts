import { listTakes } from '../../../../utils/scratch'

/** The song's scratch takes, in bar order, each with its audio's address. */
export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'song.view')
  return listTakes(useDb(), song.id)
})

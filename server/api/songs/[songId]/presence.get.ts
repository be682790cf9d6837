/** Who else has this song open right now, by any server instance. */
export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'song.view')
  return listPresence(useDb(), song)
})

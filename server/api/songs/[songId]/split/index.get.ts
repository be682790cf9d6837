/** The song's working split sheet, its total and what it lacks before sealing. */
export default defineEventHandler(async (event) => {
  const { song, user } = await requireSongAccess(event, 'song.view')
  return splitView(useDb(), song.id, user.id)
})

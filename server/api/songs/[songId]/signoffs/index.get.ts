/** The song's sign-off requests, newest first, with their signers and decisions. */
export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'song.view')
  return listSignoffViews(useDb(), song.id)
})

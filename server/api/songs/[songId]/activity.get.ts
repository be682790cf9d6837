/** The song's timeline: versions, sign-off steps, seals and unseals with their reasons. */
export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'song.view')
  return songActivity(useDb(), song.id)
})

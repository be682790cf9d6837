export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'song.view')
  return listSections(song.id)
})

export default defineEventHandler(async (event) => {
  const { alt } = await requireAltAccess(event, 'song.view')
  return listAltComments(useDb(), alt.id)
})

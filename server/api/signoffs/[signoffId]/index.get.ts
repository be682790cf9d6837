export default defineEventHandler(async (event) => {
  const { request } = await requireSignoffAccess(event, 'song.view')
  return loadSignoffView(useDb(), request.id)
})

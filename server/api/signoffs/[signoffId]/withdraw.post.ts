/** Whoever asked (or an owner) takes an open sign-off back. */
export default defineEventHandler(async (event) => {
  const { request, song, user, role } = await requireSignoffAccess(event, 'signoff.request')
  const db = useDb()
  await withdrawSignoff(db, { request, song, user, role })
  return loadSignoffView(db, request.id)
})

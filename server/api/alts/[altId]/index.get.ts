/** One alt with its tallies, my vote and comment count. */
export default defineEventHandler(async (event) => {
  const { alt, user } = await requireAltAccess(event, 'song.view')
  const [view] = await listAlts(useDb(), alt.draftId, user.id, { altId: alt.id })
  if (!view) throw notFound('Alt')
  return view
})

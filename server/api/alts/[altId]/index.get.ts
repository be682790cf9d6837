/** One alt with its tallies, my vote and comment count. */
export default defineEventHandler(async (event) => {
  const { alt, draft, user, crewId } = await requireAltAccess(event, 'song.view')
  const [view] = await withAltFigures(useDb(), draft, crewId, await listAlts(useDb(), alt.draftId, user.id, { altId: alt.id }))
  if (!view) throw notFound('Alt')
  return view
})

/** Passes the alt: it stays on record, marked passed; the draft does not change. */
export default defineEventHandler(async (event) => {
  const { alt, song, user } = await requireAltAccess(event, 'alt.decide')
  await passAlt(useDb(), { alt, song, user })
  const [view] = await listAlts(useDb(), alt.draftId, user.id, { altId: alt.id })
  return view
})

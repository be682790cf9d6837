/** Takes the alt: a new version with its line replaced; the alt is recorded as taken. */
export default defineEventHandler(async (event) => {
  const { alt, song, user } = await requireAltAccess(event, 'alt.decide')
  const result = await takeAlt(useDb(), { alt, song, user })
  setResponseStatus(event, 201)
  const [view] = await listAlts(useDb(), alt.draftId, user.id, { altId: alt.id })
  return { version: result.version, alt: view }
})

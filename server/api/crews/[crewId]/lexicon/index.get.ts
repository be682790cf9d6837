export default defineEventHandler(async (event) => {
  const crewId = idParam(event, 'crewId', 'Crew')
  await requireCrewAccess(event, crewId, 'lexicon.view')
  const rows = await listLexicon(crewId)
  return rows.map(lexiconJson)
})

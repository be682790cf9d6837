import { LexiconEntrySchema } from '../../../../../shared/schemas/prosody'
import { lexiconEntries } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const crewId = idParam(event, 'crewId', 'Crew')
  const { user } = await requireCrewAccess(event, crewId, 'lexicon.edit')
  const body = await validBody(event, LexiconEntrySchema)
  const taught = taughtPhones(body)
  const [row] = await useDb().insert(lexiconEntries)
    .values({ crewId, word: body.word, ...taught, createdBy: user.id })
    .onConflictDoNothing({ target: [lexiconEntries.crewId, lexiconEntries.word] })
    .returning()
  if (!row) throw createError({ statusCode: 409, message: `The crew already has "${body.word}" in its lexicon; edit that entry instead.`, data: { fields: { word: 'Already in the lexicon.' } } })
  await lexiconChanged(crewId)
  setResponseStatus(event, 201)
  return lexiconJson(row)
})

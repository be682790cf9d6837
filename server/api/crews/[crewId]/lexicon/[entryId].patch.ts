import { and, eq } from 'drizzle-orm'
import { LexiconPatchSchema } from '../../../../../shared/schemas/prosody'
import { lexiconEntries } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const crewId = idParam(event, 'crewId', 'Crew')
  await requireCrewAccess(event, crewId, 'lexicon.edit')
  const entryId = idParam(event, 'entryId', 'Lexicon entry')
  const body = await validBody(event, LexiconPatchSchema)
  const changes: Partial<typeof lexiconEntries.$inferInsert> = {}
  if (body.word) changes.word = body.word
  if (body.phones || body.soundsLike) Object.assign(changes, taughtPhones(body))
  if (!Object.keys(changes).length) throw createError({ statusCode: 400, message: 'Nothing to change: send word, phones or soundsLike.' })
  const [row] = await useDb().update(lexiconEntries).set(changes)
    .where(and(eq(lexiconEntries.id, entryId), eq(lexiconEntries.crewId, crewId)))
    .returning()
  if (!row) throw notFound('Lexicon entry')
  await lexiconChanged(crewId)
  return lexiconJson(row)
})

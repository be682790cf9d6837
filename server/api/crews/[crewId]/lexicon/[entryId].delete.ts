import { and, eq } from 'drizzle-orm'
import { lexiconEntries } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const crewId = idParam(event, 'crewId', 'Crew')
  await requireCrewAccess(event, crewId, 'lexicon.edit')
  const entryId = idParam(event, 'entryId', 'Lexicon entry')
  const [row] = await useDb().delete(lexiconEntries)
    .where(and(eq(lexiconEntries.id, entryId), eq(lexiconEntries.crewId, crewId)))
    .returning({ id: lexiconEntries.id })
  if (!row) throw notFound('Lexicon entry')
  await lexiconChanged(crewId)
  setResponseStatus(event, 204)
  return null
})

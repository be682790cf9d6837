import { and, eq, isNull } from 'drizzle-orm'
import { MergeSaveSchema } from '../../../../shared/schemas/versions'
import { drafts, sideSaves, songs } from '../../../database/schema'

/**
 * Saves the merge of a kept-aside save with the head as a new version (kind 'merge') and
 * marks the kept-aside save resolved by it, in one transaction. When the head moved again
 * the merge is itself kept aside (409, as any stale save), and the original stays open.
 */
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const sideSaveId = idParam(event, 'sideSaveId', 'Kept-aside save')
  const db = useDb()
  const [row] = await db.select({ side: sideSaves, draft: drafts, crewId: songs.crewId }).from(sideSaves)
    .innerJoin(drafts, eq(drafts.id, sideSaves.draftId))
    .innerJoin(songs, eq(songs.id, drafts.songId))
    .where(eq(sideSaves.id, sideSaveId))
  if (!row) throw notFound('Kept-aside save')
  await requireCrewAccess(event, row.crewId, 'version.save', 'Kept-aside save')
  const body = await validBody(event, MergeSaveSchema)
  if (row.side.authorId !== user.id) throw createError({ statusCode: 403, message: 'Only its author merges a kept-aside save.' })
  if (row.side.resolvedAt) throw createError({ statusCode: 409, message: 'This kept-aside save was already resolved.' })
  const doc = await documentFor(row.draft.songId, body.lines, body.doc)
  const result = await db.transaction(async (tx) => {
    const saved = await saveVersion(tx, {
      draft: row.draft, authorId: user.id, baseVersionId: body.baseVersionId, lines: body.lines, doc, kind: 'merge',
      note: body.note || 'Merged a kept-aside save',
    })
    if (saved.saved) {
      const [resolved] = await tx.update(sideSaves).set({ resolvedAt: new Date(), resolvedVersionId: saved.version.id })
        .where(and(eq(sideSaves.id, sideSaveId), isNull(sideSaves.resolvedAt))).returning({ id: sideSaves.id })
      if (!resolved) throw createError({ statusCode: 409, message: 'This kept-aside save was already resolved.' })
    }
    return saved
  })
  if (!result.saved) throw staleSaveError(result)
  setResponseStatus(event, 201)
  return result.version
})

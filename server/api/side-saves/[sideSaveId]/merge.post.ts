import { and, eq, isNull } from 'drizzle-orm'
import { MergeSaveSchema } from '../../../../shared/schemas/versions'
import { sideSaves } from '../../../database/schema'

/**
 * Saves the merge of a kept-aside save with the head as a new version (kind 'merge') and
 * marks the kept-aside save resolved by it, in one transaction. When the head moved again
 * the merge is itself kept aside (409, as any stale save), and the original stays open.
 */
export default defineEventHandler(async (event) => {
  const { user, side, draft } = await requireSideSaveAccess(event, 'version.save')
  const db = useDb()
  const body = await validBody(event, MergeSaveSchema)
  if (side.authorId !== user.id) throw createError({ statusCode: 403, message: 'Only its author merges a kept-aside save.' })
  if (side.resolvedAt) throw createError({ statusCode: 409, message: 'This kept-aside save was already resolved.' })
  const doc = await documentFor(draft.songId, body.lines, body.doc)
  const result = await db.transaction(async (tx) => {
    const saved = await saveVersion(tx, {
      draft, authorId: user.id, baseVersionId: body.baseVersionId, lines: body.lines, doc, kind: 'merge',
      note: body.note || 'Merged a kept-aside save',
    })
    if (saved.saved) {
      const [resolved] = await tx.update(sideSaves).set({ resolvedAt: new Date(), resolvedVersionId: saved.version.id })
        .where(and(eq(sideSaves.id, side.id), isNull(sideSaves.resolvedAt))).returning({ id: sideSaves.id })
      if (!resolved) throw createError({ statusCode: 409, message: 'This kept-aside save was already resolved.' })
    }
    return saved
  })
  if (!result.saved) throw staleSaveError(result)
  setResponseStatus(event, 201)
  return result.version
})

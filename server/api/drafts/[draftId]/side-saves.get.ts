import { and, desc, eq, isNull } from 'drizzle-orm'
import { sideSaves, users } from '../../../database/schema'

/** Saves refused as stale and kept aside, not yet resolved. */
export default defineEventHandler(async (event) => {
  const { draft } = await requireDraftAccess(event, 'song.view')
  return useDb().select({
    id: sideSaves.id,
    authorId: sideSaves.authorId,
    authorName: users.name,
    baseVersionId: sideSaves.baseVersionId,
    headVersionId: sideSaves.headVersionId,
    note: sideSaves.note,
    lines: sideSaves.lines,
    createdAt: sideSaves.createdAt,
  }).from(sideSaves)
    .innerJoin(users, eq(users.id, sideSaves.authorId))
    .where(and(eq(sideSaves.draftId, draft.id), isNull(sideSaves.resolvedAt)))
    .orderBy(desc(sideSaves.createdAt))
})

import { desc, eq } from 'drizzle-orm'
import { users, versions } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const { draft } = await requireDraftAccess(event, 'song.view')
  return useDb().select({
    id: versions.id,
    number: versions.number,
    authorId: versions.authorId,
    authorName: users.name,
    kind: versions.kind,
    note: versions.note,
    createdAt: versions.createdAt,
    parentId: versions.parentId,
  }).from(versions)
    .leftJoin(users, eq(users.id, versions.authorId))
    .where(eq(versions.draftId, draft.id))
    .orderBy(desc(versions.number))
})

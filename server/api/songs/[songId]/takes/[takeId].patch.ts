import { eq } from 'drizzle-orm'
import { ScratchRenameSchema } from '../../../../../shared/schemas/scratch'
import { scratchTakes, users } from '../../../../database/schema'
import { requireTakeAccess, takeView } from '../../../../utils/scratch'

/** Renames one's own take. */
export default defineEventHandler(async (event) => {
  await requireUser(event)
  const body = await validBody(event, ScratchRenameSchema)
  const { take } = await requireTakeAccess(event, 'scratch.record', true)
  const db = useDb()
  const [updated] = await db.update(scratchTakes).set({ name: body.name }).where(eq(scratchTakes.id, take.id)).returning()
  if (!updated) throw notFound('Take')
  const [author] = updated.authorId ? await db.select({ name: users.name }).from(users).where(eq(users.id, updated.authorId)) : []
  return takeView(updated, author?.name ?? null)
})

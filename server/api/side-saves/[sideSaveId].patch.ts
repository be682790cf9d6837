import { and, eq, isNull } from 'drizzle-orm'
import { z } from 'zod'
import { sideSaves, versions } from '../../database/schema'

const BodySchema = z.object({
  /** The version that took this text in (merge), or absent when it is set aside for good. */
  resolvedVersionId: z.uuid({ error: 'resolvedVersionId must be a version id.' }).nullable().default(null),
})

/** Marks a kept-aside save as resolved by its author; its text stays in the database. */
export default defineEventHandler(async (event) => {
  const { user, side } = await requireSideSaveAccess(event, 'version.save')
  const db = useDb()
  const { resolvedVersionId } = await validBody(event, BodySchema)
  if (side.authorId !== user.id) throw createError({ statusCode: 403, message: 'Only its author resolves a kept-aside save.' })
  if (resolvedVersionId) {
    const [v] = await db.select({ id: versions.id }).from(versions).where(and(eq(versions.id, resolvedVersionId), eq(versions.draftId, side.draftId)))
    if (!v) throw notFound('Version')
  }
  const [updated] = await db.update(sideSaves).set({ resolvedAt: new Date(), resolvedVersionId })
    .where(and(eq(sideSaves.id, side.id), isNull(sideSaves.resolvedAt))).returning({ id: sideSaves.id })
  if (!updated) throw createError({ statusCode: 409, message: 'This kept-aside save was already resolved.' })
  return { id: updated.id, resolved: true }
})

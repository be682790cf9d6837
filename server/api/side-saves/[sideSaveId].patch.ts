import { and, eq, isNull } from 'drizzle-orm'
import { z } from 'zod'
import { drafts, sideSaves, songs, versions } from '../../database/schema'

const BodySchema = z.object({
  /** The version that took this text in (merge), or absent when it is set aside for good. */
  resolvedVersionId: z.uuid({ error: 'resolvedVersionId must be a version id.' }).nullable().default(null),
})

/** Marks a kept-aside save as resolved by its author; its text stays in the database. */
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const sideSaveId = idParam(event, 'sideSaveId', 'Kept-aside save')
  const db = useDb()
  const [row] = await db.select({ side: sideSaves, crewId: songs.crewId }).from(sideSaves)
    .innerJoin(drafts, eq(drafts.id, sideSaves.draftId))
    .innerJoin(songs, eq(songs.id, drafts.songId))
    .where(eq(sideSaves.id, sideSaveId))
  if (!row) throw notFound('Kept-aside save')
  await requireCrewAccess(event, row.crewId, 'version.save', 'Kept-aside save')
  const { resolvedVersionId } = await validBody(event, BodySchema)
  if (row.side.authorId !== user.id) throw createError({ statusCode: 403, message: 'Only its author resolves a kept-aside save.' })
  if (resolvedVersionId) {
    const [v] = await db.select({ id: versions.id }).from(versions).where(and(eq(versions.id, resolvedVersionId), eq(versions.draftId, row.side.draftId)))
    if (!v) throw notFound('Version')
  }
  const [updated] = await db.update(sideSaves).set({ resolvedAt: new Date(), resolvedVersionId })
    .where(and(eq(sideSaves.id, sideSaveId), isNull(sideSaves.resolvedAt))).returning({ id: sideSaves.id })
  if (!updated) throw createError({ statusCode: 409, message: 'This kept-aside save was already resolved.' })
  return { id: updated.id, resolved: true }
})

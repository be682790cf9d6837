import { and, eq, ne } from 'drizzle-orm'
import { z } from 'zod'
import { draftNameField } from '../../../../shared/schemas/drafts'
import { drafts } from '../../../database/schema'

const BodySchema = z.object({
  name: draftNameField.optional(),
  archived: z.boolean().optional(),
  isMain: z.literal(true, { error: 'Make a draft main by setting isMain to true on it.' }).optional(),
}).refine(b => b.name !== undefined || b.archived !== undefined || b.isMain !== undefined, 'Send a name, archived or isMain.')

export default defineEventHandler(async (event) => {
  const { draft, song } = await requireDraftAccess(event, 'draft.edit')
  const body = await validBody(event, BodySchema)
  if (body.archived && (body.isMain || draft.isMain)) {
    throw createError({ statusCode: 409, message: 'The main draft cannot be archived. Make another draft main first.' })
  }
  const updated = await useDb().transaction(async (tx) => {
    if (body.isMain) await tx.update(drafts).set({ isMain: false }).where(and(eq(drafts.songId, song.id), ne(drafts.id, draft.id)))
    const [row] = await tx.update(drafts).set({
      ...(body.name !== undefined ? { name: body.name } : {}),
      ...(body.archived !== undefined ? { archivedAt: body.archived ? new Date() : null } : {}),
      ...(body.isMain ? { isMain: true } : {}),
    }).where(eq(drafts.id, draft.id)).returning()
    await publishSongEvent(tx, song.id, { type: 'draft', draftId: draft.id })
    return row!
  })
  return { id: updated.id, name: updated.name, isMain: updated.isMain, archivedAt: updated.archivedAt, headVersionId: updated.headVersionId }
})

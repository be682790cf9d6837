import { and, eq } from 'drizzle-orm'
import { SectionPatchSchema } from '../../../../../shared/schemas/beats'
import { sections } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'section.edit')
  const sectionId = idParam(event, 'sectionId', 'Section')
  const patch = await validBody(event, SectionPatchSchema)
  const updated = await useDb().transaction(async (tx) => {
    await lockSections(tx, song.id)
    const [current] = await tx.select().from(sections).where(and(eq(sections.id, sectionId), eq(sections.songId, song.id)))
    if (!current) throw notFound('Section')
    const next = { startBar: patch.startBar ?? current.startBar, endBar: patch.endBar ?? current.endBar }
    if (next.endBar < next.startBar) throw createError({ statusCode: 400, message: 'endBar: The last bar comes on or after the first bar.', data: { fields: { endBar: 'The last bar comes on or after the first bar.' } } })
    await refuseOverlap(tx, song.id, next, sectionId)
    await tx.update(sections).set(patch).where(eq(sections.id, sectionId))
    await renumberSections(tx, song.id)
    const [row] = await tx.select().from(sections).where(eq(sections.id, sectionId))
    return row!
  })
  return sectionView(updated)
})

import { and, eq } from 'drizzle-orm'
import { sections } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'section.edit')
  const sectionId = idParam(event, 'sectionId', 'Section')
  await useDb().transaction(async (tx) => {
    const gone = await tx.delete(sections).where(and(eq(sections.id, sectionId), eq(sections.songId, song.id))).returning({ id: sections.id })
    if (!gone.length) throw notFound('Section')
    await renumberSections(tx, song.id)
  })
  setResponseStatus(event, 204)
  return null
})

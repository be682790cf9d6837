import { eq } from 'drizzle-orm'
import { SectionCreateSchema } from '../../../../../shared/schemas/beats'
import { sections } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const { song, user } = await requireSongAccess(event, 'section.edit')
  const body = await validBody(event, SectionCreateSchema)
  const created = await useDb().transaction(async (tx) => {
    await lockSections(tx, song.id)
    await refuseOverlap(tx, song.id, body)
    const [row] = await tx.insert(sections).values({ ...body, songId: song.id, createdBy: user.id }).returning()
    await renumberSections(tx, song.id)
    const [numbered] = await tx.select().from(sections).where(eq(sections.id, row!.id))
    return numbered!
  })
  setResponseStatus(event, 201)
  return sectionView(created)
})

import { sql } from 'drizzle-orm'
import { SectionOrderSchema } from '../../../../../shared/schemas/beats'
import { rearrange } from '../../../../../shared/utils/sections'
import { sections } from '../../../../database/schema'

/** Re-arranges the song's sections in the order given; each keeps its length (see `rearrange`). */
export default defineEventHandler(async (event) => {
  const { song } = await requireSongAccess(event, 'section.edit')
  const { ids } = await validBody(event, SectionOrderSchema)
  return useDb().transaction(async (tx) => {
    await lockSections(tx, song.id)
    const current = await tx.select().from(sections).where(sql`${sections.songId} = ${song.id}`)
    const placed = rearrange(current, ids)
    if (!placed) throw createError({ statusCode: 400, message: 'Send every section of this song exactly once, in the new order.', data: { fields: { ids: 'Send every section of this song exactly once.' } } })
    // Rows pass through overlapping states on the way; the constraint is checked at commit.
    await tx.execute(sql`SET CONSTRAINTS sections_no_overlap DEFERRED`)
    for (const s of placed) {
      await tx.update(sections).set({ startBar: s.startBar, endBar: s.endBar, position: s.position }).where(sql`${sections.id} = ${s.id}`)
    }
    return placed.map(sectionView)
  })
})

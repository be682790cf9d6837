import { asc, eq, sql } from 'drizzle-orm'
import { SECTION_KIND_LABELS } from '../../shared/schemas/beats'
import { overlapping } from '../../shared/utils/sections'
import { sections, songs, type Section } from '../database/schema'
import type { DbOrTx } from './db'

export function sectionView(s: Pick<Section, 'id' | 'kind' | 'label' | 'startBar' | 'endBar' | 'position'>) {
  return { id: s.id, kind: s.kind, label: s.label, startBar: s.startBar, endBar: s.endBar, bars: s.endBar - s.startBar + 1, position: s.position }
}
export type SectionView = ReturnType<typeof sectionView>

/** A song's sections in bar order. */
export async function listSections(songId: string, db: DbOrTx = useDb()) {
  const rows = await db.select().from(sections).where(eq(sections.songId, songId)).orderBy(asc(sections.startBar))
  return rows.map(sectionView)
}

/** Serialises section edits of one song (the song row is locked for the transaction). */
export async function lockSections(tx: DbOrTx, songId: string) {
  await tx.select({ id: songs.id }).from(songs).where(eq(songs.id, songId)).for('update')
}

const name = (s: Pick<Section, 'kind' | 'label'>) => s.label || SECTION_KIND_LABELS[s.kind]

/** 409 naming the section that already holds some of these bars. */
export async function refuseOverlap(tx: DbOrTx, songId: string, range: { startBar: number, endBar: number }, except?: string) {
  const existing = await tx.select().from(sections).where(eq(sections.songId, songId))
  const clash = overlapping(existing, range, except)
  if (clash) {
    throw createError({
      statusCode: 409,
      message: `Bars ${range.startBar}–${range.endBar} overlap “${name(clash)}” (bars ${clash.startBar}–${clash.endBar}). Sections may not share bars: shorten or move one of them.`,
    })
  }
}

/** Keeps `position` equal to the order by first bar. */
export async function renumberSections(tx: DbOrTx, songId: string) {
  await tx.execute(sql`UPDATE sections s SET position = o.n - 1 FROM (SELECT id, row_number() OVER (ORDER BY start_bar) AS n FROM sections WHERE song_id = ${songId}) o WHERE s.id = o.id AND s.position <> o.n - 1`)
}

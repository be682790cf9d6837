import { and, desc, eq } from 'drizzle-orm'
import { VocalMapQuerySchema, type VocalMapDraftRef, type VocalMapResponse } from '../../../../shared/schemas/vocal-map'
import { barCount, barsPerLyricBar, type Grid } from '../../../../shared/utils/grid'
import { alts, beats, versions } from '../../../database/schema'
import { analyseDraft } from '../../../utils/prosody/analyse'
import type { Lexicon } from '../../../utils/prosody/resolve'
import { barTexts, buildVocalMap, differingBars, mapLastBar, mapRows, vocalMapAnalysisInput, type MapSection } from '../../../utils/vocal-map'

type DraftRow = Awaited<ReturnType<typeof listDrafts>>[number]

const ref = (d: DraftRow): VocalMapDraftRef => ({ id: d.id, name: d.name, isMain: d.isMain, versionId: d.headVersionId, versionNumber: d.headNumber })

/**
 * The vocal map of one draft's newest version (default: the main draft), computed from its
 * lines, its open alts, the song's sections and grid, and the prosody engine's figures;
 * with `compare`, the bars where a second draft differs.
 */
export default defineEventHandler(async (event): Promise<VocalMapResponse> => {
  await requireUser(event)
  const query = validQuery(event, VocalMapQuerySchema)
  const { song, crewId } = await requireSongAccess(event, 'song.view')
  const db = useDb()
  const list = await listDrafts(db, song.id)
  const pick = (id: string | undefined) => {
    if (!id) return list.find(d => d.isMain && d.headVersionId) ?? list.find(d => d.headVersionId) ?? list[0]
    const found = list.find(d => d.id === id)
    if (!found) throw notFound('Draft')
    return found
  }
  const draft = pick(query.draftId)
  const other = query.compare ? pick(query.compare) : undefined

  const grid: Grid = { bpm: song.bpm, beatsPerBar: song.beatsPerBar, offsetMs: song.offsetMs, feel: song.feel }
  const sections: MapSection[] = await listSections(song.id, db)
  const [beat] = await db.select({ durationMs: beats.durationMs }).from(beats)
    .where(and(eq(beats.songId, song.id), eq(beats.status, 'ready'))).orderBy(desc(beats.bounce)).limit(1)
  const beatBars = beat?.durationMs ? Math.ceil(barCount(grid, beat.durationMs) / barsPerLyricBar(grid)) : null
  const lexicon = await loadLexicon(crewId)

  const linesOf = async (d: DraftRow | undefined) => {
    if (!d?.headVersionId) return []
    const [head] = await db.select({ lines: versions.lines }).from(versions).where(eq(versions.id, d.headVersionId))
    return head?.lines ?? []
  }
  const mineLines = await linesOf(draft)
  const otherLines = other ? await linesOf(other) : []
  // Both drafts are drawn on the same bars, so a comparison lines up.
  const rows = mapRows(grid, sections, mapLastBar(grid, sections, [...mineLines, ...otherLines], beatBars ?? 0))

  const mapOf = async (d: DraftRow | undefined, lines: typeof mineLines, lex: Lexicon) => {
    const open = d ? await db.select({ lineId: alts.lineId }).from(alts).where(and(eq(alts.draftId, d.id), eq(alts.status, 'open'))) : []
    const analysis = analyseDraft(vocalMapAnalysisInput(grid, lines, rows), lex)
    return buildVocalMap({ grid, sections, lines, openAlts: open, analysis, rows })
  }
  const map = await mapOf(draft, mineLines, lexicon)
  let compare: VocalMapResponse['compare'] = null
  if (other) {
    const theirs = await mapOf(other, otherLines, lexicon)
    compare = {
      draft: ref(other),
      bars: theirs.bars.map(b => ({ bar: b.bar, state: b.state, syllables: b.syllables, density: b.density, texts: barTexts(b) })),
      differingBars: differingBars(map, theirs),
    }
  }
  return {
    ...map,
    draft: draft ? ref(draft) : null,
    drafts: list.map(ref),
    beatBars,
    compare,
  }
})

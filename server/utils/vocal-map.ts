import { SECTION_KIND_LABELS } from '../../shared/schemas/beats'
import type { DensityGrade, MapBar, MapLine, MapRow, MapTotals, VocalMap } from '../../shared/schemas/vocal-map'
import { barDurationMs, barsPerLyricBar, lyricBarStartMs, projectBarOfLyricBar, type Grid } from '../../shared/utils/grid'
import type { LyricLine } from '../../shared/utils/lyric-doc'
import { adlibSegments, isPerformed } from '../../shared/utils/sheet'
import { DENSE_SYLLABLES_PER_SECOND, OVER_PACKED_SYLLABLES_PER_SECOND, type Analysis, type AnalysisInput } from './prosody/analyse'
import { DENSITY_LOOKBACK } from './prosody/density'

/** Conversational American English, about 3.5 syllables per second (Wilson & Netsell, 2009). */
export const CONVERSATIONAL_SYLLABLES_PER_SECOND = 3.5

export const DENSITY_SCALE: VocalMap['densityScale'] = [
  { grade: 0, label: 'nothing sung', upToPerSecond: 0, source: '' },
  { grade: 1, label: 'talking pace', upToPerSecond: CONVERSATIONAL_SYLLABLES_PER_SECOND, source: 'conversational American English, Wilson & Netsell 2009' },
  { grade: 2, label: 'reading pace', upToPerSecond: DENSE_SYLLABLES_PER_SECOND, source: 'read English speech, Pellegrino, Coupé & Marsico, Language 2011' },
  { grade: 3, label: 'dense', upToPerSecond: OVER_PACKED_SYLLABLES_PER_SECOND, source: 'fastest rap in a hit single, Guinness World Records 2020' },
  { grade: 4, label: 'over-packed', upToPerSecond: null, source: 'faster than the Guinness World Records 2020 fastest rap' },
]

export const RHYME_DENSITY_DEFINITION = `Rhyme density (Malmi et al., "DopeLearning", KDD 2016): for each word, the length in vowel sounds of its longest rhyme with any of the ${DENSITY_LOOKBACK} words before it, averaged over the words of the performed lines (lines repeated word for word count once).`

/** The grade of a bar from its sung syllables per second. */
export function densityGrade(perSecond: number): DensityGrade {
  if (perSecond <= 0) return 0
  if (perSecond <= CONVERSATIONAL_SYLLABLES_PER_SECOND) return 1
  if (perSecond <= DENSE_SYLLABLES_PER_SECOND) return 2
  if (perSecond <= OVER_PACKED_SYLLABLES_PER_SECOND) return 3
  return 4
}

export interface MapSection { id: string, kind: string, label?: string | null, startBar: number, endBar: number }

/** A row before it is counted: a section, or a stretch of bars outside every section. */
type RowFrame = Omit<MapRow, 'totals'>

const round2 = (x: number) => Math.round(x * 100) / 100
const spanOf = (l: LyricLine) => Math.max(1, l.bars ?? 1)

/**
 * Sections (in project bars) as rows of lyric bars. Under a half-time feel a lyric bar
 * belongs to the section holding its first project bar; a section holding none is dropped.
 * Bars between sections, and after the last one up to `lastBar`, form rows of their own.
 */
export function mapRows(grid: Pick<Grid, 'feel'>, sections: readonly MapSection[], lastBar: number): RowFrame[] {
  const per = barsPerLyricBar(grid)
  const framed = [...sections].sort((a, b) => a.startBar - b.startBar).map(s => ({
    s,
    start: Math.ceil((s.startBar - 1) / per) + 1,
    end: Math.floor((s.endBar - 1) / per) + 1,
  })).filter(x => x.start <= x.end)
  const rows: RowFrame[] = []
  let next = 1
  const gap = (until: number) => {
    if (until < next) return
    rows.push({ id: `gap-${next}`, sectionId: null, kind: null, title: 'No section', startBar: next, endBar: until })
  }
  for (const { s, start, end } of framed) {
    gap(start - 1)
    rows.push({ id: s.id, sectionId: s.id, kind: s.kind, title: s.label?.trim() || SECTION_KIND_LABELS[s.kind as keyof typeof SECTION_KIND_LABELS] || s.kind, startBar: start, endBar: end })
    next = Math.max(next, end + 1)
  }
  gap(lastBar)
  return rows
}

/** The last lyric bar the map shows: the furthest of the sections, the lines and the beat. */
export function mapLastBar(grid: Pick<Grid, 'feel'>, sections: readonly MapSection[], lines: readonly LyricLine[], beatBars = 0): number {
  const per = barsPerLyricBar(grid)
  const sectionEnd = sections.reduce((m, s) => Math.max(m, Math.floor((s.endBar - 1) / per) + 1), 0)
  const lineEnd = lines.reduce((m, l) => Math.max(m, l.bar + spanOf(l) - 1), 0)
  return Math.max(sectionEnd, lineEnd, beatBars)
}

/**
 * What the prosody engine is asked for the map: the performed lines only (lines marked out
 * and empty lines are left out of every count) and each row as a section, so its rhyme
 * density comes from the engine.
 */
export function vocalMapAnalysisInput(grid: Grid, lines: readonly LyricLine[], rows: readonly RowFrame[]): AnalysisInput {
  return {
    lines: lines.filter(isPerformed).map(l => ({ id: l.id, bar: l.bar, text: l.text })),
    grid: { bpm: grid.bpm, beatsPerBar: grid.beatsPerBar, feel: grid.feel },
    sections: rows.map(r => ({ id: r.id, startBar: r.startBar, endBar: r.endBar })),
  }
}

export interface VocalMapInput {
  grid: Grid
  sections: readonly MapSection[]
  /** The head version's lines, in document order. */
  lines: readonly LyricLine[]
  /** Open alts of the draft (taken and passed ones do not sit on the map). */
  openAlts: ReadonlyArray<{ lineId: string }>
  /** The engine's analysis of `vocalMapAnalysisInput(...)` for the same lines and rows. */
  analysis: Pick<Analysis, 'lines' | 'rhymeDensity'> & { sections?: Analysis['sections'] }
  rows: readonly RowFrame[]
}

function countTotals(bars: readonly MapBar[], lines: readonly LyricLine[], startBar: number, endBar: number, rhymeDensity: number | null): MapTotals {
  const inside = bars.filter(b => b.bar >= startBar && b.bar <= endBar)
  const by = (state: MapBar['state']) => inside.filter(b => b.state === state).length
  const syllables = round2(inside.reduce((n, b) => n + b.syllables, 0))
  const vocalBars = by('vocals')
  const starting = lines.filter(l => l.bar >= startBar && l.bar <= endBar)
  return {
    bars: inside.length,
    barsWithVocals: vocalBars,
    barsAdlibsOnly: by('adlibs'),
    barsAltsOnly: by('alts'),
    barsOpen: by('open'),
    lines: starting.filter(isPerformed).length,
    outLines: starting.filter(l => l.out).length,
    syllables,
    averageSyllablesPerBar: inside.length ? round2(syllables / inside.length) : null,
    averageSyllablesPerVocalBar: vocalBars ? round2(inside.filter(b => b.state === 'vocals').reduce((n, b) => n + b.syllables, 0) / vocalBars) : null,
    rhymeDensity,
  }
}

/**
 * The vocal map of one version: every lyric bar of the song with what it carries — vocals,
 * ad-libs only, open alts only (nothing performed there, but an open alt sits on a line of
 * the bar that is not marked out), or open for the beat — its sung syllables (the engine's per-line counts, a line
 * over several bars shared equally between them), a density grade from syllables per
 * second, and totals per row and for the song. Lines marked out are listed on their bars
 * and counted apart, never in the figures.
 */
export function buildVocalMap(input: VocalMapInput): VocalMap {
  const { grid, lines, rows, analysis } = input
  const figures = new Map(analysis.lines.map(l => [l.id, l]))
  const altsByLine = new Map<string, number>()
  for (const a of input.openAlts) altsByLine.set(a.lineId, (altsByLine.get(a.lineId) ?? 0) + 1)
  const lastBar = rows.at(-1)?.endBar ?? 0
  const lyricBarSeconds = barDurationMs(grid) * barsPerLyricBar(grid) / 1000

  const onBar = new Map<number, LyricLine[]>()
  for (const l of lines) {
    for (let b = l.bar; b < l.bar + spanOf(l); b++) {
      const list = onBar.get(b)
      if (list) list.push(l)
      else onBar.set(b, [l])
    }
  }
  const rowOf = (bar: number) => rows.find(r => bar >= r.startBar && bar <= r.endBar)!

  const bars: MapBar[] = []
  for (let bar = 1; bar <= lastBar; bar++) {
    const here = onBar.get(bar) ?? []
    let syllables = 0
    let adlibSyllables = 0
    let vocal = false
    let adlib = false
    let openAlts = 0
    // An alt on an out line stays out when taken, so only alts on lines still in count for the state.
    let altsIn = 0
    const mapLines: MapLine[] = here.map((l) => {
      const adlibOnly = adlibSegments(l.text).every(s => s.adlib || !s.text.trim())
      const alts = altsByLine.get(l.id) ?? 0
      openAlts += alts
      if (!l.out) altsIn += alts
      if (isPerformed(l)) {
        const f = figures.get(l.id)
        syllables += (f?.syllables ?? 0) / spanOf(l)
        adlibSyllables += (f?.adlibSyllables ?? 0) / spanOf(l)
        if (adlibOnly) adlib = true
        else vocal = true
      }
      return { id: l.id, text: l.text, bar: l.bar, bars: spanOf(l), out: !!l.out, adlibOnly, openAlts: alts }
    })
    const perSecond = syllables / lyricBarSeconds
    bars.push({
      bar,
      projectBar: projectBarOfLyricBar(grid, bar),
      startMs: lyricBarStartMs(grid, bar),
      endMs: lyricBarStartMs(grid, bar + 1),
      rowId: rowOf(bar).id,
      state: vocal ? 'vocals' : adlib ? 'adlibs' : altsIn ? 'alts' : 'open',
      syllables: round2(syllables),
      adlibSyllables: round2(adlibSyllables),
      syllablesPerSecond: round2(perSecond),
      density: densityGrade(perSecond),
      lines: mapLines,
      outLines: here.filter(l => l.out).length,
      openAlts,
    })
  }

  const densityOf = new Map((analysis.sections ?? []).map(s => [s.id, s.rhymeDensity]))
  return {
    grid: { bpm: grid.bpm, beatsPerBar: grid.beatsPerBar, offsetMs: grid.offsetMs, feel: grid.feel },
    bars,
    rows: rows.map(r => ({ ...r, totals: countTotals(bars, lines, r.startBar, r.endBar, densityOf.get(r.id) ?? null) })),
    totals: countTotals(bars, lines, 1, lastBar, analysis.rhymeDensity ?? null),
    densityScale: DENSITY_SCALE,
    rhymeDensityDefinition: RHYME_DENSITY_DEFINITION,
  }
}

/** The performed words on each bar, as a comparison of two drafts sees them. */
export function barTexts(bar: MapBar): string[] {
  return bar.lines.filter(l => !l.out && l.text.trim()).map(l => l.text.trim().replace(/\s+/g, ' '))
}

/** Lyric bars where two maps differ: in what is performed there, or in what the bar carries. */
export function differingBars(a: VocalMap, b: VocalMap): number[] {
  const other = new Map(b.bars.map(x => [x.bar, x]))
  const mine = new Map(a.bars.map(x => [x.bar, x]))
  const all = [...new Set([...mine.keys(), ...other.keys()])].sort((x, y) => x - y)
  return all.filter((bar) => {
    const x = mine.get(bar)
    const y = other.get(bar)
    const tx = x ? barTexts(x) : []
    const ty = y ? barTexts(y) : []
    return (x?.state ?? 'open') !== (y?.state ?? 'open') || tx.length !== ty.length || tx.some((t, i) => t !== ty[i])
  })
}

import { describe, expect, it } from 'vitest'
import type { Grid } from '../../shared/utils/grid'
import type { LyricLine } from '../../shared/utils/lyric-doc'
import { analyseDraft } from '../../server/utils/prosody/analyse'
import { buildVocalMap, densityGrade, differingBars, mapLastBar, mapRows, vocalMapAnalysisInput, type MapSection } from '../../server/utils/vocal-map'

// Syllable counts come from the CMU Pronouncing Dictionary through the prosody engine:
// every word below is one syllable except "tonight" (T AH0 N AY1 T, 2) and "falling" (2);
// ad-libs in parentheses are counted apart.
const grid: Grid = { bpm: 90, beatsPerBar: 4, offsetMs: 0, feel: 'normal' }
const sections: MapSection[] = [
  { id: 'intro', kind: 'intro', label: '', startBar: 1, endBar: 4 },
  { id: 'hook', kind: 'hook', label: '', startBar: 5, endBar: 8 },
  { id: 'verse', kind: 'verse', label: 'Verse 1', startBar: 9, endBar: 12 },
]
const lines: LyricLine[] = [
  { id: 'h1', bar: 5, text: 'cold rain on the late train' }, // 6
  { id: 'h2', bar: 6, text: '(yeah, uh)' }, // ad-libs only: 0 sung, 2 apart
  { id: 'h3', bar: 7, bars: 2, text: 'we ride the last bus home tonight' }, // 8 over two bars
  { id: 'v0', bar: 9, text: '' }, // a bar the writer left for an alt
  { id: 'v1', bar: 10, text: 'rain keeps falling on the stop', out: true }, // 7, marked out
  { id: 'v2', bar: 11, text: 'rain keeps falling on the stop' }, // 7
  { id: 'v3', bar: 11, text: 'bus stop rain stop' }, // 4, a second line on the same bar
]
const openAlts = [{ lineId: 'v0' }, { lineId: 'v1' }, { lineId: 'h1' }]

function mapOf(ls: LyricLine[], g: Grid = grid, ss: MapSection[] = sections, alts = openAlts) {
  const rows = mapRows(g, ss, mapLastBar(g, ss, ls))
  const analysis = analyseDraft(vocalMapAnalysisInput(g, ls, rows))
  return { map: buildVocalMap({ grid: g, sections: ss, lines: ls, openAlts: alts, analysis, rows }), analysis }
}

describe('the vocal map', () => {
  const { map, analysis } = mapOf(lines)
  const bar = (n: number) => map.bars.find(b => b.bar === n)!

  it('draws one cell per lyric bar, in rows per section', () => {
    expect(map.bars.map(b => b.bar)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12])
    expect(map.rows.map(r => [r.id, r.title, r.startBar, r.endBar])).toEqual([['intro', 'Intro', 1, 4], ['hook', 'Hook', 5, 8], ['verse', 'Verse 1', 9, 12]])
    // 90 BPM in 4/4: a bar is 8/3 s (DOMAIN.md §1, arithmetic), bar 6 starts at 5 × 8/3 s.
    expect([bar(6).startMs, bar(6).endMs]).toEqual([13_333, 16_000])
  })

  it('marks the intro open and a sung bar as carrying vocals, with its syllables', () => {
    expect([1, 2, 3, 4].map(n => bar(n).state)).toEqual(['open', 'open', 'open', 'open'])
    expect(bar(5)).toMatchObject({ state: 'vocals', syllables: 6, adlibSyllables: 0 })
    // 6 syllables in 8/3 s = 2.25 per second: talking pace (grade 1).
    expect(bar(5)).toMatchObject({ syllablesPerSecond: 2.25, density: 1 })
  })

  it('an ad-lib-only bar is performed but carries no sung syllables', () => {
    expect(bar(6)).toMatchObject({ state: 'adlibs', syllables: 0, adlibSyllables: 2, density: 0 })
    expect(bar(6).lines).toEqual([expect.objectContaining({ id: 'h2', adlibOnly: true, out: false })])
  })

  it('a line over two bars carries vocals on both and shares its syllables between them', () => {
    expect([bar(7).state, bar(8).state]).toEqual(['vocals', 'vocals'])
    expect([bar(7).syllables, bar(8).syllables]).toEqual([4, 4])
    expect(bar(8).lines).toEqual([expect.objectContaining({ id: 'h3', bar: 7, bars: 2 })])
  })

  it('an alt-only bar: nothing performed, an open alt sits on a line there', () => {
    expect(bar(9)).toMatchObject({ state: 'alts', openAlts: 1, syllables: 0 })
    // An open alt on a performed line leaves its bar a vocal bar.
    expect(bar(5)).toMatchObject({ state: 'vocals', openAlts: 1 })
  })

  it('an out line is shown apart and left out of every count', () => {
    expect(bar(10)).toMatchObject({ state: 'open', outLines: 1, syllables: 0, openAlts: 1 })
    expect(bar(10).lines).toEqual([expect.objectContaining({ id: 'v1', out: true })])
    expect(analysis.lines.map(l => l.id)).not.toContain('v1')
    // Two lines on one bar add up: 7 + 4 = 11 in 8/3 s = 4.125 per second (reading pace, grade 2).
    expect(bar(11)).toMatchObject({ state: 'vocals', syllables: 11, syllablesPerSecond: 4.13, density: 2 })
  })

  it('totals each section: bars, bars with vocals, lines, average syllables per bar, rhyme density from the engine', () => {
    const hook = map.rows.find(r => r.id === 'hook')!.totals
    expect(hook).toMatchObject({ bars: 4, barsWithVocals: 3, barsAdlibsOnly: 1, barsOpen: 0, lines: 3, outLines: 0, syllables: 14, averageSyllablesPerBar: 3.5, averageSyllablesPerVocalBar: 4.67 })
    const verse = map.rows.find(r => r.id === 'verse')!.totals
    expect(verse).toMatchObject({ bars: 4, barsWithVocals: 1, barsAltsOnly: 1, barsOpen: 2, lines: 2, outLines: 1, syllables: 11, averageSyllablesPerBar: 2.75 })
    const intro = map.rows.find(r => r.id === 'intro')!.totals
    expect(intro).toMatchObject({ bars: 4, barsWithVocals: 0, lines: 0, syllables: 0, averageSyllablesPerBar: 0, averageSyllablesPerVocalBar: null, rhymeDensity: null })
    // Rhyme density is the engine's own figure for the section's performed lines.
    expect(hook.rhymeDensity).toBe(analysis.sections!.find(s => s.id === 'hook')!.rhymeDensity)
    expect(hook.rhymeDensity).toEqual(expect.any(Number))
    // The verse's figure is that of its performed lines only (the out line is not sent).
    const performedVerse = analyseDraft({ lines: [lines[5]!, lines[6]!], sections: [{ id: 'v', startBar: 9, endBar: 12 }] })
    expect(verse.rhymeDensity).toBe(performedVerse.sections![0]!.rhymeDensity)
    expect(map.totals).toMatchObject({ bars: 12, barsWithVocals: 4, lines: 5, outLines: 1, syllables: 25 })
    expect(map.rhymeDensityDefinition).toMatch(/Malmi et al\., "DopeLearning", KDD 2016/)
  })

  it('finds the bars where two drafts differ', () => {
    const other = lines.map(l => (l.id === 'h1' ? { ...l, text: 'cold rain on the last train' } : l.id === 'h3' ? { ...l, out: true } : l))
    expect(differingBars(map, mapOf(other).map)).toEqual([5, 7, 8])
    expect(differingBars(map, mapOf(lines).map)).toEqual([])
  })
})

describe('density grades', () => {
  // Syllables per second in 4/4 = syllables per bar × BPM / 240 (DOMAIN.md §4, arithmetic), at 90 BPM.
  const perSecond = (perBar: number) => perBar * 90 / 240
  it('follow the published speech rates', () => {
    expect(densityGrade(0)).toBe(0)
    expect(densityGrade(perSecond(8))).toBe(1) // 3 /s: under conversational English, 3.5 /s (Wilson & Netsell 2009)
    expect(densityGrade(perSecond(16))).toBe(2) // 6 /s, straight 16ths: under read English, 6.19 /s (Pellegrino et al. 2011)
    expect(densityGrade(perSecond(17))).toBe(3) // 6.375 /s: dense
    expect(densityGrade(perSecond(28))).toBe(3) // 10.5 /s: still under 10.65 /s (Guinness World Records 2020)
    expect(densityGrade(perSecond(29))).toBe(4) // 10.875 /s: over-packed
  })
})

describe('half-time feel', () => {
  // A lyric bar spans two project bars (DOMAIN.md §1, common practice); sections stay in project bars.
  const half: Grid = { bpm: 140, beatsPerBar: 4, offsetMs: 0, feel: 'half' }
  const halfSections: MapSection[] = [
    { id: 'intro', kind: 'intro', startBar: 1, endBar: 4 },
    { id: 'hook', kind: 'hook', startBar: 5, endBar: 12 },
    { id: 'verse', kind: 'verse', startBar: 14, endBar: 20 },
  ]
  const halfLines: LyricLine[] = [{ id: 'x', bar: 3, text: 'cold rain on the late train, cold rain on the late train' }] // 12

  it('counts cells in lyric bars and times them over two project bars', () => {
    const { map } = mapOf(halfLines, half, halfSections, [])
    expect(map.rows.map(r => [r.id, r.startBar, r.endBar])).toEqual([['intro', 1, 2], ['hook', 3, 6], ['gap-7', 7, 7], ['verse', 8, 10]])
    const b3 = map.bars.find(b => b.bar === 3)!
    expect(b3).toMatchObject({ projectBar: 5, state: 'vocals', syllables: 12, rowId: 'hook' })
    // 140 BPM: a project bar is 240/140 s, so lyric bar 3 runs from 4 × 1.714 s to 6 × 1.714 s (arithmetic).
    expect([b3.startMs, b3.endMs]).toEqual([6857, 10_286])
    // 12 syllables over 3.429 s = 3.5 per second, half what the same bar would ask in normal feel.
    expect(b3.syllablesPerSecond).toBe(3.5)
    expect(mapOf(halfLines, { ...half, feel: 'normal' }, halfSections, []).map.bars.find(b => b.bar === 3)!.syllablesPerSecond).toBe(7)
    expect(map.bars.find(b => b.bar === 7)!.rowId).toBe('gap-7')
  })
})

import { WebVTTParser } from 'webvtt-parser'
import { describe, expect, it } from 'vitest'
import { lyricBarStartMs, type Grid } from '../../shared/utils/grid'
import { docFromLines, type LyricLine } from '../../shared/utils/lyric-doc'
import { adlibSegments, renderText, renderVtt, sheetSections, timeLines, type SheetModel } from '../../shared/utils/sheet'

const grid: Grid = { bpm: 90, beatsPerBar: 4, offsetMs: 0, feel: 'normal' }
const lines: LyricLine[] = [
  { id: 'h1', bar: 1, text: 'Lanterns low on the harbour wall' },
  { id: 'h2', bar: 2, text: 'I keep the count (one, two)' },
  { id: 'h3', bar: 3, text: 'cut this one', out: true },
  { id: 'h4', bar: 3, text: 'short one' },
  { id: 'h5', bar: 3, text: 'and a second' },
  { id: 'v1', bar: 5, text: '(hey!)' },
  { id: 'v2', bar: 6, text: '   ' },
  { id: 'v3', bar: 9, text: 'after open bars, a <tag> & more' },
]
const sections = [
  { id: 's-hook', kind: 'hook', label: null, startBar: 1, endBar: 4 },
  { id: 's-verse', kind: 'verse', label: 'Verse 1', startBar: 5, endBar: 12 },
]

function model(): SheetModel {
  const { sections: s, omitted } = sheetSections(docFromLines(lines, sections), lines, grid)
  return {
    songId: 'x', title: 'Harbour --> Count', crewName: 'Test crew',
    version: { id: 'v', number: 3, draftId: 'd', draftName: 'Main', createdAt: '2026-05-01T10:00:00.000Z' },
    grid, seal: { id: 's', sealedAt: '2026-05-02T12:00:00.000Z', signers: [{ name: 'A', role: 'writer' }] },
    credits: { writers: ['A'], producers: ['B'] }, sections: s, omitted,
    split: { lines: [{ name: 'A', role: 'lyrics', shareBp: 10_000, member: true, confirmed: true }], totalBp: 10_000 }, caution: 'caution',
  }
}

describe('the final sheet model', () => {
  it('splits ad-libs (in parentheses) from the spoken words', () => {
    expect(adlibSegments('I keep the count (one, two) again')).toEqual([
      { text: 'I keep the count ', adlib: false }, { text: '(one, two)', adlib: true }, { text: ' again', adlib: false },
    ])
    expect(adlibSegments('(unclosed run')).toEqual([{ text: '(unclosed run', adlib: true }])
  })

  it('leaves out lines marked out and empty lines, and counts the out ones', () => {
    const m = model()
    const ids = m.sections.flatMap(s => s.lines.map(l => l.id))
    expect(ids).toEqual(['h1', 'h2', 'h4', 'h5', 'v1', 'v3'])
    expect(m.omitted).toBe(1)
    expect(m.sections.map(s => s.heading)).toEqual(['Hook', 'Verse 1'])
    expect(m.sections[1]!.lines[0]!.adlibOnly).toBe(true)
  })

  it('times lines from the grid: shared bars split equally, open bars left empty', () => {
    const t = timeLines(grid, lines)
    const bar = (n: number) => lyricBarStartMs(grid, n)
    expect(t.get('h1')).toEqual({ startMs: 0, endMs: bar(2) })
    expect(t.get('h4')).toEqual({ startMs: bar(3), endMs: lyricBarStartMs(grid, 3, 1, 2) })
    expect(t.get('h5')).toEqual({ startMs: lyricBarStartMs(grid, 3, 1, 2), endMs: bar(4) })
    expect(t.get('v1')).toEqual({ startMs: bar(5), endMs: bar(6) })
    expect(t.get('v3')).toEqual({ startMs: bar(9), endMs: bar(10) })
    expect(t.has('h3')).toBe(false)
  })

  it('exports WebVTT that a general-purpose parser accepts, cue times from the grid formula', () => {
    // W3C WebVTT §4, validated by the npm webvtt-parser.
    const vtt = renderVtt(model())
    const tree = new WebVTTParser().parse(vtt, 'metadata')
    expect(tree.errors).toEqual([])
    expect(tree.cues.map((c: any) => c.text)).toEqual(['Lanterns low on the harbour wall', 'I keep the count (one, two)', 'short one', 'and a second', '(hey!)', 'after open bars, a &lt;tag&gt; &amp; more'])
    expect(tree.cues.map((c: any) => Math.round(c.startTime * 1000))).toEqual([1, 2, 3, 3.5, 5, 9].map(b => Math.round((b - 1) * 8000 / 3)))
    expect(vtt.split('\n')[0]).toBe('WEBVTT - Harbour → Count, version 3, sealed 2026-05-02')
    expect(vtt).toContain('00:00:02.667 --> 00:00:05.333')
  })

  it('prints plain text with bar numbers, times, the split and its caution', () => {
    const text = renderText(model())
    expect(text).toContain('version 3, sealed 2026-05-02')
    expect(text).toMatch(/^ {3}2 {3}0:02 {2}I keep the count \(one, two\)$/m)
    expect(text).toContain('[VERSE 1]')
    expect(text).not.toContain('cut this one')
    expect(text).toContain('Total 100.00 %')
    expect(text).toContain('caution')
  })
})

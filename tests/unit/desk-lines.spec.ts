import { getSchema } from '@tiptap/core'
import { describe, expect, it } from 'vitest'
import { lyricSchemaExtensions } from '../../app/components/desk/extensions'
import { LyricDocSchema } from '../../shared/schemas/lyric-doc'
import { adlibRanges, barForNewLine, changedLines, editableDoc, endBarOf, idsToRenew, lastFreeBar, linesOnBar, movedBar, parseBar, sectionRangeOf } from '../../shared/utils/desk-lines'
import { docFromLines, linesFromDoc, newLineId, type LyricDoc, type LyricLine } from '../../shared/utils/lyric-doc'

// Sections as a song is commonly laid out (common practice: an 8-bar hook, a 16-bar verse).
const SECTIONS = [
  { id: 's-hook', kind: 'hook', label: 'Hook', startBar: 5, endBar: 12 },
  { id: 's-verse', kind: 'verse', label: null, startBar: 13, endBar: 28 },
]
const L = (id: string, bar: number, text = '', bars?: number): LyricLine => ({ id, bar, text, ...(bars ? { bars } : {}) })

describe('line ↔ bar mapping', () => {
  it('a line spanning two bars holds both; short lines can share one bar', () => {
    const lines = [L('a', 5, 'one'), L('b', 6, 'two', 2), L('c', 8, 'short'), L('d', 8, 'shorter')]
    expect(endBarOf(lines[1]!)).toBe(7)
    expect(linesOnBar(lines, 7).map(l => l.id)).toEqual(['b'])
    expect(linesOnBar(lines, 8).map(l => l.id)).toEqual(['c', 'd'])
    expect(linesOnBar(lines, 9)).toEqual([])
    expect(linesOnBar([{ ...L('o', 3, 'kept'), out: true }], 3)).toEqual([])
  })

  it('Enter puts the new line on the next free bar, skipping bars a span holds', () => {
    expect(barForNewLine([L('a', 5)], 0)).toBe(6)
    expect(barForNewLine([L('a', 5, 'x', 2)], 0)).toBe(7)
    // The next bar is taken by the following line: the new line shares the current bar rather than jump past it.
    expect(barForNewLine([L('a', 5), L('b', 6)], 0)).toBe(5)
    // A gap before the next line: the first free bar.
    expect(barForNewLine([L('a', 5), L('b', 9)], 0)).toBe(6)
    expect(lastFreeBar([])).toBe(1)
    expect(lastFreeBar([L('a', 5, 'x', 2)])).toBe(7)
  })

  it('moving and typing bars stays within 1…9999 and refuses what is not a bar number', () => {
    expect(movedBar(1, -1)).toBe(1)
    expect(movedBar(5, 1)).toBe(6)
    expect(movedBar(9999, 1)).toBe(9999)
    expect(parseBar('12')).toBe(12)
    for (const bad of ['', '0', '-3', '2.5', 'ten', '10000']) expect(parseBar(bad)).toBeNull()
  })

  it('finds the section a bar falls in, for looping it', () => {
    expect(sectionRangeOf(SECTIONS, 9)).toEqual({ startBar: 5, endBar: 12, label: 'Hook' })
    expect(sectionRangeOf(SECTIONS, 13)).toEqual({ startBar: 13, endBar: 28, label: 'Verse' })
    expect(sectionRangeOf(SECTIONS, 2)).toBeNull()
  })

  it('marks the parenthesised ad-libs of a line', () => {
    const text = 'Ride all night (yeah) to the end (skrrt)'
    expect(adlibRanges(text).map(([a, b]) => text.slice(a, b))).toEqual(['(yeah)', '(skrrt)'])
  })
})

describe('stable line ids', () => {
  it('renews only missing, malformed and repeated ids; the first holder keeps its id', () => {
    expect(idsToRenew(['a', 'b', 'c'])).toEqual([])
    // A split or a paste copies "b": the later copy is renewed, not the original.
    expect(idsToRenew(['a', 'b', 'b', 'c', 'b'])).toEqual([2, 4])
    expect(idsToRenew([null, 'ok', 'not ok!', undefined])).toEqual([0, 2, 3])
  })

  it('new ids are well-formed and do not repeat', () => {
    const ids = Array.from({ length: 2000 }, newLineId)
    expect(new Set(ids).size).toBe(ids.length)
    expect(idsToRenew(ids)).toEqual([])
  })

  it('reports the lines whose text or bar changed since the last analysis, and the ones gone', () => {
    const analysed = new Map([['a', { bar: 5, text: 'one' }], ['b', { bar: 6, text: 'two' }], ['c', { bar: 7, text: 'three' }]])
    const { changed, gone } = changedLines(analysed, [L('a', 5, 'one'), L('b', 6, 'two!'), L('c', 8, 'three'), L('d', 9, 'new')])
    expect(changed.map(l => l.id)).toEqual(['b', 'c', 'd'])
    expect(gone).toEqual([])
    expect(changedLines(analysed, [L('a', 5, 'one')]).gone).toEqual(['b', 'c'])
  })
})

describe('JSON ↔ lines', () => {
  const lines = [L('h1', 5, 'Window fogged (yeah)'), L('h2', 6, 'Counting every stop', 2), { ...L('v1', 13, 'Kept but not sung'), out: true }]
  const doc = docFromLines(lines, SECTIONS)

  it('the editor schema takes the stored document and gives back exactly the same JSON', () => {
    const schema = getSchema(lyricSchemaExtensions)
    const node = schema.nodeFromJSON(doc)
    node.check()
    const back = node.toJSON() as LyricDoc
    expect(back).toEqual(doc)
    expect(LyricDocSchema.parse(back)).toEqual(doc)
    expect(linesFromDoc(back)).toEqual(lines)
  })

  it('groups lines into the song sections they fall in', () => {
    expect(doc.content.map(b => [b.attrs.sectionId, b.content!.map(n => n.attrs.lineId)])).toEqual([['s-hook', ['h1', 'h2']], ['s-verse', ['v1']]])
  })

  it('an empty draft opens with one empty line on the first section bar; empty blocks are dropped', () => {
    const fresh = editableDoc(null, SECTIONS, () => 'lnew')
    expect(linesFromDoc(fresh)).toEqual([{ id: 'lnew', bar: 5, text: '' }])
    expect(linesFromDoc(editableDoc(null, [], () => 'lnew'))[0]!.bar).toBe(1)
    const withEmpty: LyricDoc = { type: 'doc', content: [{ type: 'block', attrs: { sectionId: null, kind: null, label: null }, content: [] }, ...doc.content] }
    expect(editableDoc(withEmpty, SECTIONS, () => 'x').content).toHaveLength(2)
    getSchema(lyricSchemaExtensions).nodeFromJSON(fresh).check()
  })
})

import { describe, expect, it } from 'vitest'
import { LyricDocSchema } from '../../shared/schemas/lyric-doc'
import { docFromLines, lastBarOf, linesFromDoc, newLineId, sameLines, type LyricLine, type SectionRef } from '../../shared/utils/lyric-doc'

const sections: SectionRef[] = [
  { id: 'intro', kind: 'intro', startBar: 1, endBar: 4 },
  { id: 'hook', kind: 'hook', label: 'Hook', startBar: 5, endBar: 12 },
]

const lines: LyricLine[] = [
  { id: 'a1', bar: 1, text: '(yeah) uh' },
  { id: 'h1', bar: 5, text: 'Night bus humming down the avenue' },
  { id: 'h2', bar: 6, text: 'window fogged, I write my name for you', out: true },
  { id: 'h3', bar: 7, text: 'long line over two bars', bars: 2 },
  { id: 'x1', bar: 20, text: 'loose line after every section' },
]

describe('lyric document ↔ lines', () => {
  it('groups lines into one block per section run and keeps loose lines apart', () => {
    const doc = docFromLines(lines, sections)
    expect(doc.content.map(b => b.attrs.sectionId)).toEqual(['intro', 'hook', null])
    expect(doc.content[1]!.content!.map(l => l.attrs.lineId)).toEqual(['h1', 'h2', 'h3'])
    expect(doc.content[1]!.attrs.label).toBe('Hook')
  })

  it('derives the same lines back, with ids, bars, spans and out marks', () => {
    const back = linesFromDoc(docFromLines(lines, sections))
    expect(back).toEqual(lines)
    expect(sameLines(back, lines)).toBe(true)
  })

  it('keeps line ids stable when a line changes its text or moves bars', () => {
    const doc = docFromLines(lines, sections)
    doc.content[1]!.content![0]!.content = [{ type: 'text', text: 'Night bus humming, late on the avenue' }]
    doc.content[1]!.content![0]!.attrs.bar = 6
    const edited = linesFromDoc(doc)
    expect(edited.map(l => l.id)).toEqual(lines.map(l => l.id))
    expect(edited[1]).toMatchObject({ id: 'h1', bar: 6 })
    expect(sameLines(edited, lines)).toBe(false)
  })

  it('joins text split across several text nodes and treats an empty line as empty text', () => {
    const doc = docFromLines([{ id: 'e', bar: 3, text: '' }])
    expect(doc.content[0]!.content![0]!.content).toBeUndefined()
    doc.content[0]!.content![0]!.content = [{ type: 'text', text: 'split ' }, { type: 'text', text: 'text' }]
    expect(linesFromDoc(doc)[0]!.text).toBe('split text')
  })

  it('produces documents the stored schema accepts, and refuses foreign nodes', () => {
    expect(LyricDocSchema.safeParse(docFromLines(lines, sections)).success).toBe(true)
    expect(LyricDocSchema.safeParse({ type: 'doc', content: [{ type: 'image', attrs: {} }] }).success).toBe(false)
    expect(LyricDocSchema.safeParse({ type: 'doc', content: [{ type: 'block', attrs: {}, content: [{ type: 'line', attrs: { lineId: '../x', bar: 1 } }] }] }).success).toBe(false)
  })

  it('finds the last bar a line reaches', () => {
    expect(lastBarOf(lines)).toBe(20)
    expect(lastBarOf([{ id: 'a', bar: 7, text: '', bars: 2 }])).toBe(8)
  })

  it('makes distinct url-safe line ids', () => {
    const ids = new Set(Array.from({ length: 2000 }, newLineId))
    expect(ids.size).toBe(2000)
    for (const id of ids) expect(id).toMatch(/^[\w-]{13}$/)
  })
})

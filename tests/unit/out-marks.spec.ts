import { describe, expect, it } from 'vitest'
import { docFromLines, linesFromDoc, type LyricLine } from '../../shared/utils/lyric-doc'
import { outNote, outOnlyChange, withOutMarks } from '../../shared/utils/out-marks'

const head: LyricLine[] = [
  { id: 'a', bar: 1, text: 'first line' },
  { id: 'b', bar: 2, text: 'second line', out: true },
  { id: 'c', bar: 3, text: 'third line', bars: 2 },
]

describe('out marks', () => {
  it('accepts a change of out marks only, and says which lines moved', () => {
    const next = head.map(l => ({ ...l, out: l.id === 'a' }))
    expect(outOnlyChange(head, next)).toEqual({ ok: true, marked: ['a'], restored: ['b'] })
    expect(outNote({ marked: ['a'], restored: ['b'] })).toBe('Marked 1 line out, brought 1 line back in')
  })

  it('refuses changed words, bars, spans, order or count', () => {
    const words = outOnlyChange(head, head.map(l => (l.id === 'c' ? { ...l, text: 'rewritten' } : l)))
    expect(words).toMatchObject({ ok: false, lineId: 'c' })
    expect(outOnlyChange(head, head.map(l => (l.id === 'a' ? { ...l, bar: 9 } : l))).ok).toBe(false)
    expect(outOnlyChange(head, head.map(l => (l.id === 'c' ? { ...l, bars: 1 } : l))).ok).toBe(false)
    expect(outOnlyChange(head, [head[1]!, head[0]!, head[2]!]).ok).toBe(false)
    expect(outOnlyChange(head, head.slice(0, 2)).ok).toBe(false)
  })

  it('sets the marks in the document and keeps its blocks', () => {
    const doc = docFromLines(head, [{ id: 's1', kind: 'hook', label: 'Hook', startBar: 1, endBar: 2 }])
    const next = head.map(l => ({ ...l, out: l.id !== 'b' }))
    const marked = withOutMarks(doc, next)
    expect(linesFromDoc(marked).map(l => !!l.out)).toEqual([true, false, true])
    expect(marked.content.map(b => b.attrs)).toEqual(doc.content.map(b => b.attrs))
  })
})

import fc from 'fast-check'
import { diffLines } from 'diff'
import { describe, expect, it } from 'vitest'
import { diffLineSteps, diffRows, diffStats, sameLine } from '../../shared/utils/line-diff'
import { docWithLines, replaceLineText } from '../../shared/utils/doc-edit'
import { docFromLines, linesFromDoc, type LyricLine } from '../../shared/utils/lyric-doc'
import { referenceCommon } from '../support/reference-diff'

const L = (id: string, bar: number, text: string, extra: Partial<LyricLine> = {}): LyricLine => ({ id, bar, text, ...extra })

const from = [
  L('a', 1, 'Lamps on the avenue blinking in code'),
  L('b', 2, 'I read every window along the road'),
  L('c', 3, 'Pocket full of lint and a borrowed coat'),
  L('d', 4, 'Night bus home and the engine is slow'),
  L('e', 5, 'Driver nods once like he already knows'),
]
const to = [
  L('a', 1, 'Lamps on the avenue blinking in code'),
  L('b', 2, 'I count every window along the road'),
  L('c', 3, 'Pocket full of lint and a borrowed coat'),
  L('x', 4, '(yeah)'),
  L('d', 5, 'Night bus home and the engine is slow'),
]

describe('line diff (jsdiff) against a general-purpose reference', () => {
  it('keeps exactly the lines diff-sequences (Myers) finds in common, on a realistic edit', () => {
    const steps = diffLineSteps(from, to)
    const kept = steps.filter(s => s.op === 'same').map(s => [s.fromIndex, s.toIndex])
    // diff-sequences (Jest) as the reference implementation.
    expect(kept).toEqual(referenceCommon(from, to, sameLine))
    expect(steps.filter(s => s.op === 'removed').map(s => s.line.id)).toEqual(['b', 'd', 'e'])
    expect(steps.filter(s => s.op === 'added').map(s => s.line.id)).toEqual(['b', 'x', 'd'])
  })

  it('agrees with jsdiff\'s own diffLines on the same lines written out as text', () => {
    const asText = (ls: LyricLine[]) => ls.map(l => `${l.bar}\t${l.text}\n`).join('')
    const textual = diffLines(asText(from), asText(to))
    const counted = { added: 0, removed: 0, same: 0 }
    for (const part of textual) counted[part.added ? 'added' : part.removed ? 'removed' : 'same'] += part.count ?? 0
    const steps = diffLineSteps(from, to)
    expect({ added: steps.filter(s => s.op === 'added').length, removed: steps.filter(s => s.op === 'removed').length, same: steps.filter(s => s.op === 'same').length }).toEqual(counted)
  })

  it('rows pair a reworded or moved line by its id and mark the words that changed', () => {
    const rows = diffRows(from, to)
    expect(rows.map(r => r.kind)).toEqual(['same', 'changed', 'same', 'added', 'changed', 'removed'])
    const reworded = rows[1]!
    expect(reworded.kind === 'changed' && reworded.words.filter(w => w.removed || w.added).map(w => [w.value, !!w.added])).toEqual([['read', false], ['count', true]])
    const moved = rows[4]!
    expect(moved.kind === 'changed' && [moved.from.bar, moved.to.bar]).toEqual([4, 5])
    expect(diffStats(rows)).toEqual({ same: 2, changed: 2, added: 1, removed: 1 })
  })

  it('is minimal and complete on random drafts: as many kept lines as the reference, and both sides rebuilt', () => {
    const line = fc.record({ id: fc.constantFrom('a', 'b', 'c', 'd', 'e', 'f'), bar: fc.integer({ min: 1, max: 6 }), text: fc.constantFrom('x', 'y', 'z', 'w') })
    fc.assert(fc.property(fc.array(line, { maxLength: 14 }), fc.array(line, { maxLength: 14 }), (a, b) => {
      const steps = diffLineSteps(a, b)
      const kept = steps.filter(s => s.op === 'same').length
      // Two minimal scripts may choose different lines, but never a different number of them.
      expect(kept).toBe(referenceCommon(a, b, sameLine).length)
      expect(steps.filter(s => s.op !== 'added').map(s => s.line)).toEqual(a)
      expect(steps.filter(s => s.op !== 'removed').map(s => (s.op === 'same' ? b[s.toIndex!] : s.line))).toEqual(b)
    }), { numRuns: 300 })
  })

  it('treats a changed bar, span or out mark as a change', () => {
    expect(sameLine(L('a', 1, 'x'), L('z', 1, 'x'))).toBe(true)
    expect(sameLine(L('a', 1, 'x'), L('a', 2, 'x'))).toBe(false)
    expect(sameLine(L('a', 1, 'x'), L('a', 1, 'x', { bars: 2 }))).toBe(false)
    expect(sameLine(L('a', 1, 'x', { bars: 1 }), L('a', 1, 'x'))).toBe(true)
    expect(sameLine(L('a', 1, 'x'), L('a', 1, 'x', { out: true }))).toBe(false)
  })
})

describe('replaceLineText', () => {
  it('replaces one line and keeps the rest of the document', () => {
    const doc = docFromLines(from)
    const next = replaceLineText(doc, 'c', 'Pocket full of change and a borrowed coat')!
    expect(linesFromDoc(next)).toEqual(from.map(l => (l.id === 'c' ? { ...l, text: 'Pocket full of change and a borrowed coat' } : l)))
    expect(linesFromDoc(doc)).toEqual(from)
    expect(replaceLineText(doc, 'missing', 'x')).toBeNull()
    expect(linesFromDoc(replaceLineText(doc, 'a', '')!)[0]).toEqual(L('a', 1, ''))
  })
})

describe('docWithLines', () => {
  it('keeps each line in its section block and puts new lines after their neighbour', () => {
    const doc = docFromLines(from, [{ id: 's1', kind: 'hook', label: 'Hook', startBar: 1, endBar: 2 }, { id: 's2', kind: 'verse', label: 'Verse', startBar: 3, endBar: 8 }])
    const edited = [from[0]!, L('n', 2, 'new in the hook'), from[1]!, { ...from[2]!, text: 'changed' }, from[4]!]
    const next = docWithLines(doc, edited)
    expect(linesFromDoc(next)).toEqual(edited)
    expect(next.content.map(b => [b.attrs.label, b.content!.map(n => n.attrs.lineId)])).toEqual([['Hook', ['a', 'n', 'b']], ['Verse', ['c', 'e']]])
    expect(linesFromDoc(docWithLines(null, edited))).toEqual(edited)
  })
})

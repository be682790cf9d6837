import { describe, expect, it } from 'vitest'
import { applyMerge, mergeRows } from '../../shared/utils/line-merge'
import { alignByBar } from '../../shared/utils/bar-align'
import type { LyricLine } from '../../shared/utils/lyric-doc'

const L = (id: string, bar: number, text: string): LyricLine => ({ id, bar, text })
const base = [L('a', 1, 'one'), L('b', 2, 'two'), L('c', 3, 'three'), L('d', 4, 'four')]
// They reworded b and removed d; I reworded c and added e.
const theirs = [L('a', 1, 'one'), L('b', 2, 'two, theirs'), L('c', 3, 'three')]
const mine = [L('a', 1, 'one'), L('b', 2, 'two'), L('c', 3, 'three, mine'), L('d', 4, 'four'), L('e', 5, 'five')]

let n = 0
const ids = () => `new${++n}`

describe('merge of a kept-aside save with the head', () => {
  it('suggests the side that changed each line, given the base', () => {
    const rows = mergeRows(theirs, mine, base)
    const differing = rows.filter(r => r.differs).map(r => [r.theirs?.id ?? null, r.mine?.id ?? null, r.suggested, r.conflict])
    expect(differing).toEqual([
      ['b', 'b', 'theirs', false],
      ['c', 'c', 'mine', false],
      [null, 'd', 'theirs', false],
      [null, 'e', 'mine', false],
    ])
    // Taking every suggestion keeps both people's changes.
    expect(applyMerge(rows)).toEqual([L('a', 1, 'one'), L('b', 2, 'two, theirs'), L('c', 3, 'three, mine'), L('e', 5, 'five')])
  })

  it('take mine / take theirs / keep both, line by line; ids stay unique', () => {
    const rows = mergeRows(theirs, mine, null)
    expect(rows.filter(r => r.differs).every(r => r.conflict && r.suggested === 'both')).toBe(true)
    const keyOf = (id: string) => rows.find(r => (r.theirs?.id ?? r.mine?.id) === id && r.differs)!.key
    const merged = applyMerge(rows, { [keyOf('b')]: 'mine', [keyOf('c')]: 'both', [keyOf('d')]: 'theirs', [keyOf('e')]: 'mine' }, ids)
    expect(merged.map(l => l.text)).toEqual(['one', 'two', 'three', 'three, mine', 'five'])
    expect(new Set(merged.map(l => l.id)).size).toBe(merged.length)
    expect(merged[2]!.id).toBe('c')
    expect(merged[3]!.id).toMatch(/^new/)
  })

  it('with nothing different there is nothing to choose', () => {
    const rows = mergeRows(base, base, base)
    expect(rows.every(r => !r.differs)).toBe(true)
    expect(applyMerge(rows)).toEqual(base)
  })
})

describe('two drafts side by side on the same bars', () => {
  it('one row per bar either side uses, with gaps counted', () => {
    const left = [L('a', 1, 'one'), L('b', 2, 'two'), L('b2', 2, '(ad-lib)'), L('c', 5, 'five')]
    const right = [L('a', 1, 'one'), L('x', 3, 'three'), L('c', 5, 'five, slower')]
    const rows = alignByBar(left, right)
    expect(rows.map(r => [r.bar, r.left.length, r.right.length, r.same, r.gapBefore])).toEqual([
      [1, 1, 1, true, 0],
      [2, 2, 0, false, 0],
      [3, 0, 1, false, 0],
      [5, 1, 1, false, 1],
    ])
  })
})

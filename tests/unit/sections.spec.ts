import { describe, expect, it } from 'vitest'
import { barsIn, overlapping, rearrange } from '../../shared/utils/sections'

const s = (id: string, startBar: number, endBar: number) => ({ id, startBar, endBar })

describe('section ranges', () => {
  it('finds a shared bar, both ends included', () => {
    const list = [s('a', 1, 4), s('b', 5, 20)]
    expect(overlapping(list, { startBar: 4, endBar: 4 })?.id).toBe('a')
    expect(overlapping(list, { startBar: 21, endBar: 28 })).toBeNull()
    expect(overlapping(list, { startBar: 3, endBar: 8 }, 'a')?.id).toBe('b')
    // common practice: a 16-bar verse
    expect(barsIn(list[1]!)).toBe(16)
  })

  it('re-arranges keeping lengths and the gap after each slot', () => {
    const list = [s('intro', 1, 4), s('verse', 5, 20), s('hook', 23, 30)]
    expect(rearrange(list, ['hook', 'intro', 'verse'])!.map(x => [x.id, x.startBar, x.endBar])).toEqual([['hook', 1, 8], ['intro', 9, 12], ['verse', 15, 30]])
    expect(rearrange(list, ['hook', 'intro'])).toBeNull()
    expect(rearrange(list, ['hook', 'hook', 'verse'])).toBeNull()
    expect(rearrange([], [])).toEqual([])
  })
})

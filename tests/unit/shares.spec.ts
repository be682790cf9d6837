import { describe, expect, it } from 'vitest'
import { formatShare, shareToBp, splitTotalProblem } from '../../shared/utils/shares'

const bp = (...shares: Array<string | number>) => shares.map(s => ({ shareBp: shareToBp(s)! }))

describe('split shares in basis points', () => {
  // DOMAIN.md §7: store basis points; 33.33 + 33.33 + 33.34 = 10 000 [A, CP].
  it('accepts 33.33 + 33.33 + 33.34 as exactly 100.00 %', () => {
    expect(bp('33.33', '33.33', '33.34').map(s => s.shareBp)).toEqual([3333, 3333, 3334])
    expect(splitTotalProblem(bp('33.33', '33.33', '33.34'))).toBeNull()
    expect(splitTotalProblem(bp(33.33, 33.33, 33.34))).toBeNull()
  })

  it('refuses 33.33 × 3 with a message naming the total', () => {
    const problem = splitTotalProblem(bp('33.33', '33.33', '33.33'))
    expect(problem).toContain('99.99 %')
    expect(problem).toContain('0.01 short')
    expect(splitTotalProblem(bp(60, 50))).toContain('110.00 %')
  })

  it('reads per cents with at most two decimals, from text or numbers', () => {
    expect(shareToBp('100')).toBe(10_000)
    expect(shareToBp('100.00')).toBe(10_000)
    expect(shareToBp('0.01')).toBe(1)
    expect(shareToBp(' 12.5 ')).toBe(1250)
    expect(shareToBp(0.1 + 0.2)).toBe(30)
    for (const bad of ['33.333', '100.01', '-1', 'abc', '1e2', '', '50 %']) expect(shareToBp(bad), bad).toBeNull()
    for (const bad of [33.333, 100.01, -0.01, Number.NaN, Infinity]) expect(shareToBp(bad), String(bad)).toBeNull()
  })

  it('prints basis points as per cent with two decimals', () => {
    expect(formatShare(3333)).toBe('33.33')
    expect(formatShare(5)).toBe('0.05')
    expect(formatShare(10_000)).toBe('100.00')
  })
})

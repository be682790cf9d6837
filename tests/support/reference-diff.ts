// Jest's `diff-sequences` (a separate implementation of Myers' O(ND) difference algorithm,
// "An O(ND) Difference Algorithm and Its Variations", Algorithmica 1986) as the reference the
// project's line diff is checked against.
import * as diffSequencesModule from 'diff-sequences'

type DiffSequences = (aLength: number, bLength: number, isCommon: (ai: number, bi: number) => boolean, found: (n: number, ai: number, bi: number) => void) => void

const mod = diffSequencesModule as unknown as { default: DiffSequences | { default: DiffSequences } }
const diffSequences: DiffSequences = typeof mod.default === 'function' ? mod.default : mod.default.default

/** Pairs (index in a, index in b) of the longest common subsequence diff-sequences finds. */
export function referenceCommon<T>(a: readonly T[], b: readonly T[], same: (x: T, y: T) => boolean): Array<[number, number]> {
  const pairs: Array<[number, number]> = []
  diffSequences(a.length, b.length, (ai, bi) => same(a[ai]!, b[bi]!), (n, ai, bi) => {
    for (let k = 0; k < n; k++) pairs.push([ai + k, bi + k])
  })
  return pairs
}

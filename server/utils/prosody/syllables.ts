import { base, isVowel, stressOf } from './arpabet'

export interface SyllablePart {
  /** The phones of this syllable, e.g. ["S", "K", "ER1", "T"]. */
  phones: string[]
  /** 0 unstressed, 1 primary, 2 secondary. */
  stress: 0 | 1 | 2
}

// Consonant pairs English allows at the start of a syllable (kept with the next vowel).
const ONSETS = new Set(['P R', 'P L', 'B R', 'B L', 'T R', 'D R', 'K R', 'K L', 'G R', 'G L', 'F R', 'F L', 'TH R', 'SH R', 'S P', 'S T', 'S K', 'S M', 'S N', 'S L', 'S W', 'K W', 'T W', 'D W', 'G W', 'P Y', 'B Y', 'K Y', 'F Y', 'M Y', 'V Y', 'HH Y'])

const cache = new WeakMap<readonly string[], SyllablePart[]>()

/**
 * Splits a pronunciation into syllables, one per vowel, for placing on a cadence grid: a single
 * consonant between vowels starts the next syllable; of a cluster, a permitted two-consonant
 * onset (TR, ST, KW…) goes with the next vowel and the rest closes the syllable before.
 */
export function splitSyllables(phones: readonly string[]): SyllablePart[] {
  const hit = cache.get(phones)
  if (hit) return hit
  const vowelAt: number[] = []
  for (let i = 0; i < phones.length; i++) if (isVowel(phones[i]!)) vowelAt.push(i)
  const parts: SyllablePart[] = []
  let start = 0
  for (let k = 0; k < vowelAt.length; k++) {
    const v = vowelAt[k]!
    let end = phones.length
    if (k + 1 < vowelAt.length) {
      const next = vowelAt[k + 1]!
      const between = next - v - 1
      if (between <= 1) end = v + 1
      else {
        const pair = `${base(phones[next - 2]!)} ${base(phones[next - 1]!)}`
        end = ONSETS.has(pair) ? next - 2 : next - 1
      }
    }
    parts.push({ phones: phones.slice(start, end), stress: stressOf(phones[v]!) as 0 | 1 | 2 })
    start = end
  }
  cache.set(phones, parts)
  return parts
}

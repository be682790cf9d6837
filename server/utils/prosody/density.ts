import { base, isVowel } from './arpabet'

/**
 * Rhyme density as defined by Malmi, Takala, Toivonen, Raiko & Gionis, "DopeLearning: A
 * Computational Approach to Rap Lyrics Generation", KDD 2016 (arXiv 1505.04771), and computed
 * as in the authors' reference implementation (raplyzer, `lyrics.py`): the lyric becomes one
 * stream of vowel sounds; for every word after the first, its rhyme length is the longest run
 * of matching vowels read backwards from its last vowel against the last vowel of each of the
 * 15 words before it; a word against the same word counts 0, a run stops where both sides
 * reach an identical earlier word, the earlier side may not overlap the later one, and a run
 * of 1 counts 0. Rhyme density is the mean of these lengths. Vowels here are ARPAbet phones
 * without stress; the reference used eSpeak's IPA, so its merge of doubled vowel letters has
 * no counterpart. Callers drop repeated lines first, as the reference does.
 */
export const DENSITY_LOOKBACK = 15

export interface DensityWord { phones: readonly string[] }

/**
 * A lyric as one vowel stream: `vow` the vowel sounds (any comparable ids), `vowelWord` the word
 * of each vowel, `ends` each word's last vowel position, `ids` each word as transcribed up to its
 * last vowel (words alike compare equal).
 */
export interface DensityStream {
  vow: ArrayLike<number | string>
  vowelWord: ArrayLike<number>
  ends: ArrayLike<number>
  ids: readonly string[]
}

/** Mean rhyme length over words 2…n, or null with fewer than two words that hold a vowel. */
export function rhymeDensity(words: readonly DensityWord[]): number | null {
  const vow: string[] = []
  const vowelWord: number[] = []
  const ends: number[] = []
  const ids: string[] = []
  for (const w of words) {
    let last = -1
    for (let i = 0; i < w.phones.length; i++) if (isVowel(w.phones[i]!)) last = i
    if (last < 0) continue
    const wi = ends.length
    for (const p of w.phones) {
      if (isVowel(p)) {
        vow.push(base(p))
        vowelWord.push(wi)
      }
    }
    ends.push(vow.length - 1)
    // The reference compares words as transcribed up to their last vowel.
    ids.push(w.phones.slice(0, last + 1).map(base).join(' '))
  }
  return streamDensity({ vow, vowelWord, ends, ids })
}

/** `rhymeDensity` over a stream already built (the analysis keeps one per line). */
export function streamDensity({ vow, vowelWord, ends, ids }: DensityStream): number | null {
  const n = ends.length
  if (n < 2) return null
  let total = 0
  for (let w2 = 1; w2 < n; w2++) {
    let best = 0
    const p2 = ends[w2]!
    for (let w1 = Math.max(0, w2 - DENSITY_LOOKBACK); w1 < w2; w1++) {
      // Most pairs differ on their last vowel: skip the call.
      if (vow[ends[w1]!] !== vow[p2]) continue
      const l = fixedLength(w1, w2)
      if (l > best) best = l
    }
    total += best
  }
  return total / (n - 1)

  function fixedLength(w1: number, w2: number): number {
    if (ids[w1] === ids[w2]) return 0
    const p1 = ends[w1]!
    const p2 = ends[w2]!
    let l = 0
    while (vow[p1 - l] === vow[p2 - l]) {
      if (w1 > 0 && p1 - l <= ends[w1 - 1]! && w2 > 0 && p2 - l <= ends[w2 - 1]!) {
        if (ids[vowelWord[p1 - l]!] === ids[vowelWord[p2 - l]!]) break
      }
      l++
      if (p1 - l < 0 || p2 - l <= p1) break
    }
    return l === 1 ? 0 : l
  }
}

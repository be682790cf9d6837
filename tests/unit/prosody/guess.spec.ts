// The guess path (derived forms, then letter-to-sound) on words the dictionary lacks, and on
// dictionary words hidden from it, scored beside the general-purpose npm `syllable` package.
import { dictionary as cmu } from 'cmu-pronouncing-dictionary'
import { syllable } from 'syllable'
import { describe, expect, it } from 'vitest'
import { syllableCount } from '../../../shared/utils/arpabet'
import { dictionaryPronunciations, inDictionary } from '../../../server/utils/prosody/dictionary'
import { train } from '../../../server/utils/prosody/lts'
import { trainingEntries } from '../../../server/utils/prosody/lts-data'
import { resolveWord } from '../../../server/utils/prosody/resolve'
import { OOV_WORDS } from './oov-words'

const raw = cmu as Record<string, string>

/** Mulberry32: a small seeded generator, so the held-out sample is the same every run. */
function mulberry32(seed: number) {
  let a = seed
  return () => {
    a = (a + 0x6D2B79F5) | 0
    let t = Math.imul(a ^ (a >>> 15), 1 | a)
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

describe('the guess path', () => {
  it('agrees with the counts of at least 50 out-of-dictionary words on 90 % or more', () => {
    // Counts from memory (tests/unit/prosody/oov-words.ts); npm `syllable` 5.0.1 scored beside
    expect(OOV_WORDS.length).toBeGreaterThanOrEqual(50)
    let ours = 0
    let theirs = 0
    const misses: string[] = []
    for (const [word, count] of OOV_WORDS) {
      expect(inDictionary(word), `${word} must not be a dictionary word`).toBe(false)
      const r = resolveWord(word)
      expect(r.source).toBe('guess')
      const got = syllableCount(r.prons[0]!)
      if (got === count) ours++
      else misses.push(`${word} ${got}≠${count} (${r.method})`)
      if (syllable(word) === count) theirs++
    }
    const score = ours / OOV_WORDS.length
    console.log(`[prosody] out-of-dictionary words: guess path ${(score * 100).toFixed(1)} %, npm syllable ${(theirs / OOV_WORDS.length * 100).toFixed(1)} % (${OOV_WORDS.length} words); misses: ${misses.join(', ')}`)
    expect(score).toBeGreaterThanOrEqual(0.9)
  })

  it('derives dropped-g, inflected and compound forms from dictionary words', () => {
    expect(resolveWord('runnin')).toMatchObject({ source: 'guess', method: 'dropped-g', parts: ['running'] })
    expect(resolveWord('runnin').prons[0]!.slice(-2)).toEqual(['IH0', 'N'])
    expect(resolveWord('stagelight')).toMatchObject({ method: 'compound', parts: ['stage', 'light'] })
    // Compound stress on the first element (common practice): stage S T EY1 JH, light demoted to 2
    expect(resolveWord('stagelight').prons[0]).toEqual(['S', 'T', 'EY1', 'JH', 'L', 'AY2', 'T'])
    expect(resolveWord('flexin').parts).toEqual(['flexing'])
  })

  it('counts 2,000 hidden dictionary words at 85 % or better (fixed seed 20240601)', () => {
    // CMU Pronouncing Dictionary: each hidden word's first pronunciation is the reference
    const words = Object.keys(raw).filter(k => /^[a-z]+$/.test(k))
    const rnd = mulberry32(20240601)
    for (let i = words.length - 1; i > 0; i--) {
      const j = Math.floor(rnd() * (i + 1))
      ;[words[i], words[j]] = [words[j]!, words[i]!]
    }
    const hidden = new Set(words.slice(0, 2000))
    // Hidden from the lookup and from the letter-to-sound training alike.
    const model = train(trainingEntries(hidden))
    const lookup = (w: string) => (hidden.has(w) ? null : dictionaryPronunciations(w))
    let first = 0
    let any = 0
    let theirs = 0
    for (const w of hidden) {
      const r = resolveWord(w, { lookup, model })
      expect(r.source).toBe('guess')
      const got = syllableCount(r.prons[0]!)
      const counts = dictionaryPronunciations(w)!.map(syllableCount)
      if (got === counts[0]) first++
      if (counts.includes(got)) any++
      if (syllable(w) === counts[0]) theirs++
    }
    const score = first / hidden.size
    console.log(`[prosody] held-out 2,000 dictionary words: guess path ${(score * 100).toFixed(1)} % (first pronunciation), ${(any / hidden.size * 100).toFixed(1)} % (any); npm syllable ${(theirs / hidden.size * 100).toFixed(1)} %`)
    expect(score).toBeGreaterThanOrEqual(0.85)
  }, 120_000)
})

// The engine's syllables and stress for dictionary words against the CMU Pronouncing
// Dictionary itself (npm cmu-pronouncing-dictionary 3.0.0), including words with several
// pronunciations, and the data's pitfalls.
import { dictionary as cmu } from 'cmu-pronouncing-dictionary'
import { describe, expect, it } from 'vitest'
import { parsePhones } from '../../../shared/utils/arpabet'
import { analyseDraft } from '../../../server/utils/prosody/analyse'
import { CORRECTIONS } from '../../../server/utils/prosody/corrections'
import { dictionaryKeys, dictionaryPronunciations, dictionarySize, inDictionary, rawPronunciations, rawValue } from '../../../server/utils/prosody/dictionary'
import { resolveWord } from '../../../server/utils/prosody/resolve'

const raw = cmu as Record<string, string>
const clean = (v: string) => v.split('#')[0]!.trim()
const digits = (v: string) => clean(v).split(' ').filter(p => /\d$/.test(p)).map(p => p.slice(-1)).join('')
function cmuProns(word: string): string[] {
  const out = [raw[word]!]
  for (let i = 2; Object.hasOwn(raw, `${word}(${i})`); i++) out.push(raw[`${word}(${i})`]!)
  return out
}

const headwords = Object.keys(raw).filter(k => /^[a-z]+$/.test(k) && !Object.hasOwn(CORRECTIONS, k))
const several = headwords.filter(w => new Set(cmuProns(w).map(p => digits(p).length)).size > 1)

describe('dictionary words against the CMU Pronouncing Dictionary', () => {
  it('reads the package\'s data file to the same keys and values as the package exports', () => {
    // CMU Pronouncing Dictionary via npm cmu-pronouncing-dictionary 3.0.0: its own export is the reference
    const keys = Object.keys(raw)
    expect(dictionarySize()).toBe(keys.length)
    expect(dictionaryKeys()).toEqual(keys)
    const wrong: string[] = []
    for (const k of keys) if (rawValue(k) !== clean(raw[k]!)) wrong.push(k)
    for (const w of headwords) if (rawPronunciations(w).join('|') !== cmuProns(w).map(clean).join('|')) wrong.push(w)
    expect(wrong).toEqual([])
    // Only the data's own keys resolve (the dictionary does have "constructor", as a word)
    for (const k of ['__proto__', 'constructor', 'toString', 'hasOwnProperty', 'valueOf', '', 'word(2)x']) {
      expect(rawPronunciations(k), k).toEqual(Object.hasOwn(raw, k) ? cmuProns(k).map(clean) : [])
    }
    expect(rawPronunciations('__proto__')).toEqual([])
  })

  it('gives every 40th headword the dictionary\'s syllable count and stress pattern', () => {
    // CMU Pronouncing Dictionary: a word's syllables = its stress digits
    const sample = headwords.filter((_, i) => i % 40 === 0)
    expect(sample.length).toBeGreaterThan(2500)
    const wrong: string[] = []
    for (const w of sample) {
      const r = resolveWord(w)
      expect(r.source).toBe('dictionary')
      const want = digits(raw[w]!)
      const got = r.prons[0]!.filter(p => /\d$/.test(p)).map(p => p.slice(-1)).join('')
      if (got !== want) wrong.push(`${w}: ${got} ≠ ${want}`)
    }
    expect(wrong).toEqual([])
  })

  it('keeps every pronunciation of words whose counts differ, with the range from them', () => {
    // CMU Pronouncing Dictionary: alternates word(2)…word(4)
    expect(several.length).toBeGreaterThan(1500)
    for (const w of several) {
      const counts = cmuProns(w).map(p => digits(p).length)
      const line = analyseDraft({ lines: [{ id: 'x', bar: 1, text: w }] }).lines[0]!
      expect(line.words[0]!.pronunciations.map(p => p.join(' '))).toEqual(cmuProns(w).map(clean))
      expect([line.syllablesMin, line.syllablesMax, line.words[0]!.syllables], w).toEqual([Math.min(...counts), Math.max(...counts), counts[0]])
    }
  })

  it('has the measured ranges for the words writers argue about', () => {
    // CMU Pronouncing Dictionary via the npm package (DOMAIN.md §2, measured)
    const cases: Array<[string, number[]]> = [['fire', [2, 1]], ['hour', [2, 1]], ['our', [2, 1, 1]], ['every', [3, 2]], ['family', [3, 2]],
      ['different', [3, 2]], ['camera', [3, 2]], ['favorite', [3, 2]], ['probably', [3, 2]], ['actually', [4, 2, 3]], ['literally', [4, 3]],
      ['interesting', [3, 3, 4, 4]], ['prayer', [1, 2]], ['trying', [2, 1]], ['orange', [2, 2]], ['poem', [2]]]
    for (const [w, counts] of cases) {
      expect(dictionaryPronunciations(w)!.map(p => p.filter(x => /\d$/.test(x)).length), w).toEqual(counts)
    }
  })

  it('looks words up as own properties only, straightens curly apostrophes and strips inline comments', () => {
    for (const w of ['__proto__', 'hasOwnProperty', 'toString', 'valueOf', 'isPrototypeOf', '__defineGetter__']) {
      expect(inDictionary(w), w).toBe(false)
      expect(resolveWord(w).source).toBe('guess')
    }
    expect(dictionaryPronunciations('y\u2019all')).toEqual([['Y', 'AO2', 'L']])
    // CMU Pronouncing Dictionary: "aalborg" carries "# place, danish"
    expect(raw.aalborg).toContain('#')
    expect(dictionaryPronunciations('aalborg')![0]).toEqual(['AO1', 'L', 'B', 'AO0', 'R', 'G'])
  })

  it('applies each reviewed correction before the dictionary, each with a reason and valid ARPAbet', () => {
    for (const [word, fix] of Object.entries(CORRECTIONS)) {
      expect(fix.reason.length, word).toBeGreaterThan(10)
      for (const p of fix.prons) expect(parsePhones(p).ok, `${word}: ${p}`).toBe(true)
      expect(resolveWord(word).prons[0]!.join(' ')).toBe(fix.prons[0])
    }
    // The dictionary's own entries that the table overrides (DOMAIN.md §2)
    expect(raw.mic).toBe('M IH1 K')
    expect(raw.bae).toBe('B AY1')
    expect(resolveWord('mic')).toMatchObject({ prons: [['M', 'AY1', 'K']], source: 'dictionary', method: 'correction' })
    expect(resolveWord('bae').prons).toEqual([['B', 'EY1']])
  })
})

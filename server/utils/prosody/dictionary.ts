import { dictionary as cmu } from 'cmu-pronouncing-dictionary'
import { CORRECTIONS } from './corrections'

/**
 * Lookup into the CMU Pronouncing Dictionary (npm `cmu-pronouncing-dictionary`), which is one
 * large object literal: it is imported once per process and used in place, never copied.
 * Pitfalls handled here: own properties only (`__proto__`, `constructor` must not resolve),
 * alternates as `word(2)`…`word(4)`, a `# comment` after a few values, curly apostrophes.
 */
const own = Object.prototype.hasOwnProperty
const raw = cmu as Record<string, string>

/** Lower case, curly apostrophes and backticks as `'`. */
export function normalizeKey(word: string): string {
  return word.toLowerCase().replace(/[\u2018\u2019\u02bc`\u00b4]/g, '\'')
}

/** One stored pronunciation string, cleaned of an inline comment. */
export function cleanPron(value: string): string {
  const hash = value.indexOf('#')
  return (hash >= 0 ? value.slice(0, hash) : value).trim()
}

/** The dictionary's pronunciation strings for `key` (already normalised), without corrections. */
export function rawPronunciations(key: string): string[] {
  if (!key || !own.call(raw, key)) return []
  const out = [cleanPron(raw[key]!)]
  for (let i = 2; i <= 9; i++) {
    const alt = `${key}(${i})`
    if (!own.call(raw, alt)) break
    out.push(cleanPron(raw[alt]!))
  }
  return out
}

const parsed = new Map<string, string[][] | null>()
const PARSED_CAP = 60_000

/**
 * All pronunciations of `word` as phone arrays (first = the dictionary's first), with the
 * reviewed corrections applied first; null when neither has the word. Results are shared
 * and must not be mutated.
 */
export function dictionaryPronunciations(word: string): string[][] | null {
  const key = normalizeKey(word)
  const hit = parsed.get(key)
  if (hit !== undefined) return hit
  const fix = own.call(CORRECTIONS, key) ? CORRECTIONS[key]! : null
  const strings = fix ? fix.prons : rawPronunciations(key)
  const result = strings.length ? strings.map(s => s.split(' ')) : null
  if (parsed.size >= PARSED_CAP) parsed.clear()
  parsed.set(key, result)
  return result
}

/** True when the word is a headword of the dictionary or the corrections table. */
export function inDictionary(word: string): boolean {
  const key = normalizeKey(word)
  return own.call(CORRECTIONS, key) || (!!key && own.call(raw, key))
}

/** Every key of the dictionary object (headwords and `(n)` alternates), for index builders. */
export function dictionaryKeys(): string[] {
  return Object.keys(raw)
}

/** The raw value for one key (for index builders walking `dictionaryKeys()`). */
export function rawValue(key: string): string {
  return cleanPron(raw[key]!)
}

/** Headword of a key: `word(2)` → `word`. */
export function headword(key: string): string {
  const p = key.indexOf('(')
  return p > 0 && key.endsWith(')') ? key.slice(0, p) : key
}

import { readFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { CORRECTIONS } from './corrections'

/**
 * Lookup into the CMU Pronouncing Dictionary (npm `cmu-pronouncing-dictionary` 3.0.0). The
 * package is one module holding a 135,155-key object literal; evaluating it costs hundreds of
 * milliseconds and ~20 MB of heap. Its file is read instead, once per process, as one string,
 * and indexed in place: where each entry's key and value sit (typed arrays) and an
 * open-addressing hash table over the keys. Nothing is copied per entry or per request.
 * A test checks every key and value against the package's own export.
 * Pitfalls handled here: only the data's own keys resolve (`__proto__`, `constructor` do not),
 * alternates as `word(2)`…`word(4)` (each right after the one before), a `# comment` after a few
 * values, curly apostrophes.
 */
let source = ''
let loadMs = -1

/** Entry i: key at [keyStart, keyEnd), value at [valueStart, valueEnd) of `source`. */
let count = 0
let keyStart = new Int32Array(0)
let keyEnd = new Int32Array(0)
let valueStart = new Int32Array(0)
let valueEnd = new Int32Array(0)
const TABLE_BITS = 18
const table = new Int32Array(1 << TABLE_BITS) // entry + 1, 0 = empty
const MASK = (1 << TABLE_BITS) - 1

function grow() {
  const g = (a: Int32Array) => {
    const b = new Int32Array(Math.max(140_000, a.length * 2))
    b.set(a)
    return b
  }
  keyStart = g(keyStart)
  keyEnd = g(keyEnd)
  valueStart = g(valueStart)
  valueEnd = g(valueEnd)
}

// FNV-1a over the characters, 32 bits.
function hashRange(s: string, from: number, to: number): number {
  let h = 0x811C9DC5
  for (let i = from; i < to; i++) h = Math.imul(h ^ s.charCodeAt(i), 0x01000193)
  return h >>> 0
}

/**
 * Reads and indexes the data file, once, on first use (the built server resolves the package
 * from its own folder, which it only knows once its entry has run).
 */
function load() {
  const startedAt = performance.now()
  source = readFileSync(createRequire(import.meta.url).resolve('cmu-pronouncing-dictionary'), 'latin1')
  // Lines look like `  "key": "value",`; the data has no escapes (the test checks every entry).
  let at = source.indexOf('{')
  while (true) {
    const k0 = source.indexOf('"', at)
    if (k0 < 0) break
    const k1 = source.indexOf('"', k0 + 1)
    const v0 = source.indexOf('"', k1 + 1)
    const v1 = source.indexOf('"', v0 + 1)
    if (k1 < 0 || v0 < 0 || v1 < 0) break
    if (count === keyStart.length) grow()
    keyStart[count] = k0 + 1
    keyEnd[count] = k1
    valueStart[count] = v0 + 1
    valueEnd[count] = v1
    let slot = hashRange(source, k0 + 1, k1) & MASK
    while (table[slot] !== 0) slot = (slot + 1) & MASK
    table[slot] = ++count
    at = v1 + 1
  }
  loadMs = performance.now() - startedAt
}

/** How long reading and indexing the data file took (reading it now if it was not yet), for the bench. */
export function dictionaryLoadMs(): number {
  if (loadMs < 0) load()
  return loadMs
}

function sameKey(e: number, key: string): boolean {
  const from = keyStart[e]!
  if (keyEnd[e]! - from !== key.length) return false
  for (let i = 0; i < key.length; i++) if (source.charCodeAt(from + i) !== key.charCodeAt(i)) return false
  return true
}

/** The entry of `key` (exact, already normalised), or -1. */
function entryOf(key: string): number {
  if (loadMs < 0) load()
  if (!key) return -1
  let slot = hashRange(key, 0, key.length) & MASK
  while (true) {
    const e = table[slot]!
    if (e === 0) return -1
    if (sameKey(e - 1, key)) return e - 1
    slot = (slot + 1) & MASK
  }
}

/** True when entry `e` is `key(n)`. */
function isAlternate(e: number, key: string, n: number): boolean {
  if (e >= count) return false
  const from = keyStart[e]!
  if (keyEnd[e]! - from !== key.length + 3) return false
  for (let i = 0; i < key.length; i++) if (source.charCodeAt(from + i) !== key.charCodeAt(i)) return false
  return source.charCodeAt(from + key.length) === 40 && source.charCodeAt(from + key.length + 1) === 48 + n && source.charCodeAt(from + key.length + 2) === 41
}

/** Lower case, curly apostrophes and backticks as `'`. */
export function normalizeKey(word: string): string {
  return word.toLowerCase().replace(/[\u2018\u2019\u02bc`\u00b4]/g, '\'')
}

/** One stored pronunciation string, cleaned of an inline comment. */
export function cleanPron(value: string): string {
  const hash = value.indexOf('#')
  return (hash >= 0 ? value.slice(0, hash) : value).trim()
}

function valueOf(e: number): string {
  return cleanPron(source.slice(valueStart[e]!, valueEnd[e]!))
}

/** The dictionary's pronunciation strings for `key` (already normalised), without corrections. */
export function rawPronunciations(key: string): string[] {
  const e = entryOf(key)
  if (e < 0) return []
  const out = [valueOf(e)]
  for (let i = 2; i <= 9 && isAlternate(e + i - 1, key, i); i++) out.push(valueOf(e + i - 1))
  return out
}

/**
 * Calls `fn` with the place of each of `key`'s pronunciations in the data text (`source`,
 * from, to: comment and spaces already cut), the first one first, without making strings.
 * For index builders over many words.
 */
export function eachPronunciation(key: string, fn: (source: string, from: number, to: number, entry: number) => void): void {
  const e = entryOf(key)
  if (e < 0) return
  for (let i = 1; i <= 9 && (i === 1 || isAlternate(e + i - 1, key, i)); i++) {
    const x = e + i - 1
    let from = valueStart[x]!
    let to = valueEnd[x]!
    for (let i = from; i < to; i++) {
      if (source.charCodeAt(i) === 35) {
        to = i
        break
      }
    }
    while (to > from && source.charCodeAt(to - 1) === 32) to--
    while (from < to && source.charCodeAt(from) === 32) from++
    fn(source, from, to, x)
  }
}

/** The pronunciation string of a data entry met through `eachPronunciation`. */
export function entryPronunciation(entry: number): string {
  return valueOf(entry)
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
  const fix = Object.hasOwn(CORRECTIONS, key) ? CORRECTIONS[key]! : null
  const strings = fix ? fix.prons : rawPronunciations(key)
  const result = strings.length ? strings.map(s => s.split(' ')) : null
  if (parsed.size >= PARSED_CAP) parsed.clear()
  parsed.set(key, result)
  return result
}

/** True when the word is a headword of the dictionary or the corrections table. */
export function inDictionary(word: string): boolean {
  const key = normalizeKey(word)
  return Object.hasOwn(CORRECTIONS, key) || entryOf(key) >= 0
}

/** How many keys the dictionary has (headwords and `(n)` alternates). */
export function dictionarySize(): number {
  if (loadMs < 0) load()
  return count
}

/** Every key of the dictionary (headwords and `(n)` alternates), in the data's order, for index builders. */
export function dictionaryKeys(): string[] {
  if (loadMs < 0) load()
  const keys: string[] = new Array(count)
  for (let e = 0; e < count; e++) keys[e] = source.slice(keyStart[e]!, keyEnd[e]!)
  return keys
}

/** The raw value for one key (for index builders walking `dictionaryKeys()`), cleaned of its comment. */
export function rawValue(key: string): string {
  const e = entryOf(key)
  return e < 0 ? '' : valueOf(e)
}

/** Headword of a key: `word(2)` → `word`. */
export function headword(key: string): string {
  const p = key.indexOf('(')
  return p > 0 && key.endsWith(')') ? key.slice(0, p) : key
}

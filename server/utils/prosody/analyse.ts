import { LRUCache } from 'lru-cache'
import { base, rhymePart, stressPattern, syllableCount, VOWELS } from './arpabet'
import { streamDensity } from './density'
import { concatParts, resolveWord, type Lexicon, type Method, type ResolveOptions, type Source } from './resolve'
import { codasAlike, shapeOf } from './rhyme'
import { splitSyllables, type SyllablePart } from './syllables'
import { tokenize, type Token } from './tokenize'

/**
 * Over-packed: more syllables per second than the fastest rap in a hit single, counted at
 * about 10.65 syllables per second (Guinness World Records, 2020: 7.5 words/s over 30 s; see
 * DOMAIN.md §4). A bar asking for more cannot be delivered as written at that tempo.
 */
export const OVER_PACKED_SYLLABLES_PER_SECOND = 10.65
/**
 * Dense: faster than read English speech, 6.19 syllables per second (Pellegrino, Coupé &
 * Marsico, Language 87(3), 2011); performable, but it needs breath planning.
 */
export const DENSE_SYLLABLES_PER_SECOND = 6.19
/** How many earlier words a rhyme may reach back to inside a line pair (Malmi et al.'s lookback for English). */
export const INTERNAL_LOOKBACK_WORDS = 15
/** How many earlier lines an end-of-line multi may reach back to. */
export const END_MULTI_LOOKBACK_LINES = 8

export interface AnalysisLineInput { id: string, bar: number, text: string }
export interface AnalysisGrid { bpm: number, beatsPerBar: number, feel?: 'normal' | 'half' }
export interface AnalysisSection { id: string, startBar: number, endBar: number, kind?: string, label?: string }
export interface AnalysisInput {
  lines: AnalysisLineInput[]
  grid?: AnalysisGrid
  sections?: AnalysisSection[]
}

export interface WordAnalysis {
  /** Position in its line's `words`. */
  index: number
  text: string
  /** Lower case, apostrophes straightened. */
  normalized: string
  /** Words said aloud when they differ from the text (numbers: 808 → eight oh eight). */
  spoken?: string[]
  start: number
  end: number
  isAdlib: boolean
  /** The preferred pronunciation in ARPAbet. */
  phones: string[]
  /** Every pronunciation known, the preferred first. */
  pronunciations: string[][]
  syllables: number
  syllablesMin: number
  syllablesMax: number
  /** Stress digits of the preferred pronunciation, one per syllable ("10"). */
  stress: string
  /** The preferred pronunciation split per syllable, for a cadence grid. */
  syllableParts: SyllablePart[]
  source: Source
  method: Method
  /** Id of the rhyme family (perfect or near) this word belongs to. */
  family?: string
  /** Ids of the multi families whose phrases cover this word. */
  multi?: string[]
}

export interface LineAnalysis {
  id: string
  bar: number
  /** Syllables of the sung words (ad-libs excluded), preferred pronunciations. */
  syllables: number
  syllablesMin: number
  syllablesMax: number
  /** Syllables inside parentheses, counted apart. */
  adlibSyllables: number
  stress: string
  words: WordAnalysis[]
}

export interface BarAnalysis {
  bar: number
  syllables: number
  syllablesMin: number
  syllablesMax: number
  adlibSyllables: number
  lineIds: string[]
  syllablesPerBeat?: number
  syllablesPerSecond?: number
  dense?: boolean
  overPacked?: boolean
}

export interface FamilyWord { lineId: string, index: number, text: string }
export interface Family {
  id: string
  kind: 'perfect' | 'near' | 'multi'
  /** Gutter letter; the end-rhyme scheme uses the same letters. */
  letter: string
  /** The shared sound: the rhyme part (perfect), its vowels (near, multi). */
  key: string
  /** Multi families: how many vowel sounds match in a row. */
  syllables?: number
  /** Two of its words sit in the same line. */
  internal: boolean
  /** At least one of its words ends a line. */
  endRhyme: boolean
  words: FamilyWord[]
}

export interface SectionAnalysis {
  id: string
  kind?: string
  label?: string
  startBar: number
  endBar: number
  lineIds: string[]
  syllables: number
  /** Malmi et al. (KDD 2016) rhyme density of the section's lyric; null with fewer than two words. */
  rhymeDensity: number | null
}

export interface Analysis {
  lines: LineAnalysis[]
  bars: BarAnalysis[]
  families: Family[]
  scheme: string[]
  sections?: SectionAnalysis[]
  rhymeDensity: number | null
  thresholds: { overPackedSyllablesPerSecond: number, denseSyllablesPerSecond: number }
}

// Short function words: not rhyme carriers inside a line (they still count at a line's end).
const FUNCTION_WORDS = new Set(('a an the and or but nor of to in on at by for with from up as is it its i me my mine you your '
  + 'he him his she her we us our they them their this that these those be am are was were been do does did have has had '
  + 'not no so if then than can will would could should just like \'em em y\'all ya yo oh uh um im i\'m it\'s that\'s '
  + 'don\'t ain\'t gonna wanna gotta tryna what who when where how all got get').split(' '))

interface RhymeFacts { key: string, onset: string, partVowels: number }
const factsCache = new WeakMap<readonly string[], RhymeFacts>()

/** Rhyme part key, onset and the rhyme part's vowel count of a pronunciation (cached per shared array). */
function rhymeFacts(phones: readonly string[]): RhymeFacts {
  let f = factsCache.get(phones)
  if (!f) {
    const part = rhymePart(phones)
    f = { key: part.join(' '), onset: phones.slice(0, phones.length - part.length).map(base).join(' '), partVowels: shapeOf(part).vowels.length }
    factsCache.set(phones, f)
  }
  return f
}

const shortest = (p: string[][]) => p.reduce((m, x) => Math.min(m, syllableCount(x)), Infinity)
const longest = (p: string[][]) => p.reduce((m, x) => Math.max(m, syllableCount(x)), 0)

function analyseWord(token: Token, index: number, options: ResolveOptions): WordAnalysis {
  let prons: string[][]
  let source: Source
  let method: Method
  if (token.spoken.length === 1) {
    const r = resolveWord(token.spoken[0]!, options)
    prons = r.prons
    source = r.source
    method = r.method
  }
  else {
    const parts = token.spoken.map(w => resolveWord(w, options))
    prons = concatParts(parts.map(p => p.prons))
    source = parts.every(p => p.source === 'dictionary') ? 'dictionary' : parts.some(p => p.source === 'guess') ? 'guess' : 'lexicon'
    method = 'number'
  }
  const phones = prons[0]!
  const word: WordAnalysis = {
    index,
    text: token.text,
    normalized: token.norm,
    start: token.start,
    end: token.end,
    isAdlib: token.isAdlib,
    phones,
    pronunciations: prons,
    syllables: syllableCount(phones),
    syllablesMin: shortest(prons),
    syllablesMax: longest(prons),
    stress: stressPattern(phones),
    syllableParts: splitSyllables(phones),
    source,
    method,
  }
  if (token.spoken.length > 1 || token.spoken[0] !== token.norm) word.spoken = token.spoken
  return word
}

/** A word to mark with its families: every field written in one order, so copies share one shape. */
function markedCopy(w: WordAnalysis): WordAnalysis {
  const c: WordAnalysis = {
    index: w.index, text: w.text, normalized: w.normalized, start: w.start, end: w.end, isAdlib: w.isAdlib,
    phones: w.phones, pronunciations: w.pronunciations, syllables: w.syllables, syllablesMin: w.syllablesMin,
    syllablesMax: w.syllablesMax, stress: w.stress, syllableParts: w.syllableParts, source: w.source, method: w.method,
  }
  if (w.spoken) c.spoken = w.spoken
  return c
}

const VOWEL_ID = new Map<string, number>(VOWELS.map((v, i) => [v, i]))
const AH = VOWEL_ID.get('AH')!
const IH = VOWEL_ID.get('IH')!

/**
 * Everything about one line that does not depend on the lines around it, computed once per
 * line text (and lexicon) and shared by every analysis that sends the line again: its words,
 * counts, rhyme candidates, and its vowels as small integers for the multi and density passes.
 * Shared: never mutated after it is made.
 */
interface LineFacts {
  words: WordAnalysis[]
  syllables: number
  syllablesMin: number
  syllablesMax: number
  adlibSyllables: number
  stress: string
  /** Index of the last sung word (not an ad-lib, at least one syllable), -1 for none. */
  lastSung: number
  /** Words that may carry a perfect or near rhyme. */
  candidates: Array<{ index: number, lineEnd: boolean, key: string, onset: string, sound: string }>
  /** Sung words in order: their index, normalised spelling, rhyme part vowel count, last vowel (exclusive end in `vowels`). */
  sung: number[]
  sungNorm: string[]
  sungPartVowels: number[]
  sungEnd: number[]
  /** One entry per vowel of the sung words: the vowel id as a multi hears it (reduced schwa), its stress, its sung word. */
  multiVowels: number[]
  stressed: boolean[]
  vowelSung: number[]
  /** The vowel ids as the density reference reads them (no reduction), and each sung word up to its last vowel. */
  densityVowels: number[]
  densityIds: string[]
  /** The sung words joined: repeated lines count once in the density. */
  densityKey: string
  /** Every spoken word, to tell whether a lexicon touches the line. */
  spoken: string[]
  /** JSON of each word without its closing brace, per detail level, made on first use. */
  json: { words?: string[], full?: string[], head?: { id: string, bar: number, text: string } }
}

function lineFacts(text: string, options: ResolveOptions, tokens: Token[] = tokenize(text)): LineFacts {
  const words = tokens.map((t, i) => analyseWord(t, i, options))
  let syllables = 0
  let min = 0
  let max = 0
  let adlib = 0
  let stress = ''
  let lastSung = -1
  for (const w of words) {
    if (w.isAdlib) {
      adlib += w.syllables
      continue
    }
    syllables += w.syllables
    min += w.syllablesMin
    max += w.syllablesMax
    stress += w.stress
    if (w.syllables > 0) lastSung = w.index
  }
  const f: LineFacts = {
    words, syllables, syllablesMin: min, syllablesMax: max, adlibSyllables: adlib, stress, lastSung,
    candidates: [], sung: [], sungNorm: [], sungPartVowels: [], sungEnd: [], multiVowels: [], stressed: [], vowelSung: [],
    densityVowels: [], densityIds: [], densityKey: '', spoken: tokens.flatMap(t => t.spoken), json: {},
  }
  for (const w of words) {
    if (w.isAdlib || w.syllables === 0) continue
    const lineEnd = w.index === lastSung
    const facts = rhymeFacts(w.phones)
    if ((lineEnd || !FUNCTION_WORDS.has(w.normalized)) && facts.key) f.candidates.push({ index: w.index, lineEnd, key: facts.key, onset: facts.onset, sound: `${facts.onset}|${facts.key}` })
    const k = f.sung.length
    f.sung.push(w.index)
    f.sungNorm.push(w.normalized)
    f.sungPartVowels.push(facts.partVowels)
    // Function words are sung unstressed, and unstressed AH/IH are both the reduced vowel (schwa).
    const weak = FUNCTION_WORDS.has(w.normalized)
    let lastVowel = -1
    for (let i = 0; i < w.phones.length; i++) {
      const s = w.phones[i]!.charCodeAt(w.phones[i]!.length - 1)
      if (s < 48 || s > 50) continue
      lastVowel = i
      const v = VOWEL_ID.get(base(w.phones[i]!)) ?? 0
      const stressed = !weak && s > 48
      f.multiVowels.push(!stressed && (v === AH || v === IH) ? AH : v)
      f.stressed.push(stressed)
      f.vowelSung.push(k)
      f.densityVowels.push(v)
    }
    f.sungEnd.push(f.multiVowels.length)
    // The reference compares words as transcribed up to their last vowel.
    f.densityIds.push(w.phones.slice(0, lastVowel + 1).map(base).join(' '))
  }
  f.densityKey = f.sungNorm.join(' ')
  return f
}

// A draft mostly re-sends the lines it sent before: their facts are kept by text, and by
// lexicon for the few lines that hold one of the crew's words.
const LINE_CACHE_CAP = 5000
const lineCache = new LRUCache<string, LineFacts>({ max: LINE_CACHE_CAP })
const lexiconLineCaches = new WeakMap<Lexicon, LRUCache<string, LineFacts>>()

function factsFor(text: string, lexicon: Lexicon | undefined): LineFacts {
  let f = lineCache.get(text)
  if (!f) {
    f = lineFacts(text, {})
    lineCache.set(text, f)
  }
  if (!lexicon?.size || !f.spoken.some(w => lexicon.has(w))) return f
  let cache = lexiconLineCaches.get(lexicon)
  if (!cache) lexiconLineCaches.set(lexicon, cache = new LRUCache({ max: 1000 }))
  let lf = cache.get(text)
  if (!lf) {
    lf = lineFacts(text, { lexicon }, tokenize(text))
    cache.set(text, lf)
  }
  return lf
}

/** Each analysis's line facts, for the serialiser (analyses made elsewhere have none). */
const factsOfAnalysis = new WeakMap<Analysis, LineFacts[]>()

function letterFor(n: number): string {
  let s = ''
  let k = n
  do {
    s = String.fromCharCode(65 + (k % 26)) + s
    k = Math.floor(k / 26) - 1
  } while (k >= 0)
  return s
}

class UnionFind {
  parent: number[]
  constructor(n: number) {
    this.parent = Array.from({ length: n }, (_, i) => i)
  }

  find(x: number): number {
    while (this.parent[x] !== x) {
      this.parent[x] = this.parent[this.parent[x]!]!
      x = this.parent[x]!
    }
    return x
  }

  union(a: number, b: number) {
    const ra = this.find(a)
    const rb = this.find(b)
    if (ra !== rb) this.parent[Math.max(ra, rb)] = Math.min(ra, rb)
  }
}

/** A word by line index and word index. */
interface Member { line: number, index: number }
interface Candidate extends Member { lineEnd: boolean, perfectKey: string, sound: string }

// Rhyme part → its vowels and consonant runs; near links between two parts. Both are facts of
// the sounds alone, kept across analyses (bounded: the parts of the words in use).
const shapeCache = new Map<string, { vowels: string, codas: string[][] }>()
const SHAPE_CACHE_CAP = 20_000
function keyShape(key: string) {
  let s = shapeCache.get(key)
  if (!s) {
    const shape = shapeOf(key.split(' '))
    s = { vowels: shape.vowels.join(' '), codas: shape.codas }
    if (shapeCache.size >= SHAPE_CACHE_CAP) shapeCache.clear()
    shapeCache.set(key, s)
  }
  return s
}

/** Perfect and near families over single words (one family per word), kept where they are heard. */
function wordFamilies(facts: LineFacts[]): Array<{ kind: 'perfect' | 'near', key: string, members: Candidate[] }> {
  const candidates: Candidate[] = []
  // Perfect keys in order of first use, then near links between keys sharing their vowels.
  const keyIds = new Map<string, number>()
  const keyOf: number[] = []
  const keyList: string[] = []
  const byVowels = new Map<string, number[]>()
  for (let li = 0; li < facts.length; li++) {
    for (const c of facts[li]!.candidates) {
      let id = keyIds.get(c.key)
      if (id === undefined) {
        id = keyList.length
        keyIds.set(c.key, id)
        keyList.push(c.key)
        const v = keyShape(c.key).vowels
        const list = byVowels.get(v)
        if (list) list.push(id)
        else byVowels.set(v, [id])
      }
      candidates.push({ line: li, index: c.index, lineEnd: c.lineEnd, perfectKey: c.key, sound: c.sound })
      keyOf.push(id)
    }
  }
  const uf = new UnionFind(keyList.length)
  for (const ids of byVowels.values()) {
    for (let i = 0; i < ids.length; i++) {
      const a = keyShape(keyList[ids[i]!]!).codas
      for (let j = i + 1; j < ids.length; j++) {
        const b = keyShape(keyList[ids[j]!]!).codas
        if (a.every((c, x) => codasAlike(c, b[x]!))) uf.union(ids[i]!, ids[j]!)
      }
    }
  }
  const groups = new Map<number, Candidate[]>()
  for (let i = 0; i < candidates.length; i++) {
    const root = uf.find(keyOf[i]!)
    const g = groups.get(root)
    if (g) g.push(candidates[i]!)
    else groups.set(root, [candidates[i]!])
  }
  const out: Array<{ kind: 'perfect' | 'near', key: string, members: Candidate[] }> = []
  for (const [root, members] of groups) {
    if (members.length < 2) continue
    const linesWith = new Map<number, number>()
    for (const m of members) linesWith.set(m.line, (linesWith.get(m.line) ?? 0) + 1)
    // A word inside a line counts when a partner is within earshot: same line or the next one over.
    const kept = members.filter(m => m.lineEnd || (linesWith.get(m.line)! > 1) || linesWith.has(m.line - 1) || linesWith.has(m.line + 1))
    if (kept.length < 2) continue
    const sounds = new Set(kept.map(m => m.sound))
    if (sounds.size < 2) continue // the same word (or sight/site) again is no rhyme
    const keys = new Set(kept.map(m => m.perfectKey))
    out.push({ kind: keys.size > 1 ? 'near' : 'perfect', key: keys.size > 1 ? keyShape(keyList[root]!).vowels : keyList[root]!, members: kept })
  }
  return out
}

/**
 * Multi families: two or more vowel sounds in a row matching across words, ending at word ends.
 * The lyric becomes one stream of vowel ids; each sung word is tried against the 15 words
 * before it (Malmi et al.'s lookback) and a line's last word also against the last words of
 * the 8 lines before, so the work grows with the lyric's length, not its square.
 */
function multiFamilies(facts: LineFacts[]) {
  let vowelCount = 0
  let wordCount = 0
  for (const f of facts) {
    vowelCount += f.multiVowels.length
    wordCount += f.sung.length
  }
  const vowel = new Uint8Array(vowelCount)
  const stressed = new Uint8Array(vowelCount)
  const vowelLine = new Int32Array(vowelCount)
  const vowelWord = new Int32Array(vowelCount) // global sung word of each vowel
  const pos = new Int32Array(wordCount) // last vowel of each sung word
  const wordLine = new Int32Array(wordCount)
  const wordIndex = new Int32Array(wordCount)
  const partVowels = new Int32Array(wordCount)
  const lineEnd = new Uint8Array(wordCount)
  const norm: string[] = new Array(wordCount)
  let v = 0
  let e = 0
  for (let li = 0; li < facts.length; li++) {
    const f = facts[li]!
    const firstWord = e
    for (let k = 0; k < f.multiVowels.length; k++, v++) {
      vowel[v] = f.multiVowels[k]!
      stressed[v] = f.stressed[k]! ? 1 : 0
      vowelLine[v] = li
      vowelWord[v] = firstWord + f.vowelSung[k]!
    }
    const lineStart = v - f.multiVowels.length
    for (let k = 0; k < f.sung.length; k++, e++) {
      pos[e] = lineStart + f.sungEnd[k]! - 1
      wordLine[e] = li
      wordIndex[e] = f.sung[k]!
      partVowels[e] = f.sungPartVowels[k]!
      lineEnd[e] = k === f.sung.length - 1 ? 1 : 0
      norm[e] = f.sungNorm[k]!
    }
  }
  const matchLength = (p1: number, p2: number, e1: number, e2: number): number => {
    let l = 0
    const l1 = vowelLine[p1]
    const l2 = vowelLine[p2]
    while (p1 - l >= 0 && p2 - l > p1) {
      const a = p1 - l
      const b = p2 - l
      if (vowel[a] !== vowel[b] || vowelLine[a] !== l1 || vowelLine[b] !== l2) break
      // As in Malmi et al.'s reference: a run stops where both sides reach the same earlier word.
      const wa = vowelWord[a]!
      const wb = vowelWord[b]!
      if (wa !== e1 && wb !== e2 && norm[wa] === norm[wb]) break
      l++
    }
    return l
  }
  // One family per matched vowel sequence; members are word ends with the run's length.
  const families = new Map<string, Map<number, number>>()
  const tryPair = (e1: number, e2: number) => {
    const p1 = pos[e1]!
    const p2 = pos[e2]!
    if (vowel[p1] !== vowel[p2] || norm[e1] === norm[e2]) return
    // Not more than the two words' own rhyme already says (money/funny is a perfect rhyme, not a multi).
    const pv = Math.min(partVowels[e2]!, partVowels[e1]!)
    if (p1 - pv < 0) return
    const l = matchLength(p1, p2, e1, e2)
    if (l < 2 || l <= pv) return
    // Beyond what the last words' own rhyme gives, the run must carry a stressed vowel on both sides.
    let s1 = 0
    let s2 = 0
    for (let x = pv; x < l; x++) {
      s1 |= stressed[p1 - x]!
      s2 |= stressed[p2 - x]!
    }
    if (!s1 || !s2) return
    let key = VOWELS[vowel[p2 - l + 1]!]!
    for (let x = p2 - l + 2; x <= p2; x++) key += ` ${VOWELS[vowel[x]!]}`
    let fam = families.get(key)
    if (!fam) families.set(key, fam = new Map())
    fam.set(e1, l)
    fam.set(e2, l)
  }
  // Only words ending on the same vowel can match: earlier word ends are kept per last vowel
  // (all of them, and line ends apart), in order, so each word meets just its few candidates.
  const byVowel: number[][] = VOWELS.map(() => [])
  const endsByVowel: number[][] = VOWELS.map(() => [])
  const from = new Int32Array(VOWELS.length)
  for (let e2 = 0; e2 < wordCount; e2++) {
    const v2 = vowel[pos[e2]!]!
    const list = byVowel[v2]!
    let i = from[v2]!
    while (i < list.length && list[i]! < e2 - INTERNAL_LOOKBACK_WORDS) i++
    from[v2] = i
    for (; i < list.length; i++) tryPair(list[i]!, e2)
    const ends = endsByVowel[v2]!
    if (lineEnd[e2]) {
      const lowest = wordLine[e2]! - END_MULTI_LOOKBACK_LINES
      for (let k = ends.length - 1; k >= 0; k--) {
        const e1 = ends[k]!
        if (e1 > e2 - INTERNAL_LOOKBACK_WORDS - 1) continue
        if (wordLine[e1]! < lowest) break
        tryPair(e1, e2)
      }
      ends.push(e2)
    }
    list.push(e2)
  }
  return [...families].map(([key, spans]) => {
    const words: Member[] = []
    const seen = new Set<number>()
    const ends = [...spans.keys()].sort((x, y) => x - y)
    for (const end of ends) {
      const l = spans.get(end)!
      for (let x = pos[end]! - l + 1; x <= pos[end]!; x++) {
        const w = vowelWord[x]!
        if (seen.has(w)) continue
        seen.add(w)
        words.push({ line: wordLine[w]!, index: wordIndex[w]! })
      }
    }
    const lineEnds = ends.filter(end => lineEnd[end]).map(end => wordLine[end]!)
    return { key, syllables: key.split(' ').length, words, lineEnds }
  })
}

/** Malmi et al.'s rhyme density of the lines given, repeated lines once (as their reference does). */
function densityOf(facts: readonly LineFacts[]): number | null {
  const seen = new Set<string>()
  const vow: number[] = []
  const vowelWord: number[] = []
  const ends: number[] = []
  const ids: string[] = []
  for (const f of facts) {
    if (!f.densityKey || seen.has(f.densityKey)) continue
    seen.add(f.densityKey)
    const first = ends.length
    for (let k = 0; k < f.densityVowels.length; k++) {
      vow.push(f.densityVowels[k]!)
      vowelWord.push(first + f.vowelSung[k]!)
    }
    const lineStart = vow.length - f.densityVowels.length
    for (let k = 0; k < f.sung.length; k++) {
      ends.push(lineStart + f.sungEnd[k]! - 1)
      ids.push(f.densityIds[k]!)
    }
  }
  return streamDensity({ vow, vowelWord, ends, ids })
}

/**
 * Analyses a draft: every word's pronunciation and syllables, per line and per bar counts
 * (with syllables per beat and the over-packed flag when a grid is given), rhyme families,
 * the end-rhyme scheme and, for the sections given, Malmi et al.'s rhyme density.
 * Word objects are shared with later analyses of the same lines: read them, never mutate them.
 */
export function analyseDraft(input: AnalysisInput, lexicon?: Lexicon): Analysis {
  const facts = input.lines.map(line => factsFor(line.text, lexicon))
  const lines: LineAnalysis[] = input.lines.map((line, li) => {
    const f = facts[li]!
    return { id: line.id, bar: line.bar, syllables: f.syllables, syllablesMin: f.syllablesMin, syllablesMax: f.syllablesMax, adlibSyllables: f.adlibSyllables, stress: f.stress, words: f.words }
  })

  // Bars
  const barMap = new Map<number, BarAnalysis>()
  for (const l of lines) {
    let b = barMap.get(l.bar)
    if (!b) barMap.set(l.bar, b = { bar: l.bar, syllables: 0, syllablesMin: 0, syllablesMax: 0, adlibSyllables: 0, lineIds: [] })
    b.syllables += l.syllables
    b.syllablesMin += l.syllablesMin
    b.syllablesMax += l.syllablesMax
    b.adlibSyllables += l.adlibSyllables
    b.lineIds.push(l.id)
  }
  const bars = [...barMap.values()].sort((a, b) => a.bar - b.bar)
  if (input.grid) {
    const { bpm, beatsPerBar } = input.grid
    // Half-time feel: one lyric bar lasts two bars of the project tempo.
    const secondsPerBar = beatsPerBar * 60 / bpm * (input.grid.feel === 'half' ? 2 : 1)
    for (const b of bars) {
      b.syllablesPerBeat = Math.round(b.syllables / beatsPerBar * 100) / 100
      const perSecond = b.syllables / secondsPerBar
      b.syllablesPerSecond = Math.round(perSecond * 100) / 100
      b.dense = perSecond > DENSE_SYLLABLES_PER_SECOND
      b.overPacked = perSecond > OVER_PACKED_SYLLABLES_PER_SECOND
    }
  }

  // Families and scheme
  const single = wordFamilies(facts)
  const multis = multiFamilies(facts)
  const famOfEndWord = new Map<number, number>() // line index → family index in `all`
  type Draft = { kind: Family['kind'], key: string, syllables?: number, members: Member[], firstLine: number }
  const all: Draft[] = []
  const firstLine = (ms: Member[]) => ms.reduce((m, x) => Math.min(m, x.line), Infinity)
  for (const f of single) all.push({ kind: f.kind, key: f.key, members: f.members, firstLine: firstLine(f.members) })
  for (const m of multis) all.push({ kind: 'multi', key: m.key, syllables: m.syllables, members: m.words, firstLine: firstLine(m.words) })
  all.forEach((f, i) => {
    if (f.kind === 'multi') return
    for (const m of f.members) if (facts[m.line]!.lastSung === m.index) famOfEndWord.set(m.line, i)
  })
  multis.forEach((m, k) => {
    for (const line of m.lineEnds) if (!famOfEndWord.has(line)) famOfEndWord.set(line, single.length + k)
  })
  // Letters in order of first appearance at line ends, then the rest in order of first line.
  const letterOf = new Map<number, string>()
  let next = 0
  const scheme = lines.map((line, li) => {
    if (facts[li]!.lastSung < 0) return '-'
    const f = famOfEndWord.get(li)
    if (f === undefined) return letterFor(next++)
    if (!letterOf.has(f)) letterOf.set(f, letterFor(next++))
    return letterOf.get(f)!
  })
  const order = all.map((f, i) => i).sort((a, b) => {
    const la = letterOf.has(a) ? 0 : 1
    const lb = letterOf.has(b) ? 0 : 1
    return la - lb || all[a]!.firstLine - all[b]!.firstLine || a - b
  })
  // A marked word is a copy, in a copy of its line's list: the cached facts stay as they were.
  const copied = new Set<number>()
  const markable = (m: Member): WordAnalysis => {
    const line = lines[m.line]!
    if (!copied.has(m.line)) {
      line.words = line.words.slice()
      copied.add(m.line)
    }
    let w = line.words[m.index]!
    if (w === facts[m.line]!.words[m.index]) line.words[m.index] = w = markedCopy(w)
    return w
  }
  const families: Family[] = order.map((i, n) => {
    const f = all[i]!
    if (!letterOf.has(i)) letterOf.set(i, letterFor(next++))
    const id = `f${n + 1}`
    const sorted = f.members.slice().sort((a, b) => a.line - b.line || a.index - b.index)
    const words = sorted.map(m => ({ lineId: lines[m.line]!.id, index: m.index, text: facts[m.line]!.words[m.index]!.text }))
    const perLine = new Map<number, number>()
    for (const m of f.members) perLine.set(m.line, (perLine.get(m.line) ?? 0) + 1)
    const endRhyme = f.members.some(m => famOfEndWord.get(m.line) === i)
    for (const m of f.members) {
      const w = markable(m)
      if (f.kind === 'multi') (w.multi ??= []).push(id)
      else w.family = id
    }
    return { id, kind: f.kind, letter: letterOf.get(i)!, key: f.key, ...(f.syllables ? { syllables: f.syllables } : {}), internal: [...perLine.values()].some(n => n > 1), endRhyme, words }
  })

  const overall = densityOf(facts)
  const result: Analysis = {
    lines,
    bars,
    families,
    scheme,
    rhymeDensity: overall,
    thresholds: { overPackedSyllablesPerSecond: OVER_PACKED_SYLLABLES_PER_SECOND, denseSyllablesPerSecond: DENSE_SYLLABLES_PER_SECOND },
  }
  factsOfAnalysis.set(result, facts)
  if (input.sections) {
    result.sections = input.sections.map((s) => {
      const inside: number[] = []
      lines.forEach((l, li) => {
        if (l.bar >= s.startBar && l.bar <= s.endBar) inside.push(li)
      })
      return {
        id: s.id,
        kind: s.kind,
        label: s.label,
        startBar: s.startBar,
        endBar: s.endBar,
        lineIds: inside.map(li => lines[li]!.id),
        syllables: inside.reduce((n, li) => n + lines[li]!.syllables, 0),
        // A section over every line has the lyric's own density.
        rhymeDensity: inside.length === lines.length ? overall : densityOf(inside.map(li => facts[li]!)),
      }
    })
  }
  return result
}

/** How much of each word an analysis response carries (see `AnalysisDetail` in shared/schemas/prosody). */
export type AnalysisJsonDetail = 'words' | 'full'

/**
 * A word as the default response carries it: what the desk shows (counts, stress, source, the
 * chosen pronunciation, offsets) and `syllableSplit`, the number of phones in each syllable of
 * `phones` (the per-syllable split, `syllableParts` in full, rebuilt with `splitByCounts`).
 */
export function wordsDetail(w: WordAnalysis) {
  const out: Record<string, unknown> = {
    index: w.index, text: w.text, start: w.start, end: w.end, isAdlib: w.isAdlib, phones: w.phones,
    syllables: w.syllables, syllablesMin: w.syllablesMin, syllablesMax: w.syllablesMax, stress: w.stress,
    syllableSplit: w.syllableParts.map(p => p.phones.length), source: w.source,
  }
  if (w.spoken) out.spoken = w.spoken
  if (w.family) out.family = w.family
  if (w.multi) out.multi = w.multi
  return out
}

function openJson(value: unknown): string {
  const s = JSON.stringify(value)
  return s.slice(0, -1)
}

/**
 * The JSON text of an analysis: `full` parses to the same value as `JSON.stringify(analysis)`,
 * `words` to the same with each word as `wordsDetail` gives it. Each word's JSON is made once per line text and
 * reused; only the family marks are written per call.
 */
export function analysisJson(analysis: Analysis, detail: AnalysisJsonDetail = 'words'): string {
  let out = '{"lines":['
  const facts = factsOfAnalysis.get(analysis)
  for (let li = 0; li < analysis.lines.length; li++) {
    const line = analysis.lines[li]!
    if (li) out += ','
    // The words of a line from `analyseDraft` are its facts' words or marked copies of them.
    const f = facts?.[li]
    // The line's own fields: kept with its facts for the id and bar it last had.
    let head = f?.json.head
    if (!head || head.id !== line.id || head.bar !== line.bar || !f || f.syllables !== line.syllables) {
      head = { id: line.id, bar: line.bar, text: `${openJson({ id: line.id, bar: line.bar, syllables: line.syllables, syllablesMin: line.syllablesMin, syllablesMax: line.syllablesMax, adlibSyllables: line.adlibSyllables, stress: line.stress })},"words":[` }
      if (f) f.json.head = head
    }
    out += head.text
    const cached = f && f.words.length === line.words.length ? (f.json[detail] ??= f.words.map(w => openJson(detail === 'full' ? w : wordsDetail(w)))) : null
    for (let wi = 0; wi < line.words.length; wi++) {
      const w = line.words[wi]!
      if (wi) out += ','
      if (!cached) {
        out += JSON.stringify(detail === 'full' ? w : wordsDetail(w))
        continue
      }
      out += cached[wi]!
      if (w.family !== undefined) out += `,"family":${JSON.stringify(w.family)}`
      if (w.multi !== undefined) out += `,"multi":${JSON.stringify(w.multi)}`
      out += '}'
    }
    out += ']}'
  }
  const { lines: _, ...rest } = analysis
  const tail = JSON.stringify(rest)
  return `${out}]${tail.length > 2 ? `,${tail.slice(1)}` : '}'}`
}

import { base, rhymePart, stressPattern, syllableCount } from './arpabet'
import { rhymeDensity, type DensityWord } from './density'
import { concatParts, resolveWord, type Lexicon, type Method, type ResolveOptions, type Source } from './resolve'
import { codasAlike, shapeOf } from './rhyme'
import { splitSyllables, type SyllablePart } from './syllables'
import { tokenize } from './tokenize'

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

function analyseWord(token: ReturnType<typeof tokenize>[number], index: number, options: ResolveOptions): WordAnalysis {
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

// Words of a line as the dictionary alone reads them, per line text; a draft mostly re-sends
// the lines it sent before. Copied out, because families are marked on the copies.
const lineCache = new Map<string, WordAnalysis[]>()
const LINE_CACHE_CAP = 5000

function lineWords(text: string, options: ResolveOptions): WordAnalysis[] {
  if (options.lexicon) return tokenize(text).map((t, i) => analyseWord(t, i, options))
  let words = lineCache.get(text)
  if (!words) {
    words = tokenize(text).map((t, i) => analyseWord(t, i, options))
    if (lineCache.size >= LINE_CACHE_CAP) lineCache.clear()
    lineCache.set(text, words)
  }
  return words.map(w => ({ ...w }))
}

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

interface Candidate {
  line: number
  word: WordAnalysis
  lineEnd: boolean
  perfectKey: string
  onset: string
}

/** Perfect and near families over single words (one family per word), kept where they are heard. */
function wordFamilies(lines: LineAnalysis[]): Array<{ kind: 'perfect' | 'near', key: string, members: Candidate[] }> {
  const candidates: Candidate[] = []
  lines.forEach((line, li) => {
    let lastSung = -1
    for (const w of line.words) if (!w.isAdlib && w.syllables > 0) lastSung = w.index
    for (const w of line.words) {
      if (w.isAdlib || w.syllables === 0) continue
      const lineEnd = w.index === lastSung
      if (!lineEnd && FUNCTION_WORDS.has(w.normalized)) continue
      const facts = rhymeFacts(w.phones)
      if (!facts.key) continue
      candidates.push({ line: li, word: w, lineEnd, perfectKey: facts.key, onset: facts.onset })
    }
  })
  // Perfect keys, then near links between keys sharing their vowels.
  const keyIds = new Map<string, number>()
  const keyList: string[] = []
  for (const c of candidates) {
    if (!keyIds.has(c.perfectKey)) {
      keyIds.set(c.perfectKey, keyList.length)
      keyList.push(c.perfectKey)
    }
  }
  const uf = new UnionFind(keyList.length)
  const byVowels = new Map<string, number[]>()
  const shapes = keyList.map(k => shapeOf(k.split(' ')))
  shapes.forEach((shape, k) => {
    const v = shape.vowels.join(' ')
    const list = byVowels.get(v)
    if (list) list.push(k)
    else byVowels.set(v, [k])
  })
  for (const ids of byVowels.values()) {
    for (let i = 0; i < ids.length; i++) {
      for (let j = i + 1; j < ids.length; j++) {
        const a = shapes[ids[i]!]!
        const b = shapes[ids[j]!]!
        if (a.codas.every((c, x) => codasAlike(c, b.codas[x]!))) uf.union(ids[i]!, ids[j]!)
      }
    }
  }
  const groups = new Map<number, Candidate[]>()
  for (const c of candidates) {
    const root = uf.find(keyIds.get(c.perfectKey)!)
    const g = groups.get(root)
    if (g) g.push(c)
    else groups.set(root, [c])
  }
  const out: Array<{ kind: 'perfect' | 'near', key: string, members: Candidate[] }> = []
  for (const [root, members] of groups) {
    if (members.length < 2) continue
    const linesWith = new Map<number, number>()
    for (const m of members) linesWith.set(m.line, (linesWith.get(m.line) ?? 0) + 1)
    // A word inside a line counts when a partner is within earshot: same line or the next one over.
    const kept = members.filter(m => m.lineEnd || (linesWith.get(m.line)! > 1) || linesWith.has(m.line - 1) || linesWith.has(m.line + 1))
    if (kept.length < 2) continue
    const sounds = new Set(kept.map(m => `${m.onset}|${m.perfectKey}`))
    if (sounds.size < 2) continue // the same word (or sight/site) again is no rhyme
    const keys = new Set(kept.map(m => m.perfectKey))
    out.push({ kind: keys.size > 1 ? 'near' : 'perfect', key: keys.size > 1 ? shapes[root]!.vowels.join(' ') : keyList[root]!, members: kept })
  }
  return out
}

interface StreamVowel { v: string, stressed: boolean, line: number, word: number }

/** Multi families: two or more vowel sounds in a row matching across words, ending at word ends. */
function multiFamilies(lines: LineAnalysis[]) {
  const stream: StreamVowel[] = []
  const wordEnds: Array<{ pos: number, line: number, word: WordAnalysis, lineEnd: boolean, firstPos: number, partVowels: number }> = []
  lines.forEach((line, li) => {
    const sung = line.words.filter(w => !w.isAdlib && w.syllables > 0)
    sung.forEach((w, k) => {
      const first = stream.length
      // Function words are sung unstressed, and unstressed AH/IH are both the reduced vowel (schwa).
      const weak = FUNCTION_WORDS.has(w.normalized)
      for (const part of w.syllableParts) {
        const stressed = !weak && part.stress > 0
        const v = base(part.phones.find(p => /\d$/.test(p))!)
        stream.push({ v: !stressed && (v === 'AH' || v === 'IH') ? 'AH' : v, stressed, line: li, word: w.index })
      }
      wordEnds.push({ pos: stream.length - 1, line: li, word: w, lineEnd: k === sung.length - 1, firstPos: first, partVowels: rhymeFacts(w.phones).partVowels })
    })
  })
  const lineOf = (i: number) => stream[i]!.line
  const matchLength = (p1: number, p2: number, w1: WordAnalysis, w2: WordAnalysis): number => {
    let l = 0
    const l1 = lineOf(p1)
    const l2 = lineOf(p2)
    while (p1 - l >= 0 && p2 - l > p1) {
      const a = stream[p1 - l]!
      const b = stream[p2 - l]!
      if (a.v !== b.v || a.line !== l1 || b.line !== l2) break
      // As in Malmi et al.'s reference: a run stops where both sides reach the same earlier word.
      if (a.word !== w1.index && b.word !== w2.index && lines[a.line]!.words[a.word]!.normalized === lines[b.line]!.words[b.word]!.normalized) break
      l++
    }
    return l
  }
  const pairs: Array<{ a: number, b: number, l: number }> = []
  for (let e2 = 1; e2 < wordEnds.length; e2++) {
    const w2 = wordEnds[e2]!
    const tryPair = (e1: number) => {
      const w1 = wordEnds[e1]!
      if (w1.word.normalized === w2.word.normalized) return
      // Not more than the two words' own rhyme already says (money/funny is a perfect rhyme, not a multi).
      const partVowels = Math.min(w2.partVowels, w1.partVowels)
      if (w1.pos - partVowels < 0) return
      const l = matchLength(w1.pos, w2.pos, w1.word, w2.word)
      if (l < 2 || l <= partVowels) return
      // Beyond what the last words' own rhyme gives, the run must carry a stressed vowel on both sides.
      let s1 = false
      let s2 = false
      for (let x = partVowels; x < l; x++) {
        s1 ||= stream[w1.pos - x]!.stressed
        s2 ||= stream[w2.pos - x]!.stressed
      }
      if (s1 && s2) pairs.push({ a: e1, b: e2, l })
    }
    for (let e1 = Math.max(0, e2 - INTERNAL_LOOKBACK_WORDS); e1 < e2; e1++) tryPair(e1)
    if (w2.lineEnd) {
      for (let e1 = e2 - INTERNAL_LOOKBACK_WORDS - 1; e1 >= 0 && wordEnds[e1]!.line >= w2.line - END_MULTI_LOOKBACK_LINES; e1--) {
        if (wordEnds[e1]!.lineEnd) tryPair(e1)
      }
    }
  }
  // One family per matched vowel sequence; members are spans (end position, length).
  const families = new Map<string, Map<string, { end: number, l: number }>>()
  for (const p of pairs) {
    const key = stream.slice(wordEnds[p.b]!.pos - p.l + 1, wordEnds[p.b]!.pos + 1).map(s => s.v).join(' ')
    let fam = families.get(key)
    if (!fam) families.set(key, fam = new Map())
    fam.set(`${p.a}`, { end: p.a, l: p.l })
    fam.set(`${p.b}`, { end: p.b, l: p.l })
  }
  return [...families].map(([key, spans]) => {
    const words: Array<{ line: number, word: WordAnalysis }> = []
    const seen = new Set<string>()
    let lineEnds = 0
    for (const { end, l } of [...spans.values()].sort((x, y) => x.end - y.end)) {
      const e = wordEnds[end]!
      if (e.lineEnd) lineEnds++
      for (let x = e.pos - l + 1; x <= e.pos; x++) {
        const sv = stream[x]!
        const id = `${sv.line}:${sv.word}`
        if (seen.has(id)) continue
        seen.add(id)
        words.push({ line: sv.line, word: lines[sv.line]!.words[sv.word]! })
      }
    }
    return { key, syllables: key.split(' ').length, words, lineEnds, spans: [...spans.values()].map(s => wordEnds[s.end]!) }
  })
}

/**
 * Analyses a draft: every word's pronunciation and syllables, per line and per bar counts
 * (with syllables per beat and the over-packed flag when a grid is given), rhyme families,
 * the end-rhyme scheme and, for the sections given, Malmi et al.'s rhyme density.
 */
export function analyseDraft(input: AnalysisInput, lexicon?: Lexicon): Analysis {
  const options: ResolveOptions = lexicon?.size ? { lexicon } : {}
  const lines: LineAnalysis[] = input.lines.map((line) => {
    const words = lineWords(line.text, options)
    let syllables = 0
    let min = 0
    let max = 0
    let adlib = 0
    let stress = ''
    for (const w of words) {
      if (w.isAdlib) {
        adlib += w.syllables
        continue
      }
      syllables += w.syllables
      min += w.syllablesMin
      max += w.syllablesMax
      stress += w.stress
    }
    return { id: line.id, bar: line.bar, syllables, syllablesMin: min, syllablesMax: max, adlibSyllables: adlib, stress, words }
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
  const single = wordFamilies(lines)
  const multis = multiFamilies(lines)
  const famOfEndWord = new Map<number, number>() // line index → family index in `all`
  type Draft = { kind: Family['kind'], key: string, syllables?: number, members: Array<{ line: number, word: WordAnalysis }>, firstLine: number }
  const all: Draft[] = []
  for (const f of single) {
    all.push({ kind: f.kind, key: f.key, members: f.members.map(m => ({ line: m.line, word: m.word })), firstLine: Math.min(...f.members.map(m => m.line)) })
  }
  for (const m of multis) {
    all.push({ kind: 'multi', key: m.key, syllables: m.syllables, members: m.words, firstLine: Math.min(...m.words.map(w => w.line)) })
  }
  const lastSung = lines.map(line => line.words.filter(w => !w.isAdlib && w.syllables > 0).at(-1))
  all.forEach((f, i) => {
    if (f.kind === 'multi') return
    for (const m of f.members) if (lastSung[m.line] === m.word) famOfEndWord.set(m.line, i)
  })
  multis.forEach((m, k) => {
    for (const s of m.spans) if (s.lineEnd && !famOfEndWord.has(s.line)) famOfEndWord.set(s.line, single.length + k)
  })
  // Letters in order of first appearance at line ends, then the rest in order of first line.
  const letterOf = new Map<number, string>()
  let next = 0
  const scheme = lines.map((line, li) => {
    if (!lastSung[li]) return '-'
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
  const families: Family[] = order.map((i, n) => {
    const f = all[i]!
    if (!letterOf.has(i)) letterOf.set(i, letterFor(next++))
    const id = `f${n + 1}`
    const words = f.members
      .sort((a, b) => a.line - b.line || a.word.index - b.word.index)
      .map(m => ({ lineId: lines[m.line]!.id, index: m.word.index, text: m.word.text }))
    const perLine = new Map<number, number>()
    for (const m of f.members) perLine.set(m.line, (perLine.get(m.line) ?? 0) + 1)
    const endRhyme = f.members.some(m => famOfEndWord.get(m.line) === i)
    for (const m of f.members) {
      if (f.kind === 'multi') (m.word.multi ??= []).push(id)
      else m.word.family = id
    }
    return { id, kind: f.kind, letter: letterOf.get(i)!, key: f.key, ...(f.syllables ? { syllables: f.syllables } : {}), internal: [...perLine.values()].some(n => n > 1), endRhyme, words }
  })

  const densityWords = (subset: LineAnalysis[]): DensityWord[] => {
    // As in the reference implementation: lines repeated word for word count once.
    const seen = new Set<string>()
    const out: DensityWord[] = []
    for (const l of subset) {
      const sung = l.words.filter(w => !w.isAdlib && w.syllables > 0)
      const key = sung.map(w => w.normalized).join(' ')
      if (!key || seen.has(key)) continue
      seen.add(key)
      for (const w of sung) out.push({ phones: w.phones })
    }
    return out
  }

  const result: Analysis = {
    lines,
    bars,
    families,
    scheme,
    rhymeDensity: rhymeDensity(densityWords(lines)),
    thresholds: { overPackedSyllablesPerSecond: OVER_PACKED_SYLLABLES_PER_SECOND, denseSyllablesPerSecond: DENSE_SYLLABLES_PER_SECOND },
  }
  if (input.sections) {
    result.sections = input.sections.map((s) => {
      const inside = lines.filter(l => l.bar >= s.startBar && l.bar <= s.endBar)
      return {
        id: s.id,
        kind: s.kind,
        label: s.label,
        startBar: s.startBar,
        endBar: s.endBar,
        lineIds: inside.map(l => l.id),
        syllables: inside.reduce((n, l) => n + l.syllables, 0),
        rhymeDensity: rhymeDensity(densityWords(inside)),
      }
    })
  }
  return result
}

import { base, isVowel, stressOf, syllableCount } from './arpabet'
import { isCommonWord } from './common-words'
import { CORRECTIONS } from './corrections'
import { dictionaryPronunciations } from './dictionary'
import { predict, type LtsModel } from './lts'
import ltsModelJson from './lts-model.json'

export type Source = 'dictionary' | 'lexicon' | 'guess'
/** How a pronunciation was found, finer than `source`. */
export type Method = 'dictionary' | 'correction' | 'lexicon' | 'number' | 'dropped-g' | 'inflection' | 'compound' | 'letter-to-sound' | 'unknown'

export interface Resolved {
  /** Pronunciations in ARPAbet, the preferred one first. Shared: never mutate. */
  prons: string[][]
  source: Source
  method: Method
  /** The dictionary words it was built from (derived forms, compounds, numbers). */
  parts?: string[]
}

/**
 * A crew's lexicon: normalised word → pronunciations. Never changed once made (analyses cache
 * their lines per lexicon object); `version`, when set, names its entries (a digest of them).
 */
export type Lexicon = ReadonlyMap<string, string[][]> & { readonly version?: string }

export interface ResolveOptions {
  lexicon?: Lexicon
  /** The dictionary lookup (corrections, then CMU); tests swap it to hide words. */
  lookup?: (word: string) => string[][] | null
  /** The letter-to-sound model; tests swap it for one trained without hidden words. */
  model?: LtsModel
}

const shippedModel = ltsModelJson as unknown as LtsModel
const own = Object.prototype.hasOwnProperty

const VOICELESS = new Set(['P', 'T', 'K', 'F', 'TH'])
const SIBILANT = new Set(['S', 'Z', 'SH', 'ZH', 'CH', 'JH'])

function lastPhone(p: readonly string[]): string {
  return base(p[p.length - 1] ?? '')
}

/** -s / -'s after a stem: IH0 Z after a sibilant, S after a voiceless sound, else Z. */
function withS(p: readonly string[]): string[] {
  const last = lastPhone(p)
  return SIBILANT.has(last) ? [...p, 'IH0', 'Z'] : VOICELESS.has(last) || last === 'CH' ? [...p, 'S'] : [...p, 'Z']
}

/** -ed after a stem: IH0 D after T/D, T after a voiceless sound, else D. */
function withEd(p: readonly string[]): string[] {
  const last = lastPhone(p)
  return last === 'T' || last === 'D' ? [...p, 'IH0', 'D'] : VOICELESS.has(last) || last === 'S' || last === 'SH' || last === 'CH' ? [...p, 'T'] : [...p, 'D']
}

function dedupe(prons: string[][]): string[][] {
  const seen = new Set<string>()
  return prons.filter((p) => {
    const k = p.join(' ')
    if (seen.has(k)) return false
    seen.add(k)
    return true
  })
}

/** Joins parts said one after another: the first pronunciations, plus the shortest and longest readings. */
export function concatParts(parts: string[][][], demoteLater = false): string[][] {
  const pick = (choose: (alts: string[][]) => string[]) => parts.flatMap((alts, i) => {
    const p = choose(alts)
    return demoteLater && i > 0 ? p.map(ph => (stressOf(ph) === 1 ? `${base(ph)}2` : ph)) : p
  })
  const shortest = (alts: string[][]) => alts.reduce((a, b) => (syllableCount(b) < syllableCount(a) ? b : a))
  const longest = (alts: string[][]) => alts.reduce((a, b) => (syllableCount(b) > syllableCount(a) ? b : a))
  return dedupe([pick(a => a[0]!), pick(shortest), pick(longest)])
}

interface Derivation { stem: string, make: (p: readonly string[]) => string[] }

/** tangle + ing → tangling: a stem's syllabic "-le" (AH0 L) loses its vowel before a vowel suffix. */
function dropSyllabicL(stem: string, p: readonly string[]): string[] {
  const n = p.length
  if (stem.endsWith('le') && n >= 2 && p[n - 1] === 'L' && p[n - 2] === 'AH0') return [...p.slice(0, n - 2), 'L']
  return [...p]
}

/** Stems a word may be an inflection of, most likely first. */
function derivations(w: string): Derivation[] {
  const out: Derivation[] = []
  const add = (stem: string, make: Derivation['make']) => {
    if (stem.length >= 2) out.push({ stem, make })
  }
  if (w.endsWith('\'s')) add(w.slice(0, -2), withS)
  if (w.endsWith('s\'')) add(w.slice(0, -1), p => [...p])
  if (w.endsWith('ies')) add(`${w.slice(0, -3)}y`, p => [...p.slice(0, -1), 'IY0', 'Z'])
  if (/(s|x|z|ch|sh)es$/.test(w)) add(w.slice(0, -2), withS)
  if (w.endsWith('s') && !w.endsWith('ss')) add(w.slice(0, -1), withS)
  if (w.endsWith('ied')) add(`${w.slice(0, -3)}y`, p => [...p.slice(0, -1), 'IY0', 'D'])
  if (w.endsWith('ed')) {
    add(w.slice(0, -2), withEd)
    add(w.slice(0, -1), withEd)
    if (w.length > 4 && w[w.length - 3] === w[w.length - 4]) add(w.slice(0, -3), withEd)
  }
  if (w.endsWith('ing')) {
    add(w.slice(0, -3), p => [...p, 'IH0', 'NG'])
    add(`${w.slice(0, -3)}e`, p => [...dropSyllabicL(`${w.slice(0, -3)}e`, p), 'IH0', 'NG'])
    if (w.length > 5 && w[w.length - 4] === w[w.length - 5]) add(w.slice(0, -4), p => [...p, 'IH0', 'NG'])
  }
  for (const [suffix, phones] of [['ness', ['N', 'AH0', 'S']], ['ers', ['ER0', 'Z']], ['er', ['ER0']], ['est', ['AH0', 'S', 'T']], ['ly', ['L', 'IY0']], ['y', ['IY0']], ['z', ['Z']]] as const) {
    if (!w.endsWith(suffix)) continue
    const stem = w.slice(0, -suffix.length)
    add(stem, p => [...p, ...phones])
    add(`${stem}e`, p => [...(phones[0] === 'L' ? p : dropSyllabicL(`${stem}e`, p)), ...phones])
    if (stem.length > 3 && stem[stem.length - 1] === stem[stem.length - 2]) add(stem.slice(0, -1), p => [...p, ...phones])
  }
  return out
}

function lettersOnly(w: string): string {
  return w.replace(/[^a-z]/g, '')
}

/**
 * Pronunciation of one normalised word, in Barsmith's order: the crew's lexicon, then the
 * dictionary (reviewed corrections first), then forms derived from dictionary words (dropped g,
 * inflections, compounds), then the letter-to-sound guess.
 */
export function resolveWord(word: string, options: ResolveOptions = {}): Resolved {
  const lex = options.lexicon?.get(word)
  if (lex?.length) return { prons: lex, source: 'lexicon', method: 'lexicon' }
  const defaults = !options.lookup && !options.model
  if (defaults) {
    const hit = cache.get(word)
    if (hit) return hit
  }
  const result = resolveUncached(word, options.lookup ?? dictionaryPronunciations, options.model ?? shippedModel)
  if (defaults) {
    if (cache.size >= CACHE_CAP) cache.clear()
    cache.set(word, result)
  }
  return result
}

const cache = new Map<string, Resolved>()
const CACHE_CAP = 50_000

function resolveUncached(word: string, lookup: (w: string) => string[][] | null, model: LtsModel): Resolved {
  const found = lookup(word)
  if (found) return { prons: found, source: 'dictionary', method: own.call(CORRECTIONS, word) ? 'correction' : 'dictionary' }
  const derived = derive(word, lookup, 0)
  if (derived) return derived
  const letters = lettersOnly(word)
  if (letters) {
    const guess = predict(model, letters)
    if (guess.some(isVowel)) return { prons: [guess], source: 'guess', method: 'letter-to-sound' }
  }
  return { prons: [[]], source: 'guess', method: 'unknown' }
}

function derive(word: string, lookup: (w: string) => string[][] | null, depth: number): Resolved | null {
  const w = word
  const noApostrophe = w.replace(/'/g, '')
  if (noApostrophe !== w && noApostrophe) {
    const p = lookup(noApostrophe)
    if (p) return { prons: p, source: 'guess', method: 'inflection', parts: [noApostrophe] }
  }
  // runnin' / runnin → running, said with N instead of NG
  const dropped = w.match(/^(.{2,})in('?)$/)
  if (dropped) {
    const full = `${dropped[1]}ing`
    // Without the apostrophe, -in is a dropped g only when -ing makes a common word (not joplin).
    const p = dropped[2] || isCommonWord(full) ? lookup(full) ?? (depth === 0 ? derive(full, lookup, depth + 1)?.prons : null) : null
    if (p) {
      const prons = p.map(ph => (base(ph[ph.length - 1] ?? '') === 'NG' ? [...ph.slice(0, -1), 'N'] : ph))
      return { prons: dedupe(prons), source: 'guess', method: 'dropped-g', parts: [full] }
    }
    // skrrtin: a known word plus the sung -in
    const stem = dropped[1]!
    const sp = stem.length >= 3 ? lookup(stem) : null
    if (sp) return { prons: dedupe(sp.map(ph => [...ph, 'IH0', 'N'])), source: 'guess', method: 'dropped-g', parts: [stem] }
  }
  for (const d of derivations(w)) {
    // Stems must be common words: the dictionary's surnames would derive nonsense (gay → ga + y).
    if (d.stem.length < 3 || !isCommonWord(d.stem)) continue
    const p = lookup(d.stem)
    if (p) return { prons: dedupe(p.map(d.make)), source: 'guess', method: 'inflection', parts: [d.stem] }
  }
  const compound = splitCompound(noApostrophe, lookup)
  if (compound) return compound
  return null
}

// Endings that are words too but make no compound (potion ≠ pot + ion).
const SUFFIX_LIKE = new Set(['ion', 'ions', 'ation', 'ration', 'ate', 'ant', 'ants', 'age', 'ism', 'ist', 'ness', 'less', 'ling', 'let', 'son', 'ton', 'ent', 'ence', 'ance', 'ure', 'ery', 'ary', 'ory', 'ive', 'ous', 'ally', 'ice', 'tion', 'one', 'ones', 'ere', 'ore', 'ale', 'ine', 'ene'])

/** stagelight → stage + light: two dictionary words of 3+ letters, the most even split first. */
function splitCompound(w: string, lookup: (w: string) => string[][] | null): Resolved | null {
  if (!/^[a-z]{6,}$/.test(w)) return null
  let best: { at: number, parts: [string[][], string[][]] } | null = null
  for (let at = 3; at <= w.length - 3; at++) {
    if (!isCommonWord(w.slice(0, at)) || SUFFIX_LIKE.has(w.slice(at))) continue
    const a = lookup(w.slice(0, at))
    if (!a) continue
    let b = isCommonWord(w.slice(at)) ? lookup(w.slice(at)) : null
    if (!b) {
      const tail = w.slice(at)
      for (const d of derivations(tail)) {
        const p = lookup(d.stem)
        if (p && d.stem.length >= 3 && isCommonWord(d.stem)) {
          b = p.map(d.make)
          break
        }
      }
    }
    if (!b) continue
    if (!best || Math.min(at, w.length - at) > Math.min(best.at, w.length - best.at)) best = { at, parts: [a, b] }
  }
  if (!best) return null
  return { prons: concatParts(best.parts, true), source: 'guess', method: 'compound', parts: [w.slice(0, best.at), w.slice(best.at)] }
}

/** Drops the process-wide resolution cache (after the corrections table changes in tests). */
export function clearResolveCache() {
  cache.clear()
}

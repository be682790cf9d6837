import { base, isVowel, rhymePart, rhymeVowelIndex, stressOf } from './arpabet'

/**
 * Rhyme between two pronunciations, after the handbooks:
 * - perfect: "identical stressed vowels and subsequent phonemes but differ in initial
 *   consonant(s) if any are present" (Brogan & Cushman, Princeton Encyclopedia of Poetry and
 *   Poetics, 4th ed., 2012); the same onset as well is an identical rhyme (sight/site), no rhyme;
 * - near: the same vowels from the stressed vowel on, consonants alike by CONSONANT_CLASS or
 *   one side adding a final consonant (fire/tired, soul/cold);
 * - assonance: "repetition of stressed vowel sounds within words with different end
 *   consonants" (Encyclopaedia Britannica);
 * - consonance: like consonants after unlike stressed vowels (Britannica), e.g. young/song.
 * Slant rhyme is near, assonance or consonance: vowels differ with the consonants the same,
 * or the reverse.
 */
export type RhymeKind = 'identical' | 'perfect' | 'near' | 'assonance' | 'consonance' | 'none'

/**
 * Consonants alike for near rhyme: the same manner of articulation (stops, fricatives,
 * affricates, nasals, liquids, glides). Imperfect rhymes in popular lyrics mostly pair
 * consonants that differ in voicing or place but share manner (Zwicky, "This rock-and-roll has
 * got to stop: Junior's head is hard as a rock", Chicago Linguistic Society 12, 1976; from memory).
 */
export const CONSONANT_CLASS: Record<string, string> = {
  P: 'stop', B: 'stop', T: 'stop', D: 'stop', K: 'stop', G: 'stop',
  F: 'fricative', V: 'fricative', TH: 'fricative', DH: 'fricative', S: 'fricative', Z: 'fricative', SH: 'fricative', ZH: 'fricative', HH: 'fricative',
  CH: 'affricate', JH: 'affricate',
  M: 'nasal', N: 'nasal', NG: 'nasal',
  L: 'liquid', R: 'liquid',
  W: 'glide', Y: 'glide',
}

/** Rhyme part split into vowels and the consonant runs after each: beat → V[IY] C[[T]]. */
export interface RhymeShape {
  vowels: string[]
  codas: string[][]
}

export function shapeOf(part: readonly string[]): RhymeShape {
  const vowels: string[] = []
  const codas: string[][] = []
  for (const p of part) {
    if (isVowel(p)) {
      vowels.push(base(p))
      codas.push([])
    }
    else if (codas.length) {
      codas[codas.length - 1]!.push(base(p))
    }
  }
  return { vowels, codas }
}

function sameList(a: readonly string[], b: readonly string[]): boolean {
  if (a.length !== b.length) return false
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false
  return true
}

/** Two consonant runs are alike: same length and class position by position, or one is the other plus one final consonant. */
export function codasAlike(a: readonly string[], b: readonly string[]): boolean {
  if (a.length === b.length) {
    for (let i = 0; i < a.length; i++) {
      if (a[i] !== b[i] && CONSONANT_CLASS[a[i]!] !== CONSONANT_CLASS[b[i]!]) return false
    }
    return true
  }
  const [short, long] = a.length < b.length ? [a, b] : [b, a]
  return long.length - short.length === 1 && sameList(short, long.slice(0, short.length))
}

function onset(phones: readonly string[]): string {
  const i = rhymeVowelIndex(phones)
  return phones.slice(0, Math.max(0, i)).map(base).join(' ')
}

/** Classifies the rhyme between two pronunciations (phone arrays with stress digits). */
export function rhymeKind(a: readonly string[], b: readonly string[]): RhymeKind {
  const ra = rhymePart(a)
  const rb = rhymePart(b)
  if (!ra.length || !rb.length) return 'none'
  if (sameList(ra, rb)) {
    // Identical rhyme: the whole word sounds the same, or the sound before the stressed vowel does.
    return onset(a) === onset(b) ? 'identical' : 'perfect'
  }
  const sa = shapeOf(ra)
  const sb = shapeOf(rb)
  if (sameList(sa.vowels, sb.vowels)) {
    const alike = sa.codas.every((c, i) => codasAlike(c, sb.codas[i]!))
    return alike ? 'near' : 'assonance'
  }
  if (sa.vowels.length === sb.vowels.length && sa.codas.some(c => c.length) && sa.codas.every((c, i) => sameList(c, sb.codas[i]!))) return 'consonance'
  return 'none'
}

/** Slant rhyme in the handbook sense: near, assonance or consonance. */
export function isSlant(kind: RhymeKind): boolean {
  return kind === 'near' || kind === 'assonance' || kind === 'consonance'
}

/** The vowels of a pronunciation, digits stripped, with whether each carries stress (1 or 2). */
export function vowelStream(phones: readonly string[]): Array<{ v: string, stressed: boolean }> {
  const out: Array<{ v: string, stressed: boolean }> = []
  for (const p of phones) {
    const s = stressOf(p)
    if (s >= 0) out.push({ v: base(p), stressed: s > 0 })
  }
  return out
}

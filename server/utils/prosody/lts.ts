import { base, isVowel, stressOf, VOWELS } from './arpabet'

/**
 * A letter-to-sound guesser learned from the CMU Pronouncing Dictionary itself, after the
 * classic recipe of Black, Lenzo & Pagel ("Issues in building general letter to sound rules",
 * ESCA Speech Synthesis Workshop, 1998): align each headword's letters with its phones using
 * hand-listed "allowables", then predict each letter's phones from its neighbours, falling back
 * from the widest context seen in training to the letter alone. The model is plain data
 * (lts-model.json, made by scripts/build-lts-model.mjs) so the server never trains at run time.
 */

export interface LtsModel {
  /** Context windows tried, widest first: [left letters, right letters]. */
  windows: Array<[number, number]>
  /** `left[letter]right` → the letter's phones ("" for silent, "K S", "AH0"). */
  rules: Record<string, string>
  /** How the model was made, for the bench and the report. */
  meta: { trainedOn: number, skipped: number, rules: number }
}

const VOWEL_LETTERS = new Set(['a', 'e', 'i', 'o', 'u', 'y'])
const ALL_VOWELS: string[] = [...VOWELS]

// Phones (stress ignored) each consonant letter may stand for; a vowel letter may stand for any vowel.
const CONSONANT_ALLOW: Record<string, string[]> = {
  b: ['B', 'P'], c: ['K', 'S', 'CH', 'SH', 'Z'], d: ['D', 'T', 'JH'], f: ['F', 'V'], g: ['G', 'JH', 'ZH', 'K', 'F', 'NG'],
  h: ['HH'], j: ['JH', 'Y', 'HH', 'ZH'], k: ['K'], l: ['L'], m: ['M'], n: ['N', 'NG'], p: ['P', 'F'], q: ['K'],
  r: ['R', 'ER'], s: ['S', 'Z', 'SH', 'ZH'], t: ['T', 'D', 'SH', 'CH', 'TH', 'DH'], v: ['V', 'F'],
  w: ['W', 'V', 'HH'], x: ['Z', 'SH', 'S', 'K'], z: ['Z', 'S', 'ZH', 'SH'],
}
// Two phones from one letter.
const PAIR_ALLOW: Record<string, string[]> = {
  x: ['K S', 'G Z', 'K SH', 'G ZH', 'EH K S'], u: ['Y UW', 'Y AH', 'Y UH', 'Y ER', 'W AH', 'W IH', 'W EH', 'W IY', 'W AA', 'W AY', 'W EY'], o: ['W AH', 'W AA'],
  i: ['Y AH', 'Y IH', 'Y UW', 'AY AH', 'AY IH'], e: ['Y UW', 'IY AH', 'Y AH'], l: ['AH L'], m: ['AH M'], n: ['AH N'], r: ['ER R', 'AH R'],
  j: ['HH Y'], z: ['T S'], c: ['K S', 'T S'], q: ['K W'], a: ['EY AH', 'AY AH', 'W AA', 'Y AH'], y: ['AY AH', 'IY AH'], w: ['AH W'], h: ['HH W'],
}

function canSingle(letter: string, phone: string): boolean {
  const b = base(phone)
  if (VOWEL_LETTERS.has(letter) && isVowel(phone)) return true
  if (letter === 'w' && isVowel(phone)) return true
  if (letter === 'y' && b === 'Y') return true
  if ((letter === 'u' || letter === 'o') && b === 'W') return true
  if ((letter === 'i' || letter === 'e') && b === 'Y') return true
  return CONSONANT_ALLOW[letter]?.includes(b) ?? false
}

function canPair(letter: string, a: string, b: string): boolean {
  const key = `${base(a)} ${base(b)}`
  return PAIR_ALLOW[letter]?.includes(key) ?? false
}

/**
 * Aligns letters with phones: each letter gets zero, one or two phones, in order. Returns the
 * phones of each letter (joined by spaces), or null when no alignment fits the allowables.
 */
export function align(word: string, phones: readonly string[]): string[] | null {
  const n = word.length
  const m = phones.length
  const INF = 1e9
  const cost = new Float64Array((n + 1) * (m + 1)).fill(INF)
  const from = new Int8Array((n + 1) * (m + 1))
  const at = (i: number, j: number) => i * (m + 1) + j
  cost[0] = 0
  for (let i = 0; i < n; i++) {
    const letter = word[i]!
    for (let j = 0; j <= m; j++) {
      const c = cost[at(i, j)]!
      if (c >= INF) continue
      // silent letter; cheaper for letters that are often silent
      const silent = c + (letter === 'e' || letter === 'h' || letter === 'w' || letter === 'u' || letter === 'y' || letter === 'i' || letter === 'a' || letter === 'o' || letter === 'g' || letter === 'k' || letter === 'b' || letter === 't' ? 1 : 1.5)
      if (silent < cost[at(i + 1, j)]!) {
        cost[at(i + 1, j)] = silent
        from[at(i + 1, j)] = 0
      }
      if (j < m && canSingle(letter, phones[j]!)) {
        const v = c
        if (v < cost[at(i + 1, j + 1)]!) {
          cost[at(i + 1, j + 1)] = v
          from[at(i + 1, j + 1)] = 1
        }
      }
      if (j + 1 < m && canPair(letter, phones[j]!, phones[j + 1]!)) {
        const v = c + 0.5
        if (v < cost[at(i + 1, j + 2)]!) {
          cost[at(i + 1, j + 2)] = v
          from[at(i + 1, j + 2)] = 2
        }
      }
    }
  }
  if (cost[at(n, m)]! >= INF) return null
  const out: string[] = new Array(n)
  let j = m
  for (let i = n; i > 0; i--) {
    const step = from[at(i, j)]!
    out[i - 1] = step === 0 ? '' : phones.slice(j - step, j).join(' ')
    j -= step
  }
  return out
}

export const DEFAULT_WINDOWS: Array<[number, number]> = [[3, 4], [3, 3], [2, 3], [2, 2], [1, 2], [1, 1], [0, 1], [0, 0]]

function contextKey(padded: string, i: number, left: number, right: number): string {
  // padded has 4 '#' on each side; i is the letter's index in padded
  return `${padded.slice(i - left, i)}[${padded[i]}]${padded.slice(i + 1, i + 1 + right)}`
}

const PAD = '####'

/**
 * Trains the model on `(word, phones)` pairs (letters a–z only). Each context keeps its most
 * frequent output; a context whose output equals what a lookup would fall back to anyway is
 * dropped, so only the contexts that decide something remain. Counted one window at a time,
 * narrowest first, to keep memory bounded.
 */
export function train(entries: Iterable<[string, readonly string[]]>, windows = DEFAULT_WINDOWS): LtsModel {
  const words: string[] = []
  const outs: number[][] = []
  const outputIds = new Map<string, number>()
  const outputs: string[] = []
  let skipped = 0
  for (const [word, phones] of entries) {
    const aligned = align(word, phones)
    if (!aligned) {
      skipped++
      continue
    }
    words.push(word)
    outs.push(aligned.map((o) => {
      let id = outputIds.get(o)
      if (id === undefined) {
        id = outputs.length
        outputs.push(o)
        outputIds.set(o, id)
      }
      return id
    }))
  }
  const rules: Record<string, string> = {}
  const narrowFirst = [...windows].reverse()
  narrowFirst.forEach(([l, r], level) => {
    const counts = new Map<string, number[]>()
    for (let w = 0; w < words.length; w++) {
      const padded = PAD + words[w]! + PAD
      const o = outs[w]!
      for (let k = 0; k < o.length; k++) {
        const key = contextKey(padded, k + PAD.length, l, r)
        const id = o[k]!
        const c = counts.get(key)
        if (!c) {
          counts.set(key, [id, 1])
          continue
        }
        let found = false
        for (let x = 0; x < c.length; x += 2) {
          if (c[x] === id) {
            c[x + 1]!++
            found = true
            break
          }
        }
        if (!found) c.push(id, 1)
      }
    }
    for (const [key, c] of counts) {
      let top = c[0]!
      let topN = c[1]!
      for (let x = 2; x < c.length; x += 2) {
        if (c[x + 1]! > topN) {
          top = c[x]!
          topN = c[x + 1]!
        }
      }
      const out = outputs[top]!
      if (level === 0) {
        rules[key] = out
        continue
      }
      const open = key.indexOf('[')
      const leftCtx = key.slice(0, open)
      const letter = key[open + 1]!
      const rightCtx = key.slice(open + 3)
      let fallback: string | undefined
      for (let w = level - 1; w >= 0 && fallback === undefined; w--) {
        const [l2, r2] = narrowFirst[w]!
        fallback = rules[`${leftCtx.slice(leftCtx.length - l2)}[${letter}]${rightCtx.slice(0, r2)}`]
      }
      if (fallback !== out) rules[key] = out
    }
  })
  return { windows, rules, meta: { trainedOn: words.length, skipped, rules: Object.keys(rules).length } }
}

/**
 * The phones the model predicts for a word of letters a–z, with exactly one primary stress
 * (the model's stress marks are local guesses; the first primary wins, others become secondary,
 * and a word with none gets it on its first vowel).
 */
export function predict(model: LtsModel, word: string): string[] {
  const padded = PAD + word + PAD
  const phones: string[] = []
  for (let k = 0; k < word.length; k++) {
    const i = k + PAD.length
    let out: string | undefined
    for (const [l, r] of model.windows) {
      out = model.rules[contextKey(padded, i, l, r)]
      if (out !== undefined) break
    }
    if (out) phones.push(...out.split(' '))
  }
  let primary = -1
  for (let i = 0; i < phones.length; i++) {
    const s = stressOf(phones[i]!)
    if (s === 1) {
      if (primary < 0) primary = i
      else phones[i] = `${base(phones[i]!)}2`
    }
  }
  if (primary < 0) {
    const first = phones.findIndex(isVowel)
    if (first >= 0) phones[first] = `${base(phones[first]!)}1`
  }
  return phones
}

export { ALL_VOWELS }

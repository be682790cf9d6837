/**
 * Numerals as writers say them on a record (common practice): `808` → eight-oh-eight,
 * `24/7` → twenty-four seven, `'96` → ninety-six, `1999` → nineteen ninety-nine,
 * `100` → one hundred, `2005` → two thousand five, `3rd` → third, `90s` → nineties.
 */
const ONES = ['zero', 'one', 'two', 'three', 'four', 'five', 'six', 'seven', 'eight', 'nine', 'ten', 'eleven', 'twelve', 'thirteen', 'fourteen', 'fifteen', 'sixteen', 'seventeen', 'eighteen', 'nineteen']
const TENS = ['', '', 'twenty', 'thirty', 'forty', 'fifty', 'sixty', 'seventy', 'eighty', 'ninety']
const ORDINAL: Record<string, string> = { one: 'first', two: 'second', three: 'third', five: 'fifth', eight: 'eighth', nine: 'ninth', twelve: 'twelfth' }

function twoDigits(n: number): string[] {
  if (n < 20) return [ONES[n]!]
  const t = TENS[Math.floor(n / 10)]!
  return n % 10 ? [t, ONES[n % 10]!] : [t]
}

/** A plain cardinal, for numbers below one trillion. */
export function cardinal(n: number): string[] {
  if (n < 100) return twoDigits(n)
  if (n < 1000) {
    const rest = n % 100
    return [ONES[Math.floor(n / 100)]!, 'hundred', ...(rest ? twoDigits(rest) : [])]
  }
  for (const [size, name] of [[1e9, 'billion'], [1e6, 'million'], [1e3, 'thousand']] as const) {
    if (n >= size) {
      const rest = n % size
      return [...cardinal(Math.floor(n / size)), name, ...(rest ? cardinal(rest) : [])]
    }
  }
  return []
}

/** How a run of digits is spoken: model numbers and years the way the trade reads them. */
export function spokenDigits(digits: string): string[] {
  if (digits.length > 12) return digits.split('').map(d => (d === '0' ? 'oh' : ONES[Number(d)]!))
  const n = Number(digits)
  if (digits.length > 1 && digits.startsWith('0')) return digits.split('').map(d => (d === '0' ? 'oh' : ONES[Number(d)]!))
  if (digits.length === 3 && n % 100 !== 0) {
    // 808 → eight oh eight; 360 → three sixty; 747 → seven forty-seven
    const [h, t, o] = digits.split('').map(Number) as [number, number, number]
    return t === 0 ? [ONES[h]!, 'oh', ONES[o]!] : [ONES[h]!, ...twoDigits(t * 10 + o)]
  }
  if (digits.length === 4) {
    const hi = Math.floor(n / 100)
    const lo = n % 100
    if (n % 1000 === 0) return cardinal(n)
    if (hi % 10 === 0 && lo < 10) return cardinal(n) // 2005 → two thousand five
    if (lo === 0) return [...twoDigits(hi), 'hundred'] // 1900 → nineteen hundred
    return [...twoDigits(hi), ...(lo < 10 ? ['oh', ONES[lo]!] : twoDigits(lo))] // 1999, 1905
  }
  return cardinal(n)
}

function ordinalOf(word: string): string {
  if (ORDINAL[word]) return ORDINAL[word]!
  if (word.endsWith('y')) return `${word.slice(0, -1)}ieth`
  return `${word}th`
}

function pluralOf(word: string): string {
  return word.endsWith('y') ? `${word.slice(0, -1)}ies` : `${word}s`
}

/**
 * Spoken words for a numeric token (`808`, `24/7`, `'96`, `3rd`, `90s`, `1,000`, `2.5`),
 * or null when the token is not one.
 */
export function spokenNumber(token: string): string[] | null {
  const t = token.replace(/[\u2018\u2019]/g, '\'')
  let m = t.match(/^(\d{1,12})\/(\d{1,12})$/)
  if (m) return [...spokenDigits(m[1]!), ...spokenDigits(m[2]!)]
  m = t.match(/^'(\d\d)(s?)$/)
  if (m) {
    const words = spokenDigits(m[1]!)
    if (m[2]) words[words.length - 1] = pluralOf(words[words.length - 1]!)
    return words
  }
  m = t.match(/^(\d{1,3}(?:,\d{3})+|\d{1,12})(st|nd|rd|th|s|'s|k|m)?$/i)
  if (m) {
    const digits = m[1]!.replace(/,/g, '')
    const words = m[1]!.includes(',') ? cardinal(Number(digits)) : spokenDigits(digits)
    const suffix = (m[2] ?? '').toLowerCase()
    const last = words.length - 1
    if (suffix === 'st' || suffix === 'nd' || suffix === 'rd' || suffix === 'th') words[last] = ordinalOf(words[last]!)
    else if (suffix === 's' || suffix === '\'s') words[last] = pluralOf(words[last]!)
    else if (suffix === 'k') words.push('k')
    else if (suffix === 'm') words.push('m')
    return words
  }
  m = t.match(/^(\d{1,9})\.(\d{1,6})$/)
  if (m) return [...spokenDigits(m[1]!), 'point', ...m[2]!.split('').map(d => (d === '0' ? 'oh' : ONES[Number(d)]!))]
  return null
}

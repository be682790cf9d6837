/**
 * Split shares are per cent with two decimals, stored as basis points (1 % = 100 bp) so the
 * total is integer arithmetic: 33.33 + 33.33 + 33.34 = 10 000 bp exactly.
 */
export const FULL_SPLIT_BP = 10_000

const SHARE_PATTERN = /^(?:100(?:\.0{1,2})?|\d{1,2}(?:\.\d{1,2})?)$/

/** Basis points for "33.33" or 33.33; null when it is not a per cent with at most two decimals. */
export function shareToBp(value: string | number): number | null {
  if (typeof value === 'number') {
    if (!Number.isFinite(value) || value < 0 || value > 100) return null
    const bp = Math.round(value * 100)
    // 33.33 × 100 is 3332.9999…; anything further from a whole basis point had a third decimal.
    return Math.abs(value * 100 - bp) < 1e-6 ? bp : null
  }
  const text = value.trim()
  if (!SHARE_PATTERN.test(text)) return null
  const [whole, frac = ''] = text.split('.')
  return Number(whole) * 100 + Number(frac.padEnd(2, '0'))
}

/** "33.33" for 3333 bp. */
export function formatShare(bp: number): string {
  return `${Math.floor(bp / 100)}.${String(bp % 100).padStart(2, '0')}`
}

export function totalBp(shares: ReadonlyArray<{ shareBp: number }>): number {
  return shares.reduce((sum, s) => sum + s.shareBp, 0)
}

/** The message for a total that is not 100.00 %, or null when it is. */
export function splitTotalProblem(shares: ReadonlyArray<{ shareBp: number }>): string | null {
  const total = totalBp(shares)
  if (total === FULL_SPLIT_BP) return null
  const gap = FULL_SPLIT_BP - total
  return `The shares total ${formatShare(total)} %; they must total exactly 100.00 % (${gap > 0 ? `${formatShare(gap)} short` : `${formatShare(-gap)} over`}).`
}

/** The caution shown wherever splits are edited or printed. */
export const SPLIT_CAUTION = 'Not legal advice. Registration rules vary by country and by society; ask a qualified professional before you register or sign.'

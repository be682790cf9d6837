import type { LyricLine } from './lyric-doc'

export interface BarRow {
  bar: number
  left: LyricLine[]
  right: LyricLine[]
  /** Both sides hold the same words on this bar. */
  same: boolean
  /** Bars skipped (no line on either side) since the previous row. */
  gapBefore: number
}

/**
 * Two drafts side by side on the same bars: one row per bar where either holds a line
 * (a line sits on the bar it starts on), in bar order, with each side's lines in order.
 */
export function alignByBar(left: readonly LyricLine[], right: readonly LyricLine[]): BarRow[] {
  const bars = new Map<number, { left: LyricLine[], right: LyricLine[] }>()
  const at = (bar: number) => {
    let row = bars.get(bar)
    if (!row) bars.set(bar, row = { left: [], right: [] })
    return row
  }
  for (const l of left) at(l.bar).left.push(l)
  for (const l of right) at(l.bar).right.push(l)
  const rows: BarRow[] = []
  let previous = 0
  for (const bar of [...bars.keys()].sort((a, b) => a - b)) {
    const row = bars.get(bar)!
    const words = (ls: LyricLine[]) => ls.filter(l => !l.out).map(l => l.text.trim()).join('\n')
    rows.push({ bar, ...row, same: words(row.left) === words(row.right), gapBefore: Math.max(0, bar - previous - 1) })
    previous = bar
  }
  return rows
}

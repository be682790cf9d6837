/**
 * When a lyric bar starts, exactly. Bar n starts at offset + (n − 1) × beatsPerBar × 60 / BPM;
 * under a half-time feel one lyric bar spans two project bars. Times are kept as exact
 * fractions of a millisecond (bigint numerator / denominator) and rounded once, at the end,
 * so a time far into the song is never the sum of rounded bar lengths.
 *
 * Small and pure on purpose: shared/utils/grid.ts can replace it without touching callers.
 */

export interface BarGrid {
  /** Quarter notes per minute, up to three decimals. */
  bpm: number
  beatsPerBar: number
  /** Where bar 1 starts in the audio, in ms (up to three decimals). */
  offsetMs: number
  feel: 'normal' | 'half'
}

/** An exact time in milliseconds: num / den. */
export interface ExactMs { num: bigint, den: bigint }

const thousandths = (x: number) => BigInt(Math.round(x * 1000))

/**
 * The exact start of lyric bar `bar` (from 1), plus `part` / `parts` of that bar when several
 * lines share it (line `part` of `parts`, from 0).
 */
export function lyricBarStart(grid: BarGrid, bar: number, part = 0, parts = 1): ExactMs {
  if (!(grid.bpm > 0) || !Number.isInteger(grid.beatsPerBar) || grid.beatsPerBar < 1) throw new RangeError('The grid needs a positive BPM and whole beats per bar.')
  if (!Number.isInteger(bar) || !Number.isInteger(part) || !Number.isInteger(parts) || parts < 1) throw new RangeError('Bars and parts are whole numbers.')
  const projectBarsPerLyricBar = grid.feel === 'half' ? 2n : 1n
  // ms since bar 1 = ((bar−1)·parts + part) · k · beatsPerBar · 60 000 / (parts · BPM), BPM = bpmMilli / 1000
  const barsNum = (BigInt(bar - 1) * BigInt(parts) + BigInt(part)) * projectBarsPerLyricBar * BigInt(grid.beatsPerBar) * 60_000n * 1000n
  const den = BigInt(parts) * thousandths(grid.bpm)
  // offsetMs has up to three decimals: offset = offsetMilli / 1000 ms
  return { num: barsNum * 1000n + thousandths(grid.offsetMs) * den, den: den * 1000n }
}

/** Rounds an exact time to whole milliseconds, halves away from zero. */
export function roundMs(t: ExactMs): number {
  const { num, den } = t
  const sign = (num < 0n) !== (den < 0n) ? -1n : 1n
  const a = num < 0n ? -num : num
  const b = den < 0n ? -den : den
  return Number(sign * ((2n * a + b) / (2n * b)))
}

/** The start of lyric bar `bar` in whole milliseconds. */
export function lyricBarStartMs(grid: BarGrid, bar: number, part = 0, parts = 1): number {
  return roundMs(lyricBarStart(grid, bar, part, parts))
}

/** `hh:mm:ss.ttt` (W3C WebVTT timestamp, hours always written). */
export function formatTimestamp(ms: number): string {
  if (!Number.isInteger(ms) || ms < 0) throw new RangeError('A timestamp is a whole, non-negative number of milliseconds.')
  const pad = (n: number, w = 2) => String(n).padStart(w, '0')
  const h = Math.floor(ms / 3_600_000)
  const m = Math.floor(ms / 60_000) % 60
  const s = Math.floor(ms / 1000) % 60
  return `${pad(h)}:${pad(m)}:${pad(s)}.${pad(ms % 1000, 3)}`
}

/** `m:ss` for a sheet's margin (the song's own clock). */
export function formatClock(ms: number): string {
  const total = Math.floor(Math.max(0, ms) / 1000)
  return `${Math.floor(total / 60)}:${String(total % 60).padStart(2, '0')}`
}

/**
 * Bar and time on the grid, exact. Server and client both use these functions, so a bar
 * number means the same moment everywhere.
 *
 * The tempo counts quarter notes (as Standard MIDI Files do); a bar holds `beatsPerBar`
 * of them. Values are turned into integers first (tempo in thousandths of a BPM, times in
 * microseconds) and positions are found with integer division, never float modulo: at
 * 90 BPM a bar is exactly 8/3 s, and `30 % (8 / 3)` in floats would put t = 30 s on beat 1
 * of bar 12 instead of beat 2.
 */

export const FEELS = ['normal', 'half'] as const
export type Feel = typeof FEELS[number]

export const METERS = [2, 3, 4, 5, 6, 7] as const

export const MIN_BPM = 30
export const MAX_BPM = 300

export interface Grid {
  /** Quarter notes per minute, up to three decimals. */
  bpm: number
  /** Beats (quarter notes) in one project bar. */
  beatsPerBar: number
  /** Where bar 1 starts in the audio, in milliseconds (up to three decimals). */
  offsetMs: number
  /** Half-time: writers count one lyric bar per two project bars. */
  feel: Feel
}

export const DEFAULT_GRID: Grid = { bpm: 90, beatsPerBar: 4, offsetMs: 0, feel: 'normal' }

/** Where a moment falls on the grid. Bars are numbered from 1; the lead-in before bar 1 is bar 0, −1, … */
export interface GridPosition {
  bar: number
  /** Beat within the bar, from 1. */
  beat: number
  /** 0 ≤ fraction < 1: how far through the bar. */
  barFraction: number
  /** The lyric bar (same as `bar` in normal feel; one per two project bars in half-time). */
  lyricBar: number
}

const MICRO = 1_000_000n
const MILLI_BPM = 1000n
// µs per minute × thousandths of a BPM: beats = Δµs × bpmMilli / BEAT_UNIT.
const BEAT_UNIT = 60n * MICRO * MILLI_BPM

const bpmMilli = (g: Grid) => BigInt(Math.round(g.bpm * 1000))
const toMicros = (ms: number) => BigInt(Math.round(ms * 1000))

function floorDiv(a: bigint, b: bigint): bigint {
  const q = a / b
  return (a % b !== 0n && (a < 0n) !== (b < 0n)) ? q - 1n : q
}

function assertGrid(g: Grid) {
  if (!(g.bpm >= MIN_BPM && g.bpm <= MAX_BPM)) throw new RangeError(`bpm must lie between ${MIN_BPM} and ${MAX_BPM}`)
  if (!Number.isInteger(g.beatsPerBar) || g.beatsPerBar < 1) throw new RangeError('beatsPerBar must be a positive integer')
}

/** Seconds per beat: 60 / BPM. */
export function beatSeconds(g: Pick<Grid, 'bpm'>): number {
  return 60 / g.bpm
}

/** Milliseconds per project bar: 60 000 × beatsPerBar / BPM (90 BPM in 4/4 → 2666.667). */
export function barDurationMs(g: Pick<Grid, 'bpm' | 'beatsPerBar'>): number {
  return (60_000 * g.beatsPerBar) / g.bpm
}

/** Project bars per lyric bar: 2 under half-time feel, else 1. */
export function barsPerLyricBar(g: Pick<Grid, 'feel'>): 1 | 2 {
  return g.feel === 'half' ? 2 : 1
}

/** Start of project bar `bar` (from 1; 0 and below are lead-in bars) in ms. */
export function barStartMs(g: Grid, bar: number): number {
  assertGrid(g)
  if (!Number.isInteger(bar)) throw new RangeError('bar must be an integer')
  // offset + (bar − 1) × beatsPerBar × 60 000 / bpm, one division at the end.
  const num = BigInt(bar - 1) * BigInt(g.beatsPerBar) * 60_000n * MILLI_BPM * 1000n
  const micros = toMicros(g.offsetMs) + num / bpmMilli(g)
  const rest = num % bpmMilli(g)
  return Number(micros) / 1000 + Number(rest) / Number(bpmMilli(g)) / 1000
}

/** Start of project bar `bar` in seconds. */
export function barStartSeconds(g: Grid, bar: number): number {
  return barStartMs(g, bar) / 1000
}

/** Start of project bar `bar` as a sample index at `sampleRate` (rounded to the nearest sample). */
export function barStartSample(g: Grid, bar: number, sampleRate: number): number {
  return Math.round((barStartMs(g, bar) * sampleRate) / 1000)
}

/** Samples per project bar at `sampleRate` (90 BPM 4/4 at 44.1 kHz → 117 600). */
export function samplesPerBar(g: Pick<Grid, 'bpm' | 'beatsPerBar'>, sampleRate: number): number {
  return (sampleRate * 60 * g.beatsPerBar) / g.bpm
}

/** The grid position of a moment `timeMs` into the audio. */
export function positionAt(g: Grid, timeMs: number): GridPosition {
  assertGrid(g)
  const delta = toMicros(timeMs) - toMicros(g.offsetMs)
  const beatsNum = delta * bpmMilli(g) // beats = beatsNum / BEAT_UNIT
  const beatIndex = floorDiv(beatsNum, BEAT_UNIT)
  const bpb = BigInt(g.beatsPerBar)
  const barIndex = floorDiv(beatIndex, bpb)
  const beatInBar = beatIndex - barIndex * bpb
  const barUnit = BEAT_UNIT * bpb
  const intoBar = beatsNum - barIndex * barUnit
  const bar = Number(barIndex) + 1
  return {
    bar,
    beat: Number(beatInBar) + 1,
    barFraction: Number(intoBar) / Number(barUnit),
    lyricBar: lyricBarOf(g, bar),
  }
}

/** The project bar a moment falls in. */
export function barAt(g: Grid, timeMs: number): number {
  return positionAt(g, timeMs).bar
}

/** The bar boundary nearest to `timeMs` (for snapping a drag to the grid). */
export function nearestBarStart(g: Grid, timeMs: number): number {
  const p = positionAt(g, timeMs)
  return p.barFraction >= 0.5 ? p.bar + 1 : p.bar
}

/** Lyric bar of project bar `bar`: under half-time, project bars 1–2 are lyric bar 1, 3–4 are 2, … */
export function lyricBarOf(g: Pick<Grid, 'feel'>, bar: number): number {
  const per = barsPerLyricBar(g)
  return Math.floor((bar - 1) / per) + 1
}

/** First project bar of lyric bar `lyricBar`. */
export function projectBarOfLyricBar(g: Pick<Grid, 'feel'>, lyricBar: number): number {
  return (lyricBar - 1) * barsPerLyricBar(g) + 1
}

/** An exact time in milliseconds: num / den (den > 0). */
export interface ExactMs { num: bigint, den: bigint }

/**
 * The exact start of lyric bar `lyricBar` (from 1), plus `part` / `parts` of that bar when
 * several lines share it (line `part` of `parts`, from 0). Kept as a fraction so a time far
 * into the song is rounded once, never summed from rounded bar lengths (timed text needs it).
 */
export function lyricBarStartExact(g: Grid, lyricBar: number, part = 0, parts = 1): ExactMs {
  assertGrid(g)
  if (!Number.isInteger(lyricBar) || !Number.isInteger(part) || !Number.isInteger(parts) || parts < 1) throw new RangeError('Bars and parts are whole numbers.')
  // ms since bar 1 = ((bar−1)·parts + part) · k · beatsPerBar · 60 000 / (parts · BPM), k project bars per lyric bar
  const barsNum = (BigInt(lyricBar - 1) * BigInt(parts) + BigInt(part)) * BigInt(barsPerLyricBar(g)) * BigInt(g.beatsPerBar) * 60_000n * MILLI_BPM
  const den = BigInt(parts) * bpmMilli(g)
  // offsetMs has up to three decimals: offset = offset µs / 1000 ms
  return { num: barsNum * 1000n + toMicros(g.offsetMs) * den, den: den * 1000n }
}

/** Rounds an exact time to whole milliseconds, halves away from zero. */
export function roundMs(t: ExactMs): number {
  const sign = (t.num < 0n) !== (t.den < 0n) ? -1n : 1n
  const a = t.num < 0n ? -t.num : t.num
  const b = t.den < 0n ? -t.den : t.den
  return Number(sign * ((2n * a + b) / (2n * b)))
}

/** The start of lyric bar `lyricBar` (or of its `part` of `parts`) in whole milliseconds. */
export function lyricBarStartMs(g: Grid, lyricBar: number, part = 0, parts = 1): number {
  return roundMs(lyricBarStartExact(g, lyricBar, part, parts))
}

/** True when exact time `a` comes before `b`. */
export const exactBefore = (a: ExactMs, b: ExactMs) => a.num * b.den < b.num * a.den

/** Project bars that `lyricBars` lyric bars cover (a "16" at half-time covers 32). */
export function projectBarsFor(g: Pick<Grid, 'feel'>, lyricBars: number): number {
  return lyricBars * barsPerLyricBar(g)
}

/**
 * Bars that start inside the audio: bar 1 up to the bar holding the last millisecond. A
 * partial last bar counts; a sliver under 1 ms (rounding of the end time) does not.
 */
export function barCount(g: Grid, durationMs: number): number {
  assertGrid(g)
  if (durationMs - 1 < g.offsetMs) return 0
  return positionAt(g, durationMs - 1).bar
}

/** Time span of project bars `startBar`…`endBar` inclusive, in ms. */
export function barRangeMs(g: Grid, startBar: number, endBar: number): { startMs: number, endMs: number } {
  return { startMs: barStartMs(g, startBar), endMs: barStartMs(g, endBar + 1) }
}

/**
 * Tempo from tapped times (ms, in order): the mean interval of the last taps, ignoring a
 * pause longer than two seconds (a new run of taps). Null until there are two taps.
 */
export function tapTempo(tapsMs: readonly number[], maxTaps = 8): number | null {
  const taps: number[] = []
  for (const t of tapsMs) {
    if (taps.length && t - taps[taps.length - 1]! > 2000) taps.length = 0
    taps.push(t)
  }
  const last = taps.slice(-maxTaps)
  if (last.length < 2) return null
  const bpm = (60_000 * (last.length - 1)) / (last[last.length - 1]! - last[0]!)
  return Math.round(bpm * 100) / 100
}

/** `hh:mm:ss.ttt` (hours only when non-zero), rounded from the exact ms, as timed text wants. */
export function formatClock(ms: number, alwaysHours = false): string {
  const total = Math.round(ms)
  const sign = total < 0 ? '-' : ''
  const abs = Math.abs(total)
  const h = Math.floor(abs / 3_600_000)
  const m = Math.floor((abs % 3_600_000) / 60_000)
  const s = Math.floor((abs % 60_000) / 1000)
  const t = abs % 1000
  const pad = (n: number, w = 2) => String(n).padStart(w, '0')
  return `${sign}${h || alwaysHours ? `${pad(h)}:` : ''}${pad(m)}:${pad(s)}.${pad(t, 3)}`
}

/** `m:ss` for a sheet's margin (the song's own clock, whole seconds). */
export function formatMinutes(ms: number): string {
  const total = Math.floor(Math.max(0, ms) / 1000)
  return `${Math.floor(total / 60)}:${String(total % 60).padStart(2, '0')}`
}

/** Tempo halved and doubled, kept within the grid's range. */
export function tempoOctaves(bpm: number): number[] {
  return [bpm / 2, bpm * 2].filter(b => b >= MIN_BPM && b <= MAX_BPM).map(b => Math.round(b * 1000) / 1000)
}

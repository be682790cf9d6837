/**
 * When scratch takes play against the beat. A take is pinned to the lyric bar where its
 * recording started and starts exactly at that bar's time on the grid (grid.ts); with the
 * playhead anywhere, each take is either still to come (wait), sounding (play from a point
 * inside it) or over.
 */
import { barStartMs, lyricBarOf, lyricBarStartMs, positionAt, type Grid } from './grid'

export interface PlacedTake { id: string, bar: number, durationMs: number }

export type TakeStep
  = | { id: string, action: 'wait', inMs: number }
    | { id: string, action: 'play', fromMs: number }
    | { id: string, action: 'over' }

/** The moment (ms into the beat) a take pinned to lyric bar `bar` starts. */
export function takeStartMs(grid: Grid, bar: number): number {
  return lyricBarStartMs(grid, bar)
}

/** What each take does with the playhead at `positionMs`. */
export function takePlan(grid: Grid, positionMs: number, takes: readonly PlacedTake[]): TakeStep[] {
  return takes.map((t) => {
    const start = takeStartMs(grid, t.bar)
    if (positionMs < start) return { id: t.id, action: 'wait', inMs: start - positionMs }
    if (positionMs < start + t.durationMs) return { id: t.id, action: 'play', fromMs: positionMs - start }
    return { id: t.id, action: 'over' }
  })
}

/**
 * The lyric bar a recording armed at `positionMs` starts on: the next bar line (a take
 * always begins on a bar), or the loop's first bar when the loop wraps before it. The loop
 * is in project bars, as the player keeps it.
 */
export function armedBar(grid: Grid, positionMs: number, loop: { startBar: number, endBar: number } | null): number {
  let next = Math.max(1, positionAt(grid, positionMs).lyricBar + 1)
  if (loop) {
    const first = lyricBarOf(grid, loop.startBar)
    const loopEndMs = barStartMs(grid, loop.endBar + 1)
    if (lyricBarStartMs(grid, next) >= loopEndMs - 0.5 || next < first) next = first
  }
  return next
}

import { describe, expect, it } from 'vitest'
import type { Grid } from '../../shared/utils/grid'
import { armedBar, takePlan, takeStartMs } from '../../shared/utils/scratch-schedule'

const grid = (bpm: number, offsetMs = 0, feel: Grid['feel'] = 'normal'): Grid => ({ bpm, beatsPerBar: 4, offsetMs, feel })
// DOMAIN.md §1 (arithmetic): bar n starts at offset + (n − 1) × beatsPerBar × 60 / BPM.
const formula = (g: Grid, bar: number) => Math.round(g.offsetMs + (bar - 1) * (g.feel === 'half' ? 2 : 1) * g.beatsPerBar * 60_000 / g.bpm)

describe('scratch takes against the beat', () => {
  it('start at their bar\'s time on the grid', () => {
    expect(takeStartMs(grid(90, 500), 5)).toBe(11_167) // 0.5 s + 4 × 8/3 s = 11.1667 s
    expect(takeStartMs(grid(90, 698), 5)).toBe(formula(grid(90, 698), 5))
    expect(takeStartMs(grid(140, 0, 'half'), 17)).toBe(54_857) // a "16" at half-time over 140 BPM (common practice)
  })

  it('wait, play from inside, or are over, wherever the playhead is', () => {
    const g = grid(90)
    const takes = [{ id: 'a', bar: 5, durationMs: 4000 }, { id: 'b', bar: 2, durationMs: 1000 }]
    const at5 = takeStartMs(g, 5)
    expect(takePlan(g, at5 - 1000, takes)).toEqual([{ id: 'a', action: 'wait', inMs: 1000 }, { id: 'b', action: 'over' }])
    expect(takePlan(g, at5 + 250, takes)[0]).toEqual({ id: 'a', action: 'play', fromMs: 250 })
    expect(takePlan(g, at5 + 4000, takes)[0]).toEqual({ id: 'a', action: 'over' })
  })

  it('arm a recording for the next bar line, or the loop\'s first bar when the loop wraps first', () => {
    const g = grid(90)
    expect(armedBar(g, takeStartMs(g, 3) + 100, null)).toBe(4)
    expect(armedBar(g, 0, null)).toBe(2)
    // Looping project bars 1–4: in bar 4 the next bar line is the loop's start.
    expect(armedBar(g, takeStartMs(g, 4) + 100, { startBar: 1, endBar: 4 })).toBe(1)
    expect(armedBar(g, takeStartMs(g, 2) + 100, { startBar: 1, endBar: 4 })).toBe(3)
    // Half-time: project bars 5–8 are lyric bars 3–4.
    expect(armedBar(grid(140, 0, 'half'), takeStartMs(grid(140, 0, 'half'), 4) + 10, { startBar: 5, endBar: 8 })).toBe(3)
  })
})

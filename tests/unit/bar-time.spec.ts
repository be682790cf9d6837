import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { formatClock, formatTimestamp, lyricBarStart, lyricBarStartMs, roundMs, type BarGrid } from '../../shared/utils/bar-time'

const grid = (bpm: number, extra: Partial<BarGrid> = {}): BarGrid => ({ bpm, beatsPerBar: 4, offsetMs: 0, feel: 'normal', ...extra })

describe('bar → time on the grid', () => {
  // Check values from DOMAIN.md §1 (arithmetic: bar n starts at offset + (n − 1) × beatsPerBar × 60 / BPM).
  it('puts bar 2 at 90 BPM exactly 8/3 s in', () => {
    const t = lyricBarStart(grid(90), 2)
    expect(t.num * 3n).toBe(t.den * 8000n)
    expect(lyricBarStartMs(grid(90), 2)).toBe(2667)
  })

  it('matches the 4/4 check values for 70, 140 and 160 BPM', () => {
    expect(lyricBarStartMs(grid(70), 2)).toBe(3429) // 3.4286 s
    expect(lyricBarStartMs(grid(140), 2)).toBe(1714) // 1.7143 s
    expect(lyricBarStartMs(grid(140), 17)).toBe(27429) // 16 bars, 27.429 s
    expect(lyricBarStartMs(grid(160), 2)).toBe(1500)
    expect(lyricBarStartMs(grid(90), 17)).toBe(42667) // 16 bars, 42.667 s
  })

  it('adds the offset of bar 1 (0.5 s lead-in at 90 BPM: bar 5 at 11.1667 s)', () => {
    expect(lyricBarStartMs(grid(90, { offsetMs: 500 }), 5)).toBe(11167)
    expect(lyricBarStartMs(grid(90, { offsetMs: 500 }), 1)).toBe(500)
  })

  it('counts meters in quarter notes (3/4 at 90 → 2.000 s a bar)', () => {
    expect(lyricBarStartMs(grid(90, { beatsPerBar: 3 }), 2)).toBe(2000)
  })

  it('spans two project bars per lyric bar under a half-time feel (a 16 over 140 BPM covers 54.857 s)', () => {
    // DOMAIN.md §1: at half-time tempos a "16" over a 140 BPM beat covers 32 project bars [CP, A].
    expect(lyricBarStartMs(grid(140, { feel: 'half' }), 17)).toBe(54857)
    expect(lyricBarStartMs(grid(140, { feel: 'half' }), 2)).toBe(lyricBarStartMs(grid(140), 3))
  })

  it('rounds from the exact time, never sums rounded bar lengths', () => {
    // 999 bars of 8/3 s = 2664 s exactly; 999 × 2667 ms would drift by a third of a second.
    expect(lyricBarStartMs(grid(90), 1000)).toBe(2_664_000)
    expect(999 * lyricBarStartMs(grid(90), 2)).not.toBe(2_664_000)
  })

  it('divides a bar shared by several lines into equal parts', () => {
    expect(lyricBarStartMs(grid(90), 3, 1, 2)).toBe(Math.round(2.5 * 8000 / 3))
    expect(lyricBarStartMs(grid(90), 3, 2, 2)).toBe(lyricBarStartMs(grid(90), 4))
  })

  it('stays within half a millisecond of the float formula for any grid', () => {
    fc.assert(fc.property(
      fc.integer({ min: 30_000, max: 300_000 }), fc.integer({ min: 1, max: 7 }), fc.integer({ min: 0, max: 10_000_000 }), fc.integer({ min: 1, max: 2000 }), fc.boolean(),
      (bpmMilli, beatsPerBar, offsetMicro, bar, half) => {
        const g: BarGrid = { bpm: bpmMilli / 1000, beatsPerBar, offsetMs: offsetMicro / 1000, feel: half ? 'half' : 'normal' }
        const float = g.offsetMs + (bar - 1) * (half ? 2 : 1) * beatsPerBar * 60_000 / g.bpm
        expect(Math.abs(lyricBarStartMs(g, bar) - float)).toBeLessThanOrEqual(0.5 + 1e-6)
      },
    ))
  })

  it('rounds halves away from zero', () => {
    expect(roundMs({ num: 5n, den: 2n })).toBe(3)
    expect(roundMs({ num: 7n, den: 3n })).toBe(2)
  })

  it('refuses a grid without a tempo', () => {
    expect(() => lyricBarStart(grid(0), 1)).toThrow(RangeError)
    expect(() => lyricBarStart(grid(90), 1.5)).toThrow(RangeError)
  })
})

describe('timestamps', () => {
  // W3C WebVTT §4: hh:mm:ss.ttt; check values from DOMAIN.md §6.
  it('writes WebVTT timestamps', () => {
    expect(formatTimestamp(lyricBarStartMs(grid(90), 2))).toBe('00:00:02.667') // 8/3 s
    expect(formatTimestamp(lyricBarStartMs(grid(90), 17))).toBe('00:00:42.667') // 128/3 s
    expect(formatTimestamp(lyricBarStartMs(grid(60), 65))).toBe('00:04:16.000') // 256 s
    expect(formatTimestamp(3_600_000 + 61_001)).toBe('01:01:01.001')
    expect(() => formatTimestamp(-1)).toThrow(RangeError)
  })

  it('writes a margin clock', () => {
    expect(formatClock(42_667)).toBe('0:42')
    expect(formatClock(256_000)).toBe('4:16')
  })
})

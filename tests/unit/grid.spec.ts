import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import {
  barAt, barCount, barDurationMs, barRangeMs, barStartMs, barStartSample, formatClock, formatMinutes, lyricBarOf, lyricBarStartExact,
  lyricBarStartMs, nearestBarStart, positionAt, projectBarOfLyricBar, projectBarsFor, roundMs, samplesPerBar, tapTempo, tempoOctaves, type Grid,
} from '../../shared/utils/grid'

const g = (bpm: number, beatsPerBar = 4, offsetMs = 0, feel: Grid['feel'] = 'normal'): Grid => ({ bpm, beatsPerBar, offsetMs, feel })

describe('bar duration', () => {
  // common practice: bar = 60 / BPM × beats per bar (tempo in quarter notes, as Standard MIDI Files count it)
  it('matches the check values for 4/4', () => {
    expect(barDurationMs(g(90))).toBeCloseTo(2666.667, 3)
    expect(barRangeMs(g(90), 1, 16).endMs).toBeCloseTo(42_666.667, 3)
    expect(barDurationMs(g(70))).toBeCloseTo(3428.571, 3)
    expect(barDurationMs(g(140))).toBeCloseTo(1714.286, 3)
    expect(barRangeMs(g(140), 1, 16).endMs).toBeCloseTo(27_428.571, 3)
    expect(barDurationMs(g(160))).toBe(1500)
  })

  // arithmetic: 90 BPM → 8/3 s per bar; × 44 100 and × 48 000 samples per second
  it('counts samples per bar exactly', () => {
    expect(samplesPerBar(g(90), 44_100)).toBe(117_600)
    expect(samplesPerBar(g(90), 48_000)).toBe(128_000)
    expect(barStartSample(g(90), 2, 44_100)).toBe(117_600)
    expect(barStartSample(g(90), 101, 44_100)).toBe(11_760_000)
  })

  // arithmetic: 3/4 at quarter = 90 is 2 s, 7/8 counted in quarters is 3.5 beats (not a grid meter here)
  it('handles other meters', () => {
    expect(barDurationMs(g(90, 3))).toBe(2000)
    expect(barDurationMs(g(90, 6))).toBe(4000)
    expect(barDurationMs(g(120, 5))).toBe(2500)
  })
})

describe('bar ↔ time', () => {
  it('puts bar 5 at 11.1667 s with a 0.5 s lead-in at 90 BPM', () => {
    // arithmetic: 0.5 + 4 × 8/3
    expect(barStartMs(g(90, 4, 500), 5)).toBeCloseTo(11_166.667, 3)
  })

  it('puts t = 30 s on beat 2 of bar 12 at 90 BPM (float modulo would say beat 1)', () => {
    // arithmetic: 30 s = 45 beats exactly; beat index 45 → bar 12, beat 2
    expect(positionAt(g(90), 30_000)).toMatchObject({ bar: 12, beat: 2, barFraction: 0.25 })
    expect(positionAt(g(90), 29_999.999)).toMatchObject({ bar: 12, beat: 1 })
  })

  it('numbers the lead-in bars 0 and below', () => {
    expect(barAt(g(90, 4, 500), 0)).toBe(0)
    expect(barAt(g(90, 4, 500), 499.999)).toBe(0)
    expect(barAt(g(90, 4, 500), 500)).toBe(1)
    expect(barAt(g(120, 4, 3000), 0)).toBe(-1)
  })

  it('round-trips every bar start to the same bar, beat 1 (property)', () => {
    fc.assert(fc.property(
      fc.integer({ min: 30_000, max: 300_000 }), fc.constantFrom(2, 3, 4, 5, 6, 7), fc.integer({ min: 0, max: 10_000_000 }), fc.integer({ min: 1, max: 400 }),
      (milliBpm, bpb, offsetMicros, bar) => {
        const grid = g(milliBpm / 1000, bpb, offsetMicros / 1000)
        const p = positionAt(grid, barStartMs(grid, bar) + 0.001)
        return p.bar === bar && p.beat === 1
      },
    ))
  })

  it('snaps to the nearest bar line', () => {
    expect(nearestBarStart(g(90), 2600)).toBe(2)
    expect(nearestBarStart(g(90), 1200)).toBe(1)
  })

  it('counts bars from the duration, a partial last bar included', () => {
    // 90 BPM: 16 bars = 42 666.667 ms
    expect(barCount(g(90), 42_666)).toBe(16)
    expect(barCount(g(90), barRangeMs(g(90), 1, 16).endMs)).toBe(16)
    expect(barCount(g(90), 42_700)).toBe(17)
    expect(barCount(g(90, 4, 500), 500)).toBe(0)
    expect(barCount(g(160), 240_000)).toBe(160)
  })
})

describe('half-time feel', () => {
  // common practice: a "16" over a 140 BPM half-time beat covers 32 project bars (54.857 s)
  it('counts one lyric bar per two project bars', () => {
    const half = g(140, 4, 0, 'half')
    expect(projectBarsFor(half, 16)).toBe(32)
    expect(barRangeMs(half, 1, projectBarsFor(half, 16)).endMs).toBeCloseTo(54_857.143, 3)
    expect([1, 2, 3, 4, 5].map(b => lyricBarOf(half, b))).toEqual([1, 1, 2, 2, 3])
    expect(projectBarOfLyricBar(half, 3)).toBe(5)
    expect(positionAt(half, 27_428.572).lyricBar).toBe(9)
    expect(lyricBarOf(g(140), 5)).toBe(5)
  })
})

describe('tap tempo and helpers', () => {
  it('averages the taps and restarts after a pause', () => {
    expect(tapTempo([0, 500, 1000, 1500])).toBe(120)
    expect(tapTempo([0, 500, 5000, 5666.667, 6333.333])).toBeCloseTo(90, 1)
    expect(tapTempo([100])).toBeNull()
  })

  // W3C WebVTT timestamps: hh:mm:ss.ttt, hours optional below one hour
  it('formats clock times from the exact value', () => {
    expect(formatClock(barRangeMs(g(90), 1, 1).endMs)).toBe('00:02.667')
    expect(formatClock(128_000 / 3, true)).toBe('00:00:42.667')
    expect(formatClock(256_000, true)).toBe('00:04:16.000')
  })

  it('offers the half and double tempo', () => {
    expect(tempoOctaves(90)).toEqual([45, 180])
    expect(tempoOctaves(200)).toEqual([100])
  })
})

describe('lyric bar starts, exact and rounded once', () => {
  // Check values from DOMAIN.md §1 (arithmetic: bar n starts at offset + (n − 1) × beatsPerBar × 60 / BPM).
  it('puts bar 2 at 90 BPM exactly 8/3 s in', () => {
    const t = lyricBarStartExact(g(90), 2)
    expect(t.num * 3n).toBe(t.den * 8000n)
    expect(lyricBarStartMs(g(90), 2)).toBe(2667)
  })

  it('matches the 4/4 check values for 70, 140 and 160 BPM', () => {
    expect(lyricBarStartMs(g(70), 2)).toBe(3429) // 3.4286 s
    expect(lyricBarStartMs(g(140), 2)).toBe(1714) // 1.7143 s
    expect(lyricBarStartMs(g(140), 17)).toBe(27429) // 16 bars, 27.429 s
    expect(lyricBarStartMs(g(160), 2)).toBe(1500)
    expect(lyricBarStartMs(g(90), 17)).toBe(42667) // 16 bars, 42.667 s
  })

  it('adds the offset of bar 1 (0.5 s lead-in at 90 BPM: bar 5 at 11.1667 s) and counts meters in quarters', () => {
    expect(lyricBarStartMs(g(90, 4, 500), 5)).toBe(11167)
    expect(lyricBarStartMs(g(90, 4, 500), 1)).toBe(500)
    expect(lyricBarStartMs(g(90, 3), 2)).toBe(2000) // 3/4 at 90 → 2.000 s a bar
  })

  it('spans two project bars per lyric bar under a half-time feel (a 16 over 140 BPM covers 54.857 s)', () => {
    // DOMAIN.md §1: at half-time tempos a "16" over a 140 BPM beat covers 32 project bars [common practice, arithmetic].
    expect(lyricBarStartMs(g(140, 4, 0, 'half'), 17)).toBe(54857)
    expect(lyricBarStartMs(g(140, 4, 0, 'half'), 2)).toBe(lyricBarStartMs(g(140), 3))
  })

  it('rounds from the exact time, never sums rounded bar lengths', () => {
    // 999 bars of 8/3 s = 2664 s exactly; 999 × 2667 ms would drift by a third of a second.
    expect(lyricBarStartMs(g(90), 1000)).toBe(2_664_000)
    expect(999 * lyricBarStartMs(g(90), 2)).not.toBe(2_664_000)
  })

  it('divides a bar shared by several lines into equal parts', () => {
    expect(lyricBarStartMs(g(90), 3, 1, 2)).toBe(Math.round(2.5 * 8000 / 3))
    expect(lyricBarStartMs(g(90), 3, 2, 2)).toBe(lyricBarStartMs(g(90), 4))
  })

  it('stays within half a millisecond of the float formula and of barStartMs for any grid (property)', () => {
    fc.assert(fc.property(
      fc.integer({ min: 30_000, max: 300_000 }), fc.integer({ min: 1, max: 7 }), fc.integer({ min: 0, max: 10_000_000 }), fc.integer({ min: 1, max: 2000 }), fc.boolean(),
      (milliBpm, bpb, offsetMicros, bar, half) => {
        const grid = g(milliBpm / 1000, bpb, offsetMicros / 1000, half ? 'half' : 'normal')
        const float = grid.offsetMs + (bar - 1) * (half ? 2 : 1) * bpb * 60_000 / grid.bpm
        expect(Math.abs(lyricBarStartMs(grid, bar) - float)).toBeLessThanOrEqual(0.5 + 1e-6)
        expect(Math.abs(lyricBarStartMs(grid, bar) - barStartMs(grid, projectBarOfLyricBar(grid, bar)))).toBeLessThanOrEqual(0.5 + 1e-6)
      },
    ))
  })

  it('rounds halves away from zero and refuses fractional bars', () => {
    expect(roundMs({ num: 5n, den: 2n })).toBe(3)
    expect(roundMs({ num: -5n, den: 2n })).toBe(-3)
    expect(roundMs({ num: 7n, den: 3n })).toBe(2)
    expect(() => lyricBarStartExact(g(0), 1)).toThrow(RangeError)
    expect(() => lyricBarStartExact(g(90), 1.5)).toThrow(RangeError)
  })

  // W3C WebVTT §4: hh:mm:ss.ttt; check values from DOMAIN.md §6.
  it('writes WebVTT timestamps from the rounded exact time', () => {
    expect(formatClock(lyricBarStartMs(g(90), 2), true)).toBe('00:00:02.667') // 8/3 s
    expect(formatClock(lyricBarStartMs(g(90), 17), true)).toBe('00:00:42.667') // 128/3 s
    expect(formatClock(lyricBarStartMs(g(60), 65), true)).toBe('00:04:16.000') // 256 s
    expect(formatClock(3_600_000 + 61_001, true)).toBe('01:01:01.001')
  })

  it('writes a margin clock in whole seconds', () => {
    expect(formatMinutes(42_667)).toBe('0:42')
    expect(formatMinutes(256_000)).toBe('4:16')
  })
})

import { describe, expect, it } from 'vitest'
import { autoPlace, cadenceRow, cadenceTicks, moveSyllable, readCadence, slotCountOf, slotsPerBar, slotTimeMs, slotWeight, splitWordText, type CadenceSyllable } from '../../shared/utils/cadence'
import { PlacementSchema } from '../../shared/schemas/cadence'

const grid90 = { bpm: 90, beatsPerBar: 4, offsetMs: 0 }
const syl = (pattern: string): CadenceSyllable[] => [...pattern].map((s, i) => ({ text: `s${i}`, stress: Number(s) as 0 | 1 | 2 }))

describe('slot times', () => {
  // slot time = bar start + slot × (60 / BPM × beats per bar / slots per bar) — common practice.
  it('puts slot k of bar n at offset + ((n−1)·S + k) · 60/BPM · B / S, rounded once', () => {
    for (const bpm of [70, 85, 90, 93.5, 140, 160]) {
      for (const sub of ['8', '8t', '16', '16t'] as const) {
        const S = slotsPerBar(sub, 4)
        for (const [bar, slot] of [[1, 0], [1, 1], [5, 3], [12, S - 1], [64, 7]] as const) {
          const exact = 500 + ((bar - 1) * S + slot) * (60 / bpm) * 4 / S * 1000
          expect(slotTimeMs({ bpm, beatsPerBar: 4, offsetMs: 500 }, bar, slot, sub)).toBe(Math.round(exact))
        }
      }
    }
  })

  it('matches the DOMAIN check values at 90 BPM in 4/4', () => {
    // 90 BPM bar = 8/3 s; 16 bars = 42.667 s; with a 0.5 s lead-in bar 5 starts at 11.1667 s (arithmetic).
    expect(slotTimeMs(grid90, 2, 0, '16')).toBe(2667)
    expect(slotTimeMs(grid90, 17, 0, '16')).toBe(42667)
    expect(slotTimeMs({ ...grid90, offsetMs: 500 }, 5, 0, '16')).toBe(11167)
    // Beat 2 of bar 12 is at 30 s exactly: (11 × 4 + 1) × 2/3 s.
    expect(slotTimeMs(grid90, 12, 4, '16')).toBe(30000)
  })

  it('doubles every slot under a half-time feel (one lyric bar = two project bars)', () => {
    const half = { bpm: 140, beatsPerBar: 4, offsetMs: 0, feel: 'half' as const }
    // A 16-bar verse at 140 BPM half-time covers 32 project bars = 54.857 s (DOMAIN §1).
    expect(slotTimeMs(half, 17, 0, '16')).toBe(54857)
    expect(slotTimeMs(half, 1, 4, '16')).toBe(Math.round(60 / 140 * 2 * 1000))
  })
})

describe('automatic placement', () => {
  it('puts the four primary stresses of a 4-syllable, 4-stress line on the four beats', () => {
    expect(autoPlace(syl('1111'), { sub: '16', beatsPerBar: 4 })).toEqual([0, 4, 8, 12])
  })

  it('keeps syllable order and uses each slot at most once', () => {
    for (const pattern of ['1010101010', '0101', '1', '100100100100', '1201010201', '0000000000000000']) {
      const slots = autoPlace(syl(pattern), { sub: '16', beatsPerBar: 4 })
      expect(slots).toHaveLength(pattern.length)
      for (let i = 1; i < slots.length; i++) expect(slots[i]!).toBeGreaterThan(slots[i - 1]!)
      expect(new Set(slots).size).toBe(slots.length)
      expect(Math.max(...slots)).toBeLessThan(16)
    }
  })

  it('favours strong slots for stresses: beats, then off-beats', () => {
    const slots = autoPlace(syl('01010101'), { sub: '16', beatsPerBar: 4 })
    const stressed = slots.filter((_, i) => i % 2 === 1)
    for (const s of stressed) expect(slotWeight(s % 16, '16')).toBeGreaterThanOrEqual(2)
  })

  it('marks syllables beyond the slots with -1 and reads the bar as not fitting', () => {
    const many = syl('10'.repeat(9))
    const slots = autoPlace(many, { sub: '16', beatsPerBar: 4 })
    expect(slots.filter(s => s === -1)).toHaveLength(2)
    const reading = readCadence(many, { sub: '16', slots }, { sub: '16', beatsPerBar: 4 }, grid90)
    expect(reading.fits).toBe(false)
    expect(reading.reason).toMatch(/18 syllables for 16 slots/)
  })

  it('spreads a two-bar line over both bars', () => {
    const slots = autoPlace(syl('1111'), { sub: '16', beatsPerBar: 4, bars: 2 })
    expect(slotCountOf({ sub: '16', beatsPerBar: 4, bars: 2 })).toBe(32)
    expect(slots[3]!).toBeGreaterThanOrEqual(16)
  })
})

describe('editing and reading', () => {
  it('moves a syllable and pushes the ones in its way without reordering', () => {
    const moved = moveSyllable({ sub: '16', slots: [0, 4, 8, 12] }, 1, 9, 16)
    expect(moved.slots).toEqual([0, 9, 10, 12])
    const back = moveSyllable(moved, 3, 0, 16)
    expect(back.slots).toEqual([0, 1, 2, 3])
    expect(moveSyllable({ sub: '16', slots: [0, 1] }, 1, 99, 16).slots).toEqual([0, 15])
  })

  it('reads rate, stresses on beats and the longest run without a rest', () => {
    const s = syl('1010')
    const reading = readCadence(s, { sub: '16', slots: [0, 1, 2, 8] }, { sub: '16', beatsPerBar: 4 }, grid90)
    // 4 syllables in one 90 BPM bar of 8/3 s = 1.5 syllables per second (arithmetic).
    expect(reading.syllablesPerSecond).toBeCloseTo(1.5, 10)
    expect(reading.stressOnBeats).toBe(0.5)
    expect(reading.longestRun).toBe(3)
    const held = readCadence(s, { sub: '16', slots: [0, 2, 4, 6], holds: [1, 1, 1, 0] }, { sub: '16', beatsPerBar: 4 }, grid90)
    expect(held.longestRun).toBe(4)
    const breath = readCadence(s, { sub: '16', slots: [0, 2, 4, 6], holds: [1, 1, 1, 0], breaths: [3] }, { sub: '16', beatsPerBar: 4 }, grid90)
    expect(breath.longestRun).toBe(2)
  })
})

describe('ticks, print rows and stored placements', () => {
  it('ticks each placed syllable at bar start + slot × slot length, in song order', () => {
    const grid = { bpm: 90, beatsPerBar: 4, offsetMs: 700 }
    const ticks = cadenceTicks(grid, [
      { id: 'b', bar: 6, syllables: syl('10'), placement: { sub: '16', slots: [0, 6] } },
      { id: 'a', bar: 5, syllables: syl('110'), placement: { sub: '8t', slots: [0, 3, -1] } },
    ])
    // 90 BPM: a bar is 8/3 s, a 16th 1/6 s, a triplet 8th 2/9 s (arithmetic, common practice).
    expect(ticks.map(t => [t.lineId, t.index, t.slotMs])).toEqual([
      ['a', 0, Math.round(700 + 4 * 8000 / 3)],
      ['a', 1, Math.round(700 + 4 * 8000 / 3 + 3 * 2000 / 9)],
      ['b', 0, Math.round(700 + 5 * 8000 / 3)],
      ['b', 1, Math.round(700 + 5 * 8000 / 3 + 6 * 1000 / 6)],
    ])
    expect(ticks[0]!.stress).toBe(1)
  })

  it('prints a placement as one character per slot, beats apart', () => {
    const row = cadenceRow(syl('100'), { sub: '16', slots: [0, 2, 8], holds: [1, 0, 3], breaths: [14] }, { sub: '16', beatsPerBar: 4 })
    expect(row).toBe('X-x.|....|x---|..v.')
    expect(cadenceRow(syl('11'), { sub: '8t', slots: [0, 4] }, { sub: '8t', beatsPerBar: 4 })).toBe('X..|.X.|...|...')
  })

  it('cuts a written word into as many pieces as it has syllables', () => {
    expect(splitWordText('window', 2)).toEqual(['win', 'dow'])
    expect(splitWordText('bus', 1)).toEqual(['bus'])
    expect(splitWordText('every', 3).join('')).toBe('every')
    expect(splitWordText('808', 3)).toHaveLength(3)
  })

  it('accepts stored placements in order only', () => {
    expect(PlacementSchema.safeParse({ sub: '16', slots: [0, 4, -1] }).success).toBe(true)
    expect(PlacementSchema.safeParse({ sub: '16', slots: [4, 4] }).success).toBe(false)
    expect(PlacementSchema.safeParse({ sub: '12', slots: [0] }).success).toBe(false)
  })
})

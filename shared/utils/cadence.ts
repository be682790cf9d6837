/**
 * The cadence of a line: where each of its syllables lands on the slots of its bars.
 *
 * A bar is cut into equal slots (16ths by default; 8ths, triplet 8ths, 16th triplets). Slot
 * times come from the grid: slot k of bar n starts at
 *   offset + ((n − 1) × slotsPerBar + k) × (60 / BPM × beatsPerBar / slotsPerBar)
 * (common practice), computed exactly and rounded to the millisecond only at the end, so
 * no rounding error builds up along a song. Under a half-time feel a lyric bar spans two
 * project bars, so every slot lasts twice as long.
 */

export type Subdivision = '8' | '8t' | '16' | '16t'

export const SUBDIVISIONS: Record<Subdivision, { perBeat: number, label: string }> = {
  '8': { perBeat: 2, label: '8ths' },
  '8t': { perBeat: 3, label: 'triplet 8ths' },
  '16': { perBeat: 4, label: '16ths' },
  '16t': { perBeat: 6, label: '16th triplets' },
}

export const DEFAULT_SUBDIVISION: Subdivision = '16'

export interface CadenceGrid {
  bpm: number
  beatsPerBar: number
  offsetMs: number
  feel?: 'normal' | 'half'
}

export function slotsPerBar(sub: Subdivision, beatsPerBar: number): number {
  return SUBDIVISIONS[sub].perBeat * beatsPerBar
}

/** BPM as an exact fraction: a decimal BPM has at most 3 decimals in Barsmith. */
function bpmFraction(bpm: number): { num: bigint, den: bigint } {
  return { num: BigInt(Math.round(bpm * 1000)), den: 1000n }
}

function divRound(num: bigint, den: bigint): bigint {
  const q = num / den
  const r = num % den
  return 2n * r >= den ? q + 1n : q
}

/**
 * Start of slot `slot` of lyric bar `bar` (1-based), in milliseconds, rounded once from the
 * exact value. The offset itself may carry fractions of a millisecond.
 */
export function slotTimeMs(grid: CadenceGrid, bar: number, slot: number, sub: Subdivision): number {
  const perBar = slotsPerBar(sub, grid.beatsPerBar)
  const feel = grid.feel === 'half' ? 2n : 1n
  const n = BigInt((bar - 1) * perBar + slot)
  const { num, den } = bpmFraction(grid.bpm)
  // ms = offset + n × 60000 × beatsPerBar × feel / (BPM × perBar), with the offset in µs.
  const offsetMicros = BigInt(Math.round(grid.offsetMs * 1000))
  const micros = offsetMicros * num * BigInt(perBar) + n * 60_000_000n * BigInt(grid.beatsPerBar) * feel * den
  return Number(divRound(micros, num * BigInt(perBar) * 1000n))
}

/** The length of one slot in seconds (not rounded). */
export function slotSeconds(grid: CadenceGrid, sub: Subdivision): number {
  return (60 / grid.bpm) * grid.beatsPerBar * (grid.feel === 'half' ? 2 : 1) / slotsPerBar(sub, grid.beatsPerBar)
}

/**
 * The metrical weight of a slot (higher is stronger): the downbeat, then the other beats,
 * then the half-beat off-beats, then the rest. A common-practice reading of the metrical
 * hierarchy of a 4/4 bar; rap analyses place most stressed syllables on beats and on the
 * 8th-note off-beats (Adams, "On the Metrical Techniques of Flow in Rap Music", Music Theory
 * Online 15(5), 2009 — from memory).
 */
export function slotWeight(slot: number, sub: Subdivision): number {
  const perBeat = SUBDIVISIONS[sub].perBeat
  if (slot === 0) return 4
  if (slot % perBeat === 0) return 3
  if (perBeat % 2 === 0 && slot % (perBeat / 2) === 0) return 2
  return 1
}

export type Stress = 0 | 1 | 2

export interface CadenceSyllable {
  text: string
  stress: Stress
}

/** Score weights of the automatic placement (documented so a writer can predict it). */
export const PLACEMENT_WEIGHTS = {
  /** Reward for a primary stress, times the slot's metrical weight. */
  primary: 3,
  /** Reward for a secondary stress, times the slot's metrical weight. */
  secondary: 1,
  /** Penalty for an unstressed syllable on a beat (it steals the beat from a stress). */
  unstressedOnBeat: 1,
  /** Penalty per slot of distance from an even spread of the syllables over the bar. */
  spread: 0.6,
} as const

export interface SlotFrame {
  sub: Subdivision
  beatsPerBar: number
  /** How many bars the line holds (its slots run on across them). */
  bars?: number
}

export function slotCountOf(frame: SlotFrame): number {
  return slotsPerBar(frame.sub, frame.beatsPerBar) * (frame.bars ?? 1)
}

/**
 * The automatic placement: every syllable gets one slot, in order, each slot used at most once,
 * choosing the positions that maximise the stress-on-strong-slot reward minus the spread
 * penalty (dynamic programming over syllable × slot). Syllables beyond the slot count get -1.
 */
export function autoPlace(syllables: readonly CadenceSyllable[], frame: SlotFrame): number[] {
  const n = syllables.length
  const slotCount = slotCountOf(frame)
  const perBar = slotsPerBar(frame.sub, frame.beatsPerBar)
  if (n === 0) return []
  const fit = Math.min(n, slotCount)
  const score = (i: number, p: number) => {
    const s = syllables[i]!.stress
    const w = slotWeight(p % perBar, frame.sub)
    const ideal = (i * slotCount) / fit
    let v = -PLACEMENT_WEIGHTS.spread * Math.abs(p - ideal)
    if (s === 1) v += PLACEMENT_WEIGHTS.primary * w
    else if (s === 2) v += PLACEMENT_WEIGHTS.secondary * w
    else if (w >= 3) v -= PLACEMENT_WEIGHTS.unstressedOnBeat
    return v
  }
  // best[i][p]: the best total for syllables 0..i with syllable i on slot p.
  const best: number[][] = Array.from({ length: fit }, () => Array.from({ length: slotCount }, () => Number.NEGATIVE_INFINITY))
  const from: number[][] = Array.from({ length: fit }, () => Array.from({ length: slotCount }, () => -1))
  for (let p = 0; p <= slotCount - fit; p++) best[0]![p] = score(0, p)
  for (let i = 1; i < fit; i++) {
    let runBest = Number.NEGATIVE_INFINITY
    let runArg = -1
    for (let p = i; p <= slotCount - fit + i; p++) {
      if (best[i - 1]![p - 1]! > runBest) {
        runBest = best[i - 1]![p - 1]!
        runArg = p - 1
      }
      best[i]![p] = runBest + score(i, p)
      from[i]![p] = runArg
    }
  }
  let p = 0
  for (let q = 0; q < slotCount; q++) if (best[fit - 1]![q]! > best[fit - 1]![p]!) p = q
  const slots = Array.from({ length: n }, () => -1)
  for (let i = fit - 1; i >= 0; i--) {
    slots[i] = p
    p = from[i]![p]!
  }
  return slots
}

/** A stored placement: the slot of each syllable, extra slots each one is held, rests, breaths. */
export interface Placement {
  sub: Subdivision
  slots: number[]
  holds?: number[]
  breaths?: number[]
}

/**
 * Moves syllable `index` to `toSlot`, keeping the order: syllables in the way are pushed
 * along by one slot each (they never swap). Returns a new placement; an impossible move
 * (not enough room) leaves it as it was.
 */
export function moveSyllable(placement: Placement, index: number, toSlot: number, slotCount: number): Placement {
  const slots = [...placement.slots]
  if (index < 0 || index >= slots.length || slots[index]! < 0) return placement
  const placed = slots.filter(s => s >= 0).length
  const before = index
  const after = placed - index - 1
  const target = Math.max(before, Math.min(slotCount - 1 - after, toSlot))
  slots[index] = target
  for (let i = index - 1; i >= 0; i--) slots[i] = Math.min(slots[i]!, slots[i + 1]! - 1)
  for (let i = index + 1; i < placed; i++) slots[i] = Math.max(slots[i]!, slots[i - 1]! + 1)
  const holds = placement.holds?.map((h, i) => Math.max(0, Math.min(h, (slots[i + 1] ?? slotCount) - slots[i]! - 1)))
  return { ...placement, slots, ...(holds ? { holds } : {}) }
}

export interface CadenceReading {
  syllables: number
  slots: number
  fits: boolean
  /** Why it does not fit, in words a writer can act on. */
  reason?: string
  syllablesPerSecond: number
  /** Share of primary-stressed syllables that sit on a beat (0..1), null without stresses. */
  stressOnBeats: number | null
  /** The most syllables in a row with no rest (an empty or breath slot) between them. */
  longestRun: number
}

/** Which slots sound: a syllable starts or is held there, and no breath is marked there. */
export function soundingSlots(placement: Placement, slotCount: number): boolean[] {
  const sounding = Array.from({ length: slotCount }, () => false)
  placement.slots.forEach((s, i) => {
    if (s < 0) return
    for (let k = 0; k <= (placement.holds?.[i] ?? 0) && s + k < slotCount; k++) sounding[s + k] = true
  })
  for (const b of placement.breaths ?? []) if (b >= 0 && b < slotCount) sounding[b] = false
  return sounding
}

/** Figures for one line's placement: rate, stresses on beats, longest run without a rest. */
export function readCadence(syllables: readonly CadenceSyllable[], placement: Placement, frame: SlotFrame, grid: CadenceGrid): CadenceReading {
  const slotCount = slotCountOf(frame)
  const perBeat = SUBDIVISIONS[placement.sub].perBeat
  const fits = syllables.length <= slotCount
  const seconds = slotSeconds(grid, placement.sub) * slotCount
  const primaries = placement.slots.filter((s, i) => s >= 0 && syllables[i]?.stress === 1)
  const onBeat = primaries.filter(s => s % perBeat === 0).length
  const sounding = soundingSlots(placement, slotCount)
  const starts = new Set(placement.slots.filter(s => s >= 0))
  let longestRun = 0
  let run = 0
  for (let slot = 0; slot < slotCount; slot++) {
    if (!sounding[slot]) {
      run = 0
      continue
    }
    if (starts.has(slot)) run++
    longestRun = Math.max(longestRun, run)
  }
  return {
    syllables: syllables.length,
    slots: slotCount,
    fits,
    ...(fits ? {} : { reason: `${syllables.length} syllables for ${slotCount} slots of ${SUBDIVISIONS[placement.sub].label}: pick a finer subdivision or move words to the next bar.` }),
    syllablesPerSecond: syllables.length / seconds,
    stressOnBeats: primaries.length ? onBeat / primaries.length : null,
    longestRun,
  }
}

/**
 * Cuts a written word into `n` pieces for display on the grid, one per sung syllable: before
 * the consonant that opens each later vowel group when the groups match the count, else in
 * even slices. Display only; the count and stresses come from the pronunciation.
 */
export function splitWordText(text: string, n: number): string[] {
  if (n <= 1) return [text]
  const groups: number[] = []
  const vowel = /[aeiouy]/i
  for (let i = 0; i < text.length; i++) if (vowel.test(text[i]!) && (i === 0 || !vowel.test(text[i - 1]!))) groups.push(i)
  let cuts: number[]
  if (groups.length === n) cuts = groups.slice(1).map(g => (g > 0 && !vowel.test(text[g - 1]!) && g - 1 > groups[0]! ? g - 1 : g))
  else cuts = Array.from({ length: n - 1 }, (_, k) => Math.round(((k + 1) * text.length) / n))
  const out: string[] = []
  let from = 0
  for (const c of [...cuts, text.length]) {
    out.push(text.slice(from, Math.max(from, c)))
    from = Math.max(from, c)
  }
  return out.map(s => s || '·')
}

export interface CadenceTick {
  lineId: string
  /** The syllable's index in its line. */
  index: number
  stress: Stress
  /** Song time of the syllable's slot, whole ms (slotTimeMs). */
  slotMs: number
}

/**
 * The ticks of some lines' placements in song order: one per placed syllable, at
 * bar start + slot × slot length (slotTimeMs); syllables off the grid (-1) stay silent.
 */
export function cadenceTicks(grid: CadenceGrid, lines: ReadonlyArray<{ id: string, bar: number, syllables: readonly CadenceSyllable[], placement: Placement }>): CadenceTick[] {
  const ticks: CadenceTick[] = []
  for (const line of lines) {
    line.placement.slots.forEach((slot, index) => {
      if (slot < 0) return
      ticks.push({ lineId: line.id, index, stress: line.syllables[index]?.stress ?? 0, slotMs: slotTimeMs(grid, line.bar, slot, line.placement.sub) })
    })
  }
  return ticks.sort((a, b) => a.slotMs - b.slotMs)
}

/**
 * A compact text row of one placement for print: `X` a primary-stressed syllable, `x` any
 * other, `-` held, `v` a breath, `.` a rest, `|` between beats.
 */
export function cadenceRow(syllables: readonly CadenceSyllable[], placement: Placement, frame: SlotFrame): string {
  const slotCount = slotCountOf(frame)
  const perBeat = SUBDIVISIONS[placement.sub].perBeat
  const cells = Array.from({ length: slotCount }, () => '.')
  placement.slots.forEach((s, i) => {
    if (s < 0 || s >= slotCount) return
    cells[s] = syllables[i]?.stress === 1 ? 'X' : 'x'
    for (let k = 1; k <= (placement.holds?.[i] ?? 0) && s + k < slotCount; k++) cells[s + k] = '-'
  })
  for (const b of placement.breaths ?? []) if (b >= 0 && b < slotCount && cells[b] === '.') cells[b] = 'v'
  const beats: string[] = []
  for (let i = 0; i < slotCount; i += perBeat) beats.push(cells.slice(i, i + perBeat).join(''))
  return beats.join('|')
}

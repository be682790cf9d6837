import { filtfilt } from './filters'
import { KICK_BAND, type OnsetEnvelopes } from './onsets'
import { at } from './tempo'

export interface GridFit {
  /** Beats per minute from the fitted beat times. */
  bpm: number
  /** Where bar 1 starts, in ms from the first decoded sample. */
  offsetMs: number
  /** Onsets that agreed with the fitted grid (0–1). */
  agreement: number
}

interface Line { slope: number, intercept: number, rms: number }

function fitLine(xs: number[], ys: number[]): Line {
  const n = xs.length
  let sx = 0
  let sy = 0
  for (let i = 0; i < n; i++) {
    sx += xs[i]!
    sy += ys[i]!
  }
  const mx = sx / n
  const my = sy / n
  let sxx = 0
  let sxy = 0
  for (let i = 0; i < n; i++) {
    sxx += (xs[i]! - mx) ** 2
    sxy += (xs[i]! - mx) * (ys[i]! - my)
  }
  const slope = sxx ? sxy / sxx : 0
  const intercept = my - slope * mx
  let se = 0
  for (let i = 0; i < n; i++) se += (ys[i]! - (intercept + slope * xs[i]!)) ** 2
  return { slope, intercept, rms: Math.sqrt(se / n) }
}

/** Least squares, then again without the points more than three median deviations off. */
function robustLine(xs: number[], ys: number[]): Line {
  const first = fitLine(xs, ys)
  const res = xs.map((x, i) => Math.abs(ys[i]! - (first.intercept + first.slope * x)))
  const sorted = [...res].sort((a, b) => a - b)
  const mad = sorted[Math.floor(sorted.length / 2)]! || 1e-9
  const keep = res.map(r => r <= 3 * mad + 1e-9)
  const kx = xs.filter((_, i) => keep[i])
  const ky = ys.filter((_, i) => keep[i])
  return kx.length >= 3 ? fitLine(kx, ky) : first
}

function median(values: number[]): number {
  if (!values.length) return 0
  const s = [...values].sort((a, b) => a - b)
  return s[Math.floor(s.length / 2)]!
}

function maxNear(x: Float32Array, pos: number, radius: number): { value: number, index: number } {
  let value = 0
  let index = Math.round(pos)
  for (let i = Math.max(0, Math.floor(pos - radius)); i <= Math.min(x.length - 1, Math.ceil(pos + radius)); i++) {
    if (x[i]! > value) {
      value = x[i]!
      index = i
    }
  }
  return { value, index }
}

const ATTACK_LEVEL = 0.3

function rms(x: Float32Array, from: number, to: number): number {
  let s = 0
  let n = 0
  for (let i = Math.max(0, from); i < Math.min(x.length, to); i++) {
    s += x[i]! * x[i]!
    n++
  }
  return n ? Math.sqrt(s / n) : 0
}

/**
 * The sample where a low-frequency hit near `around` starts: the kick band filtered without
 * delay (forward and backward), then the first sample within ±radius whose level reaches
 * ATTACK_LEVEL of the loudest one there.
 */
export function kickAttack(mono: Float32Array, sampleRate: number, around: number, radius: number): number | null {
  const pad = Math.round(sampleRate * 0.06)
  const from = Math.max(0, Math.round(around - radius - pad))
  const to = Math.min(mono.length, Math.round(around + radius + pad))
  if (to - from < pad) return null
  const seg = filtfilt(mono.subarray(from, to), KICK_BAND(sampleRate))
  const lo = Math.max(0, Math.round(around - radius) - from)
  const hi = Math.min(seg.length - 1, Math.round(around + radius) - from)
  let peak = 0
  for (let i = lo; i <= hi; i++) peak = Math.max(peak, Math.abs(seg[i]!))
  if (peak <= 0) return null
  const ms10 = Math.round(sampleRate / 100)
  for (let i = lo; i <= hi; i++) {
    if (Math.abs(seg[i]!) < ATTACK_LEVEL * peak) continue
    // A hit starts from something quieter; a level already there is an earlier hit's tail.
    const before = rms(seg, i - ms10, i)
    const after = rms(seg, i, i + ms10)
    return after >= 2 * before ? from + i : null
  }
  return null
}

/**
 * Lays the beat grid on the audio and finds bar 1. Beats come from the onset envelope at
 * the estimated period (best phase, then a line through the onsets found near each beat);
 * bar 1 is the first strong low-frequency onset on a beat of the bar position where kicks
 * outweigh snares; kick attacks are then located to the sample and the grid fitted to them.
 */
export function fitGrid(env: OnsetEnvelopes, mono: Float32Array, sampleRate: number, period: number, beatsPerBar: number): GridFit {
  const { all, low, hop } = env
  const frames = all.length
  // Phase: the comb through the onset envelope at the period that collects the most.
  let phase = 0
  let best = -Infinity
  for (let p = 0; p < period; p += 0.25) {
    let s = 0
    for (let t = p; t < frames; t += period) s += at(all, t)
    if (s > best) {
      best = s
      phase = p
    }
  }
  let line: Line = { slope: period, intercept: phase, rms: 0 }
  let agreement = 0
  for (const window of [0.15, 0.08]) {
    const xs: number[] = []
    const ys: number[] = []
    const strengths: number[] = []
    const count = Math.floor((frames - line.intercept) / line.slope)
    for (let i = 0; i <= count; i++) {
      const p = line.intercept + i * line.slope
      const m = maxNear(all, p, line.slope * window)
      strengths.push(m.value)
      xs.push(i)
      ys.push(m.index)
    }
    const floor = 0.3 * median(strengths.filter(v => v > 0))
    const kx = xs.filter((_, i) => strengths[i]! > floor)
    const ky = ys.filter((_, i) => strengths[i]! > floor)
    agreement = kx.length / (xs.length || 1)
    if (kx.length >= 4) line = robustLine(kx, ky)
  }

  // Which beats of the bar carry the kicks: mean low-band strength per position.
  const beats: Array<{ index: number, frame: number, kick: number }> = []
  // A beat a few frames before the first one (rounding) still counts: audio may start on bar 1.
  const firstIndex = Math.ceil((-line.intercept - 3) / line.slope)
  for (let i = firstIndex; line.intercept + i * line.slope < frames; i++) {
    const f = line.intercept + i * line.slope
    beats.push({ index: i, frame: Math.max(0, f), kick: maxNear(low, Math.max(0, f), 2).value })
  }
  const kickSum = new Array<number>(beatsPerBar).fill(0)
  const counts = new Array<number>(beatsPerBar).fill(0)
  const posOf = (index: number) => ((index % beatsPerBar) + beatsPerBar) % beatsPerBar
  for (const b of beats) {
    kickSum[posOf(b.index)]! += b.kick
    counts[posOf(b.index)]!++
  }
  const meanKick = kickSum.map((k, i) => (counts[i] ? k / counts[i]! : 0))
  const topKick = Math.max(...meanKick)
  // Positions that carry kicks (beats 1 and 3 of a backbeat, every beat of four-on-the-floor);
  // bar 1 is the first of them with a strong low-frequency hit.
  const kickPositions = new Set(meanKick.map((k, i) => (k >= 0.7 * topKick ? i : -1)).filter(i => i >= 0))
  const onKickBeats = beats.filter(b => kickPositions.has(posOf(b.index)))
  const strong = 0.5 * median(onKickBeats.map(b => b.kick).filter(v => v > 0))
  const bar1 = onKickBeats.find(b => b.kick >= strong && b.kick > 0) ?? beats[0]

  // Kick attacks to the sample, on every strong kick of the same positions; fit the grid to them.
  const sampleLine = { slope: line.slope * hop, intercept: line.intercept * hop }
  const xs: number[] = []
  const ys: number[] = []
  for (const b of onKickBeats) {
    if (b.kick < strong || b.index < (bar1?.index ?? 0)) continue
    const around = sampleLine.intercept + b.index * sampleLine.slope
    const attack = kickAttack(mono, sampleRate, around, Math.min(sampleLine.slope * 0.12, sampleRate * 0.04))
    if (attack !== null) {
      xs.push(b.index)
      ys.push(attack)
    }
  }
  let fitted: Line = { slope: sampleLine.slope, intercept: sampleLine.intercept, rms: 0 }
  if (xs.length >= 4) fitted = robustLine(xs, ys)
  else if (xs.length) fitted = { ...fitted, intercept: ys[0]! - xs[0]! * fitted.slope }

  // Producers set whole or half BPM; take the rounder tempo when the fit is as good (within 1 ms).
  let bpm = (60 * sampleRate) / fitted.slope
  const round = Math.round(bpm * 2) / 2
  if (xs.length >= 4 && Math.abs(round - bpm) < 0.06) {
    const slope = (60 * sampleRate) / round
    const intercept = ys.reduce((s, y, i) => s + (y - xs[i]! * slope), 0) / ys.length
    const rms = Math.sqrt(ys.reduce((s, y, i) => s + (y - (intercept + xs[i]! * slope)) ** 2, 0) / ys.length)
    if (rms <= fitted.rms + sampleRate * 0.001) {
      fitted = { slope, intercept, rms }
      bpm = round
    }
  }
  const offsetSamples = fitted.intercept + (bar1?.index ?? 0) * fitted.slope
  return {
    bpm,
    offsetMs: Math.max(0, (offsetSamples * 1000) / sampleRate),
    agreement: Math.round(agreement * 100) / 100,
  }
}

import type { OnsetEnvelopes } from './onsets'

/** The tempo range a beat is looked for in (quarter notes per minute). */
export const TEMPO_RANGE = { min: 50, max: 220 }

export interface TempoEstimate {
  bpm: number
  /** 0–1: how periodic the onsets are at this tempo and how clearly it beat its half and double. */
  confidence: number
  /** Half and double the estimate (within 30–300 BPM), for the producer to pick. */
  alternatives: number[]
  /** Beat period in onset frames (fractional). */
  period: number
}

function centred(x: Float32Array): Float32Array {
  let mean = 0
  for (let i = 0; i < x.length; i++) mean += x[i]!
  mean /= x.length || 1
  const out = new Float32Array(x.length)
  for (let i = 0; i < x.length; i++) out[i] = x[i]! - mean
  return out
}

/** Normalised cross-correlation of a and b for lags 0…maxLag (b shifted later than a). */
export function correlation(a: Float32Array, b: Float32Array, maxLag: number): Float64Array {
  const n = Math.min(a.length, b.length)
  const out = new Float64Array(maxLag + 1)
  let ea = 0
  let eb = 0
  for (let i = 0; i < n; i++) {
    ea += a[i]! * a[i]!
    eb += b[i]! * b[i]!
  }
  const norm = Math.sqrt(ea * eb) || 1
  for (let lag = 0; lag <= maxLag && lag < n; lag++) {
    let s = 0
    for (let i = 0; i + lag < n; i++) s += a[i]! * b[i + lag]!
    // Unbiased: later lags overlap less.
    out[lag] = (s / norm) * (n / (n - lag))
  }
  return out
}

/** Linear interpolation into an array at a fractional index (0 outside). */
export function at(x: ArrayLike<number>, pos: number): number {
  const i = Math.floor(pos)
  if (i < 0 || i + 1 >= x.length) return i >= 0 && i < x.length ? x[i]! : 0
  const f = pos - i
  return x[i]! * (1 - f) + x[i + 1]! * f
}

/** The highest point near `pos` (±radius), refined by a parabola through its neighbours. */
function peakNear(x: ArrayLike<number>, pos: number, radius: number): number {
  let best = Math.round(pos)
  for (let i = Math.max(1, Math.floor(pos - radius)); i <= Math.min(x.length - 2, Math.ceil(pos + radius)); i++) {
    if (x[i]! > x[best]!) best = i
  }
  if (best < 1 || best >= x.length - 1) return best
  const l = x[best - 1]!
  const c = x[best]!
  const r = x[best + 1]!
  const d = l - 2 * c + r
  return d < 0 ? best + (0.5 * (l - r)) / d : best
}

/** The best phase (in frames) of a comb of teeth `period` apart through `x`. */
export function bestPhase(x: Float32Array, period: number): number {
  let phase = 0
  let best = -Infinity
  for (let p = 0; p < period; p += 0.5) {
    let s = 0
    for (let t = p; t < x.length; t += period) s += at(x, t)
    if (s > best) {
      best = s
      phase = p
    }
  }
  return phase
}

function maxAround(x: Float32Array, pos: number, radius: number): number {
  let m = 0
  for (let i = Math.max(0, Math.floor(pos - radius)); i <= Math.min(x.length - 1, Math.ceil(pos + radius)); i++) m = Math.max(m, x[i]!)
  return m
}

/**
 * How strongly the beats at this period alternate between low-band and mid-band hits
 * (kick, snare, kick, snare — the backbeat): minus the lag-1 autocorrelation of
 * (kick − snare) sampled on each beat. Near 1 for a backbeat on these beats; near 0 on
 * eighth notes (kick, hat, snare, hat) or on every other beat (kick, kick).
 */
export function backbeatAlternation(env: OnsetEnvelopes, period: number): number {
  const phase = bestPhase(env.all, period)
  const xs: number[] = []
  for (let t = phase; t < env.all.length; t += period) xs.push(maxAround(env.low, t, 2) - maxAround(env.mid, t, 2))
  if (xs.length < 4) return 0
  const mean = xs.reduce((a, b) => a + b, 0) / xs.length
  let num = 0
  let den = 0
  // Normalised by the raw power, so beats that are all alike (no alternation) score near 0.
  for (let i = 0; i < xs.length; i++) {
    den += xs[i]! * xs[i]!
    if (i + 1 < xs.length) num += (xs[i]! - mean) * (xs[i + 1]! - mean)
  }
  return den > 0 ? -num / den : 0
}

/**
 * Tempo from onset envelopes: periodicity (autocorrelation with harmonics, Scheirer 1998 /
 * Percival & Tzanetakis 2014 style), then the octave: among half, same and double, the
 * period whose beats alternate kick and snare (the backbeat), with a mild preference for
 * the middle of the hip-hop range when nothing alternates.
 */
export function estimateTempo(env: OnsetEnvelopes): TempoEstimate {
  const { rate } = env
  const minLag = (60 * rate) / TEMPO_RANGE.max
  const maxLag = (60 * rate) / TEMPO_RANGE.min
  const all = centred(env.all)
  const longest = Math.min(all.length - 1, Math.ceil(maxLag * 4) + 2)
  if (longest < maxLag) throw new Error('too short')
  const acf = correlation(all, all, longest)

  // Periodicity with harmonics: a true beat period repeats at 2, 3 and 4 periods too.
  const score = (lag: number) => {
    let s = 0
    for (let m = 1; m <= 4; m++) if (lag * m < acf.length - 1) s += at(acf, lag * m) / Math.sqrt(m)
    return s
  }
  let bestLag = minLag
  let bestScore = -Infinity
  for (let lag = minLag; lag <= maxLag; lag += 0.25) {
    const s = score(lag)
    if (s > bestScore) {
      bestScore = s
      bestLag = lag
    }
  }
  bestLag = peakNear(acf, bestLag, 2)

  const candidates = [bestLag / 2, bestLag, bestLag * 2].filter(l => l >= minLag * 0.98 && l <= maxLag * 1.02)
  const judged = candidates.map((lag) => {
    const refined = peakNear(acf, lag, Math.max(1, lag * 0.03))
    const periodic = score(refined) / (bestScore || 1)
    const alternation = backbeatAlternation(env, refined)
    const bpm = (60 * rate) / refined
    const prior = Math.exp(-0.5 * (Math.log2(bpm / 100) / 0.8) ** 2)
    return { lag: refined, total: 0.5 * periodic + alternation + 0.2 * prior }
  }).sort((a, b) => b.total - a.total)

  const chosen = judged[0]!
  const second = judged[1]
  const clarity = Math.max(0, Math.min(1, at(acf, chosen.lag)))
  const margin = second ? Math.max(0, Math.min(1, (chosen.total - second.total) / (Math.abs(chosen.total) + 1e-9))) : 1
  const bpm = (60 * rate) / chosen.lag
  return {
    bpm,
    period: chosen.lag,
    confidence: Math.round(Math.sqrt(clarity) * (0.5 + 0.5 * margin) * 100) / 100,
    alternatives: [bpm / 2, bpm * 2].filter(b => b >= 30 && b <= 300),
  }
}

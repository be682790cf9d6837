import { FilterChain, highpass, lowpass, type Biquad } from './filters'

/** Frames per second of the onset envelopes (a 5 ms hop). */
export const ONSET_RATE = 200

/** Band limits: the kick's body, the snare's crack and body, the hats' sizzle. */
export const KICK_BAND = (sr: number): Biquad[] => [lowpass(120, sr), lowpass(120, sr)]
const SNARE_BAND = (sr: number): Biquad[] => [highpass(400, sr), highpass(400, sr), lowpass(5000, sr)]
const HAT_BAND = (sr: number): Biquad[] => [highpass(6000, sr), highpass(6000, sr)]

export interface OnsetEnvelopes {
  /** Samples per frame. */
  hop: number
  /** Frames per second (sampleRate / hop). */
  rate: number
  low: Float32Array
  mid: Float32Array
  high: Float32Array
  /** The three bands normalised and summed: the envelope used for periodicity. */
  all: Float32Array
}

function compressedFlux(energy: Float64Array): Float32Array {
  let mean = 0
  for (let i = 0; i < energy.length; i++) mean += energy[i]!
  mean /= energy.length || 1
  const out = new Float32Array(energy.length)
  if (mean <= 0) return out
  // log(1 + E/mean): loud hits stay louder than quiet ones (a plain log would make a soft
  // hat after silence rise as far as a snare), yet a few loud hits do not drown the rest.
  let prev = 0
  for (let i = 0; i < energy.length; i++) {
    const l = Math.log1p((COMPRESSION * energy[i]!) / mean)
    out[i] = Math.max(0, l - prev)
    prev = l
  }
  return out
}

const COMPRESSION = 1

function normalised(x: Float32Array): Float32Array {
  let sum = 0
  for (let i = 0; i < x.length; i++) sum += x[i]!
  const mean = sum / (x.length || 1)
  const out = new Float32Array(x.length)
  if (mean <= 0) return out
  for (let i = 0; i < x.length; i++) out[i] = x[i]! / mean
  return out
}

/**
 * Onset strength per band: band-pass, energy per 5 ms frame, then the rise of log energy
 * (a band-wise spectral-flux in the manner of Bello et al. 2005, without an FFT).
 */
export function onsetEnvelopes(mono: Float32Array, sampleRate: number): OnsetEnvelopes {
  const hop = Math.max(1, Math.round(sampleRate / ONSET_RATE))
  const frames = Math.floor(mono.length / hop)
  const low = new FilterChain(KICK_BAND(sampleRate))
  const mid = new FilterChain(SNARE_BAND(sampleRate))
  const high = new FilterChain(HAT_BAND(sampleRate))
  const eLow = new Float64Array(frames)
  const eMid = new Float64Array(frames)
  const eHigh = new Float64Array(frames)
  for (let f = 0, i = 0; f < frames; f++) {
    let sl = 0
    let sm = 0
    let sh = 0
    for (let end = i + hop; i < end; i++) {
      const x = mono[i]!
      const a = low.next(x)
      const b = mid.next(x)
      const c = high.next(x)
      sl += a * a
      sm += b * b
      sh += c * c
    }
    eLow[f] = sl
    eMid[f] = sm
    eHigh[f] = sh
  }
  const fl = compressedFlux(eLow)
  const fm = compressedFlux(eMid)
  const fh = compressedFlux(eHigh)
  const nl = normalised(fl)
  const nm = normalised(fm)
  const nh = normalised(fh)
  const all = new Float32Array(frames)
  for (let i = 0; i < frames; i++) all[i] = nl[i]! + nm[i]! + 0.5 * nh[i]!
  return { hop, rate: sampleRate / hop, low: fl, mid: fm, high: fh, all }
}

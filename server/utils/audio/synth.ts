/**
 * Synthesized drum loops with a known tempo and a known bar 1, for the demo seed, the tests
 * and the benchmark. Kick, snare and hat are made from sine sweeps and noise; a pad plays
 * through the lead-in so bar 1 is not simply the first sound.
 */

export type DrumPattern = 'boombap' | 'backbeat' | 'halftime' | 'four'

export interface SynthOptions {
  bpm: number
  bars: number
  beatsPerBar?: number
  sampleRate?: number
  channels?: number
  /** Time before bar 1: a pad and a hat pickup play there, no kick. */
  leadInMs?: number
  /** Delay of the off-beat subdivisions as a fraction of one subdivision (1/3 ≈ triplet swing). */
  swing?: number
  pattern?: DrumPattern
  /** Hats in 8ths (2) or 16ths (4) per beat. */
  hatsPerBeat?: 2 | 4
  /** Seed for the noise and the tiny timing and level variations. */
  seed?: number
}

export interface SynthBeat {
  channelData: Float32Array[]
  sampleRate: number
  /** Exact start of bar 1 (the first kick) in ms. */
  firstDownbeatMs: number
  durationMs: number
}

/** Mulberry32: a small seeded PRNG so every fixture is the same on every run. */
function prng(seed: number) {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6D2B79F5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

// Steps are 16ths within a 4/4 bar; other meters repeat the pattern per beat.
const PATTERNS: Record<DrumPattern, { kick: number[], snare: number[] }> = {
  boombap: { kick: [0, 7, 10], snare: [4, 12] },
  backbeat: { kick: [0, 8], snare: [4, 12] },
  halftime: { kick: [0, 3, 10], snare: [8] },
  four: { kick: [0, 4, 8, 12], snare: [4, 12] },
}

function addKick(out: Float32Array, at: number, sr: number, gain: number) {
  const len = Math.floor(sr * 0.35)
  let phase = 0
  for (let i = 0; i < len && at + i < out.length; i++) {
    const t = i / sr
    const f = 45 + 105 * Math.exp(-t / 0.03)
    phase += (2 * Math.PI * f) / sr
    out[at + i]! += gain * Math.sin(phase) * Math.exp(-t / 0.14)
  }
}

function addSnare(out: Float32Array, at: number, sr: number, gain: number, rnd: () => number) {
  const len = Math.floor(sr * 0.2)
  let prev = 0
  for (let i = 0; i < len && at + i < out.length; i++) {
    const t = i / sr
    const n = rnd() * 2 - 1
    const bright = n - prev // first difference tilts the noise upwards
    prev = n
    out[at + i]! += gain * (0.55 * bright * Math.exp(-t / 0.06) + 0.45 * Math.sin(2 * Math.PI * 190 * t) * Math.exp(-t / 0.04))
  }
}

function addHat(out: Float32Array, at: number, sr: number, gain: number, rnd: () => number) {
  const len = Math.floor(sr * 0.05)
  let p1 = 0
  let p2 = 0
  for (let i = 0; i < len && at + i < out.length; i++) {
    const n = rnd() * 2 - 1
    const hp = n - 2 * p1 + p2 // second difference: mostly above 5 kHz
    p2 = p1
    p1 = n
    out[at + i]! += gain * 0.35 * hp * Math.exp(-i / sr / 0.012)
  }
}

/** Renders a drum loop. Bar 1 starts exactly at `leadInMs` (rounded to a sample). */
export function synthBeat(options: SynthOptions): SynthBeat {
  const { bpm, bars } = options
  const sr = options.sampleRate ?? 44_100
  const bpb = options.beatsPerBar ?? 4
  const channels = options.channels ?? 2
  const pattern = PATTERNS[options.pattern ?? 'boombap']
  const hatsPerBeat = options.hatsPerBeat ?? 2
  const swing = options.swing ?? 0
  const rnd = prng(options.seed ?? 7)
  const leadIn = Math.round(((options.leadInMs ?? 0) * sr) / 1000)
  const beat = (60 * sr) / bpm
  const tail = Math.floor(sr * 0.5)
  const length = leadIn + Math.ceil(bars * bpb * beat) + tail
  const mono = new Float32Array(length)

  const at = (beatIndex: number, sub = 0, subs = 4) => {
    const offbeat = sub % 2 === 1
    const swingShift = offbeat ? swing * (beat / subs) : 0
    return Math.round(leadIn + (beatIndex + sub / subs) * beat + swingShift)
  }
  const jitter = () => Math.round((rnd() - 0.5) * 0.003 * sr) // ±1.5 ms, like a hand on pads

  for (let bar = 0; bar < bars; bar++) {
    for (let b = 0; b < bpb; b++) {
      const beatIndex = bar * bpb + b
      for (let sub = 0; sub < 4; sub++) {
        const step = (b % 4) * 4 + sub
        const first = bar === 0 && b === 0 && sub === 0
        if (pattern.kick.includes(step)) addKick(mono, at(beatIndex, sub) + (first ? 0 : jitter()), sr, 0.8 * (0.9 + 0.1 * rnd()))
        if (pattern.snare.includes(step)) addSnare(mono, at(beatIndex, sub) + jitter(), sr, 0.5 * (0.9 + 0.1 * rnd()), rnd)
      }
      for (let h = 0; h < hatsPerBeat; h++) {
        addHat(mono, at(beatIndex, h, hatsPerBeat) + jitter(), sr, (h === 0 ? 0.3 : 0.2) * (0.8 + 0.2 * rnd()), rnd)
      }
    }
  }
  // The pickup: hats on the last beat before bar 1, no kick.
  for (let h = 1; h <= hatsPerBeat; h++) {
    const pos = Math.round(leadIn - (h * beat) / hatsPerBeat)
    if (pos >= 0) addHat(mono, pos, sr, 0.2, rnd)
  }
  // A soft chord through the whole beat, swelling in over the lead-in.
  const freqs = [220, 277.18, 329.63]
  const swell = Math.max(leadIn, Math.floor(sr * 0.2))
  for (let i = 0; i < length; i++) {
    let v = 0
    for (const f of freqs) v += Math.sin((2 * Math.PI * f * i) / sr)
    const env = Math.min(1, i / swell) * (i > length - tail ? (length - i) / tail : 1)
    mono[i]! += 0.04 * v * env + (rnd() - 0.5) * 0.0006
  }

  const channelData: Float32Array[] = []
  for (let c = 0; c < channels; c++) {
    const ch = new Float32Array(length)
    const gain = channels > 1 ? (c === 0 ? 1 : 0.96) : 1
    for (let i = 0; i < length; i++) ch[i] = Math.max(-1, Math.min(1, mono[i]! * gain))
    channelData.push(ch)
  }
  return { channelData, sampleRate: sr, firstDownbeatMs: (leadIn * 1000) / sr, durationMs: (length * 1000) / sr }
}

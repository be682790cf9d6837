import { fitGrid } from './beats'
import { decodeAudio, AudioDecodeError, type DecodedAudio } from './decode'
import type { AudioFormat } from './formats'
import { onsetEnvelopes } from './onsets'
import { computePeaks, type Peaks } from './peaks'
import { estimateTempo } from './tempo'

export interface BeatAnalysis {
  durationMs: number
  sampleRate: number
  channels: number
  peaks: Peaks
  bpm: number
  bpmConfidence: number
  bpmAlternatives: number[]
  /** Estimated start of bar 1, ms into the decoded audio. */
  offsetMs: number
}

/** Shortest audio the tempo can be read from. */
export const MIN_ANALYSIS_MS = 3000

export type ProgressFn = (percent: number, stage: string) => void | Promise<void>

const round = (x: number, digits: number) => Math.round(x * 10 ** digits) / 10 ** digits

function mixdown(channelData: Float32Array[]): Float32Array {
  const frames = channelData[0]!.length
  if (channelData.length === 1) return channelData[0]!
  const mono = new Float32Array(frames)
  const k = 1 / channelData.length
  for (const ch of channelData) for (let i = 0; i < frames; i++) mono[i]! += ch[i]! * k
  return mono
}

/** Everything Barsmith reads from decoded audio: peaks, tempo with alternatives, bar 1. */
export async function analyseDecoded(decoded: DecodedAudio, beatsPerBar = 4, onProgress?: ProgressFn): Promise<BeatAnalysis> {
  const { sampleRate } = decoded
  const channels = decoded.channelData.length
  const frames = decoded.channelData[0]!.length
  const durationMs = (frames * 1000) / sampleRate
  if (durationMs < MIN_ANALYSIS_MS) throw new AudioDecodeError(`The audio is ${round(durationMs / 1000, 1)} s long; a beat needs at least ${MIN_ANALYSIS_MS / 1000} s to read its tempo.`)
  const peaks = computePeaks(decoded.channelData, sampleRate)
  await onProgress?.(55, 'peaks')
  const mono = mixdown(decoded.channelData)
  const env = onsetEnvelopes(mono, sampleRate)
  await onProgress?.(70, 'onsets')
  const tempo = estimateTempo(env)
  await onProgress?.(85, 'tempo')
  const grid = fitGrid(env, mono, sampleRate, tempo.period, beatsPerBar)
  await onProgress?.(95, 'offset')
  const bpm = round(grid.bpm, 3)
  return {
    durationMs: round(durationMs, 3),
    sampleRate,
    channels,
    peaks,
    bpm,
    bpmConfidence: round(Math.min(1, tempo.confidence * (0.5 + 0.5 * grid.agreement)), 2),
    bpmAlternatives: [bpm / 2, bpm * 2].filter(b => b >= 30 && b <= 300).map(b => round(b, 3)),
    offsetMs: round(grid.offsetMs, 3),
  }
}

/** Decode and analyse a stored file; progress runs 10–95 % (decoding takes the first half). */
export async function analyseFile(bytes: Uint8Array, format: AudioFormat, beatsPerBar = 4, onProgress?: ProgressFn): Promise<BeatAnalysis> {
  let last = -1
  const decoded = await decodeAudio(bytes, format, async (f) => {
    const pct = Math.round(10 + f * 40)
    if (pct >= last + 5) {
      last = pct
      await onProgress?.(pct, 'decoding')
    }
  })
  return analyseDecoded(decoded, beatsPerBar, onProgress)
}

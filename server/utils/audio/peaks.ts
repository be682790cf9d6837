/** Waveform peaks as wavesurfer.js draws them: one value per bucket, the largest |sample| of any channel. */
export interface Peaks {
  /** Buckets per second of audio. */
  perSecond: number
  durationMs: number
  /** 0–1, three decimals. */
  data: number[]
}

/** 100 buckets a second: a 5-minute beat is 30 000 numbers, enough to zoom into single beats. */
export const PEAKS_PER_SECOND = 100

export function computePeaks(channelData: Float32Array[], sampleRate: number, perSecond = PEAKS_PER_SECOND): Peaks {
  const frames = channelData[0]?.length ?? 0
  const size = sampleRate / perSecond
  const buckets = Math.ceil(frames / size)
  const data = new Array<number>(buckets)
  for (let b = 0; b < buckets; b++) {
    const from = Math.floor(b * size)
    const to = Math.min(frames, Math.floor((b + 1) * size))
    let peak = 0
    for (const ch of channelData) {
      for (let i = from; i < to; i++) {
        const v = ch[i]! < 0 ? -ch[i]! : ch[i]!
        if (v > peak) peak = v
      }
    }
    data[b] = Math.round(Math.min(1, peak) * 1000) / 1000
  }
  return { perSecond, durationMs: (frames * 1000) / sampleRate, data }
}

import decodeWav from '@audio/decode-wav'
import { decoder as flacDecoder } from '@audio/decode-flac'
import { decoder as mp3Decoder } from '@audio/decode-mp3'
import { decoder as vorbisDecoder } from '@audio/decode-vorbis'
import type { AudioFormat } from './formats'
import { gaplessTrim, readGaplessInfo } from './mp3-gapless'

export interface DecodedAudio {
  channelData: Float32Array[]
  sampleRate: number
}

/** A file that does not decode; `message` is shown to the producer as the failure reason. */
export class AudioDecodeError extends Error {}

const CHUNK = 256 * 1024

interface ChunkDecoder {
  decode(chunk: Uint8Array): { channelData: Float32Array[], sampleRate: number }
  flush?(): { channelData: Float32Array[], sampleRate: number }
  free(): void
}

async function makeDecoder(format: Exclude<AudioFormat, 'wav'>): Promise<ChunkDecoder> {
  if (format === 'mp3') return (await mp3Decoder()) as unknown as ChunkDecoder
  if (format === 'flac') return (await flacDecoder()) as unknown as ChunkDecoder
  return (await vorbisDecoder()) as unknown as ChunkDecoder
}

function concat(parts: Float32Array[][], channels: number): Float32Array[] {
  const out: Float32Array[] = []
  for (let c = 0; c < channels; c++) {
    const total = parts.reduce((n, p) => n + (p[c]?.length ?? 0), 0)
    const ch = new Float32Array(total)
    let at = 0
    for (const p of parts) {
      const part = p[c]
      if (!part) continue
      ch.set(part, at)
      at += part.length
    }
    out.push(ch)
  }
  return out
}

const tick = () => new Promise<void>(r => setImmediate(r))

/**
 * Decodes a whole file with the per-format decoder packages, chunk by chunk so progress can
 * be reported and other work gets a turn. MP3 encoder delay is trimmed when the file carries
 * a LAME tag and the decoder has not already done so.
 */
export async function decodeAudio(bytes: Uint8Array, format: AudioFormat, onProgress?: (fraction: number) => void | Promise<void>): Promise<DecodedAudio> {
  let result: DecodedAudio
  try {
    if (format === 'wav') {
      result = decodeWav(bytes)
      await onProgress?.(1)
    }
    else {
      const dec = await makeDecoder(format)
      const parts: Float32Array[][] = []
      let sampleRate = 0
      let channels = 0
      try {
        for (let at = 0; at < bytes.length; at += CHUNK) {
          const out = dec.decode(bytes.subarray(at, at + CHUNK))
          if (out.channelData.length && out.channelData[0]!.length) {
            parts.push(out.channelData)
            sampleRate ||= out.sampleRate
            channels = Math.max(channels, out.channelData.length)
          }
          await onProgress?.(Math.min(1, (at + CHUNK) / bytes.length))
          await tick()
        }
        const last = dec.flush?.()
        if (last?.channelData.length && last.channelData[0]!.length) {
          parts.push(last.channelData)
          sampleRate ||= last.sampleRate
        }
      }
      finally {
        dec.free()
      }
      result = { channelData: concat(parts, channels), sampleRate }
    }
  }
  catch (error) {
    throw new AudioDecodeError(`The ${format.toUpperCase()} data could not be decoded (${(error as Error).message || 'unknown error'}).`)
  }
  const frames = result.channelData[0]?.length ?? 0
  if (!result.sampleRate || !frames) throw new AudioDecodeError(`The file looks like ${format.toUpperCase()} but holds no audio that can be decoded; it may be damaged or cut short.`)
  if (result.channelData.some(ch => ch.length !== frames)) {
    throw new AudioDecodeError('The channels of this file decode to different lengths; it may be damaged.')
  }
  if (format === 'mp3') {
    const trim = gaplessTrim(readGaplessInfo(bytes), frames)
    if (trim) result = { sampleRate: result.sampleRate, channelData: result.channelData.map(ch => ch.slice(trim.start, trim.start + trim.length)) }
  }
  return result
}

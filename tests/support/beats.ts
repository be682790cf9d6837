import { encodeWav16 } from '../../server/utils/audio/wav'
import { synthBeat, type SynthOptions } from '../../server/utils/audio/synth'
import type { ApiClient, ApiResponse } from './http'

/** A short synthesized beat as WAV bytes (invented test data). */
export function smallWav(options: Partial<SynthOptions> = {}): Buffer {
  const beat = synthBeat({ bpm: 96, bars: 4, leadInMs: 300, seed: 5, ...options })
  return encodeWav16(beat.channelData, beat.sampleRate)
}

export function audioForm(bytes: Uint8Array, filename: string, type = 'application/octet-stream'): FormData {
  const form = new FormData()
  form.append('file', new Blob([bytes], { type }), filename)
  return form
}

export function uploadBeat(client: ApiClient, songId: string, bytes: Uint8Array, filename = 'beat.wav'): Promise<ApiResponse> {
  return client.post(`/api/songs/${songId}/beats`, audioForm(bytes, filename))
}

/** Polls a beat until its analysis is over (ready or failed); returns the last answer and the progress seen. */
export async function waitForBeat(client: ApiClient, songId: string, beatId: string, timeoutMs = 60_000) {
  const seen: Array<{ status: string, progress: number }> = []
  const until = Date.now() + timeoutMs
  while (Date.now() < until) {
    const res = await client.get(`/api/songs/${songId}/beats/${beatId}`)
    if (res.status !== 200) throw new Error(`beat ${beatId}: ${res.status} ${res.text}`)
    seen.push({ status: res.body.status, progress: res.body.progress })
    if (res.body.status === 'ready' || res.body.status === 'failed') return { beat: res.body, seen }
    await new Promise(r => setTimeout(r, 150))
  }
  throw new Error(`beat ${beatId} still not analysed after ${timeoutMs} ms (seen ${JSON.stringify(seen.slice(-3))})`)
}

// Each accepted format decodes to the same duration (within 50 ms) as the WAV it was made
// from; fixtures are synthesized here and converted with Debian's lame, flac and oggenc.
import { describe, expect, it } from 'vitest'
import { decodeAudio, AudioDecodeError } from '../../server/utils/audio/decode'
import { detectAudioFormat, SNIFF_BYTES } from '../../server/utils/audio/formats'
import { readGaplessInfo } from '../../server/utils/audio/mp3-gapless'
import { makeFixture, soxDurationMs } from '../support/audio-fixtures'

const synth = { bpm: 93, bars: 4, leadInMs: 400, seed: 3 }

describe('decoding each accepted format', () => {
  const wav = makeFixture('decode-93', synth, 'wav')
  for (const format of ['wav', 'mp3', 'flac', 'ogg'] as const) {
    it(`${format}: recognised by content and decoded to the source duration ±50 ms`, async () => {
      const f = format === 'wav' ? wav : makeFixture('decode-93', synth, format)
      expect(await detectAudioFormat(f.bytes.subarray(0, SNIFF_BYTES))).toBe(format)
      const decoded = await decodeAudio(f.bytes, format)
      const ms = (decoded.channelData[0]!.length / decoded.sampleRate) * 1000
      expect(decoded.sampleRate).toBe(44_100)
      expect(decoded.channelData).toHaveLength(2)
      expect(Math.abs(ms - wav.durationMs)).toBeLessThan(50)
      // sox reads the same file independently (it does not honour the MP3 gapless tag, so
      // its MP3 length includes the encoder delay and padding: compare the others only)
      if (format !== 'mp3') expect(Math.abs(ms - soxDurationMs(f.path))).toBeLessThan(50)
    })
  }

  it('reads the LAME tag delay (576 by LAME\'s default, from memory) and trims it', async () => {
    const f = makeFixture('decode-93', synth, 'mp3')
    const info = readGaplessInfo(f.bytes)
    expect(info?.delay).toBe(576)
    const untagged = makeFixture('decode-93', synth, 'mp3-untagged')
    expect(readGaplessInfo(untagged.bytes)).toBeNull()
  })

  it('refuses text and damaged audio with a reason', async () => {
    expect(await detectAudioFormat(Buffer.from('just some words, not a beat at all'))).toBeNull()
    const cut = Buffer.from(wav.bytes.subarray(0, 44))
    await expect(decodeAudio(cut, 'wav')).rejects.toBeInstanceOf(AudioDecodeError)
    const garbage = Buffer.concat([makeFixture('decode-93', synth, 'flac').bytes.subarray(0, 200), Buffer.alloc(5000, 0x55)])
    await expect(decodeAudio(garbage, 'flac')).rejects.toBeInstanceOf(AudioDecodeError)
  })
})

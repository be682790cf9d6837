// Each accepted format decodes to the same duration (within 50 ms) as the WAV it was made
// from; fixtures are synthesized here and converted with Debian's lame, flac and oggenc.
import { describe, expect, it } from 'vitest'
import { analyseFile } from '../../server/utils/audio/analyse'
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

describe('MP3 encoder and decoder delay', () => {
  const beat = { bpm: 90, bars: 8, leadInMs: 620, seed: 21 }
  // LAME writes its encoder delay (576 samples) in the Info tag; decoders that read it also
  // drop the 529-sample decoder delay (from memory: LAME technical notes, "gapless playback").
  it('puts bar 1 of a tagged MP3 where the WAV has it', async () => {
    const wav = makeFixture('delay-90', beat, 'wav')
    const mp3 = makeFixture('delay-90', beat, 'mp3')
    const a = await analyseFile(wav.bytes, 'wav')
    const b = await analyseFile(mp3.bytes, 'mp3')
    expect(Math.abs(a.offsetMs - wav.firstDownbeatMs)).toBeLessThanOrEqual(5)
    expect(Math.abs(b.offsetMs - a.offsetMs)).toBeLessThanOrEqual(5)
    expect(Math.abs(b.durationMs - a.durationMs)).toBeLessThan(1)
  })

  it('keeps an untagged MP3 on its decoded timeline: 576 + 529 samples later', async () => {
    const wav = makeFixture('delay-90', beat, 'wav')
    const mp3 = makeFixture('delay-90', beat, 'mp3-untagged')
    const a = await analyseFile(wav.bytes, 'wav')
    const b = await analyseFile(mp3.bytes, 'mp3')
    const late = ((576 + 529) / 44_100) * 1000 // ≈ 25.06 ms
    expect(Math.abs(b.offsetMs - a.offsetMs - late)).toBeLessThanOrEqual(5)
  })
})

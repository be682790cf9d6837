import { execFileSync } from 'node:child_process'
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { encodeWav16 } from '../../server/utils/audio/wav'
import { synthBeat, type SynthOptions } from '../../server/utils/audio/synth'

export const fixtureDir = (() => {
  let dir: string | undefined
  return () => {
    dir ??= mkdtempSync(join(tmpdir(), 'barsmith-audio-'))
    mkdirSync(dir, { recursive: true })
    return dir
  }
})()

export interface Fixture { path: string, bytes: Buffer, firstDownbeatMs: number, durationMs: number }

/** A synthesized beat written as WAV (in code) and converted with Debian's encoders. */
export function makeFixture(name: string, synth: SynthOptions, format: 'wav' | 'mp3' | 'mp3-untagged' | 'flac' | 'ogg'): Fixture {
  const beat = synthBeat(synth)
  const dir = fixtureDir()
  const wav = join(dir, `${name}.wav`)
  writeFileSync(wav, encodeWav16(beat.channelData, beat.sampleRate))
  let path = wav
  if (format === 'mp3') execFileSync('lame', ['--quiet', '-b', '192', wav, (path = join(dir, `${name}.mp3`))])
  if (format === 'mp3-untagged') execFileSync('lame', ['--quiet', '-t', '-b', '192', wav, (path = join(dir, `${name}-untagged.mp3`))])
  if (format === 'flac') execFileSync('flac', ['--silent', '--force', '-o', (path = join(dir, `${name}.flac`)), wav])
  if (format === 'ogg') execFileSync('oggenc', ['--quiet', '-q', '5', '-o', (path = join(dir, `${name}.ogg`)), wav])
  return { path, bytes: readFileSync(path), firstDownbeatMs: beat.firstDownbeatMs, durationMs: beat.durationMs }
}

/** Duration in ms as sox reads the file (an outside reference for the decoders). */
export function soxDurationMs(path: string): number {
  return Number(execFileSync('soxi', ['-D', path]).toString().trim()) * 1000
}

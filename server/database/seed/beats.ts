import { eq } from 'drizzle-orm'
import { randomUUID } from 'node:crypto'
import { analyseFile } from '../../utils/audio/analyse'
import { synthBeat } from '../../utils/audio/synth'
import { encodeWav16 } from '../../utils/audio/wav'
import { beatAudioKey, beatPeaksKey } from '../../utils/beat-files'
import type { DbOrTx } from '../../utils/db'
import { beats, sections, songs } from '../schema'
import type { DemoPeople } from './people'

/**
 * The demo beat: a loop synthesized here (90 BPM boom-bap, 32 bars after a short pad
 * lead-in), stored through the `files` mount and analysed like any upload, with sections.
 */
export async function seedBeat(tx: DbOrTx, people: DemoPeople, songId: string) {
  const beat = synthBeat({ bpm: 90, bars: 32, leadInMs: 700, pattern: 'boombap', swing: 0.18, seed: 2024 })
  const bytes = encodeWav16(beat.channelData, beat.sampleRate)
  const id = randomUUID()
  const storageKey = beatAudioKey(songId, id, 'wav')
  const peaksKey = beatPeaksKey(songId, id)
  const analysis = await analyseFile(bytes, 'wav')
  const storage = useStorage('files')
  await storage.setItemRaw(storageKey, bytes)
  await storage.setItemRaw(peaksKey, Buffer.from(JSON.stringify(analysis.peaks)))
  await tx.insert(beats).values({
    id, songId, bounce: 1, uploadedBy: people.producer.id, originalName: 'night-bus-loop.wav', format: 'wav',
    sizeBytes: bytes.length, storageKey, status: 'ready', progress: 100, durationMs: analysis.durationMs,
    sampleRate: analysis.sampleRate, channels: analysis.channels, bpm: analysis.bpm, bpmConfidence: analysis.bpmConfidence,
    bpmAlternatives: analysis.bpmAlternatives, offsetMs: analysis.offsetMs, peaksKey, analysedAt: new Date(),
  })
  await tx.update(songs).set({ bpm: analysis.bpm, offsetMs: analysis.offsetMs }).where(eq(songs.id, songId))
  const layout = [
    { kind: 'intro', label: '', startBar: 1, endBar: 4 },
    { kind: 'hook', label: '', startBar: 5, endBar: 12 },
    { kind: 'verse', label: 'Verse 1', startBar: 13, endBar: 28 },
    { kind: 'outro', label: '', startBar: 29, endBar: 32 },
  ] as const
  await tx.insert(sections).values(layout.map((s, position) => ({ ...s, songId, position, createdBy: people.producer.id })))
}

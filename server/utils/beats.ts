import type { DbOrTx } from './db'
import { and, desc, eq, isNull, lt, sql } from 'drizzle-orm'
import { analyseFile } from './audio/analyse'
import { AudioDecodeError } from './audio/decode'
import { AUDIO_FORMATS } from './audio/formats'
import { beatPeaksKey, readStored } from './beat-files'
import { BEAT_ANALYSIS_QUEUE } from './job-queue'
import { beats, songs, users, type Beat } from '../database/schema'

/** A beat row of the song, or 404 (another song's beat looks just like a missing one). */
export async function findBeat(songId: string, beatId: string): Promise<Beat> {
  const [beat] = await useDb().select().from(beats).where(and(eq(beats.id, beatId), eq(beats.songId, songId)))
  if (!beat) throw notFound('Beat')
  return beat
}

/** What the API shows of a beat. */
export function beatView(beat: Beat, uploaderName?: string | null) {
  const base = `/api/songs/${beat.songId}/beats/${beat.id}`
  return {
    id: beat.id,
    songId: beat.songId,
    bounce: beat.bounce,
    status: beat.status,
    progress: beat.progress,
    failureReason: beat.failureReason,
    originalName: beat.originalName,
    format: beat.format,
    mimeType: AUDIO_FORMATS[beat.format].mime,
    sizeBytes: beat.sizeBytes,
    durationMs: beat.durationMs,
    sampleRate: beat.sampleRate,
    channels: beat.channels,
    bpm: beat.bpm,
    bpmConfidence: beat.bpmConfidence,
    bpmAlternatives: beat.bpmAlternatives ?? [],
    offsetMs: beat.offsetMs,
    uploadedBy: uploaderName ?? null,
    createdAt: beat.createdAt,
    analysedAt: beat.analysedAt,
    audioUrl: `${base}/audio`,
    peaksUrl: beat.peaksKey ? `${base}/peaks` : null,
  }
}
export type BeatView = ReturnType<typeof beatView>

/** Every bounce of a song, newest first, with who uploaded it. */
export async function listBeats(songId: string) {
  const rows = await useDb().select({ beat: beats, name: users.name }).from(beats).leftJoin(users, eq(users.id, beats.uploadedBy)).where(eq(beats.songId, songId)).orderBy(desc(beats.bounce))
  return rows.map(r => beatView(r.beat, r.name))
}

/** Puts the beat's analysis on the queue (in PostgreSQL, so it survives a restart). */
export async function queueBeatAnalysis(beatId: string): Promise<void> {
  try {
    const boss = await useJobQueue()
    const jobId = await boss.send(BEAT_ANALYSIS_QUEUE, { beatId }, { singletonKey: beatId })
    await useDb().update(beats).set({ jobId }).where(eq(beats.id, beatId))
  }
  catch (error) {
    console.warn('[beats] could not queue analysis:', (error as Error).message)
    await useDb().update(beats).set({ status: 'failed', failureReason: 'The analysis could not be queued. Upload the beat again in a moment.' }).where(eq(beats.id, beatId))
  }
}

/**
 * The analysis job: decode, peaks, tempo, bar 1. A file that cannot be decoded ends as
 * `failed` with its reason (no retry: it would fail the same way); storage or database
 * trouble throws so the queue retries. The first bounce of a song sets the song's grid
 * from the estimate; later bounces keep the grid the producer has.
 */
export async function runBeatAnalysis(beatId: string): Promise<void> {
  const db = useDb()
  const [beat] = await db.select().from(beats).where(eq(beats.id, beatId))
  if (!beat || beat.status === 'ready') return
  const [song] = await db.select({ beatsPerBar: songs.beatsPerBar }).from(songs).where(eq(songs.id, beat.songId))
  if (!song) return
  await db.update(beats).set({ status: 'analysing', progress: 5, failureReason: null }).where(eq(beats.id, beatId))
  const bytes = await readStored(beat.storageKey)
  if (!bytes) {
    await db.update(beats).set({ status: 'failed', failureReason: 'The uploaded file is missing from storage. Upload it again.' }).where(eq(beats.id, beatId))
    return
  }
  let analysis
  try {
    analysis = await analyseFile(bytes, beat.format, song.beatsPerBar, async (progress) => {
      await db.update(beats).set({ progress }).where(eq(beats.id, beatId))
    })
  }
  catch (error) {
    const reason = error instanceof AudioDecodeError
      ? error.message
      : `The beat could not be analysed (${(error as Error).message || 'unknown error'}).`
    await db.update(beats).set({ status: 'failed', failureReason: reason }).where(eq(beats.id, beatId))
    return
  }
  const peaksKey = beatPeaksKey(beat.songId, beat.id)
  await useStorage('files').setItemRaw(peaksKey, Buffer.from(JSON.stringify(analysis.peaks)))
  await db.transaction(async (tx) => {
    await tx.update(beats).set({
      status: 'ready',
      progress: 100,
      durationMs: analysis.durationMs,
      sampleRate: analysis.sampleRate,
      channels: analysis.channels,
      bpm: analysis.bpm,
      bpmConfidence: analysis.bpmConfidence,
      bpmAlternatives: analysis.bpmAlternatives,
      offsetMs: analysis.offsetMs,
      peaksKey,
      analysedAt: new Date(),
    }).where(eq(beats.id, beatId))
    if (beat.bounce === 1) {
      await tx.update(songs).set({ bpm: analysis.bpm, offsetMs: analysis.offsetMs }).where(eq(songs.id, beat.songId))
    }
  })
}

/** Marks a beat failed after its job ran out of retries. */
export async function failStuckBeat(beatId: string): Promise<void> {
  await useDb().update(beats).set({ status: 'failed', failureReason: 'The analysis stopped several times before finishing. Upload the beat again; if it keeps happening, try a WAV export.' })
    .where(and(eq(beats.id, beatId), sql`${beats.status} IN ('queued', 'analysing')`))
}

/**
 * Queues beats that were stored but never reached the queue (the process died between the
 * two steps, or the queue was unreachable then). Runs in the worker at start and now and then;
 * the queue's singleton key keeps a beat from being queued twice.
 */
export async function requeueOrphanBeats(): Promise<number> {
  const orphans = await useDb().select({ id: beats.id }).from(beats)
    .where(and(eq(beats.status, 'queued'), isNull(beats.jobId), lt(beats.createdAt, sql`now() - interval '30 seconds'`)))
  for (const { id } of orphans) await queueBeatAnalysis(id)
  return orphans.length
}

/** The next bounce number of a song (call it inside a transaction that holds the song's row lock). */
export async function nextBounce(db: DbOrTx, songId: string): Promise<number> {
  const [row] = await db.select({ n: sql<number>`coalesce(max(${beats.bounce}), 0)::int` }).from(beats).where(eq(beats.songId, songId))
  return (row?.n ?? 0) + 1
}

import { randomUUID } from 'node:crypto'
import { expect } from 'vitest'
import type { ApiClient } from './http'
import type { TestCrew } from './people'

export interface TestLine { id: string, bar: number, text: string, bars?: number, out?: boolean }

export const SAMPLE_LINES: TestLine[] = [
  { id: 'a1', bar: 1, text: 'Streetlights hum a tune in a minor key' },
  { id: 'a2', bar: 2, text: 'every window on the block is watching me (uh)' },
  { id: 'a3', bar: 3, text: 'this line stays out of the booth', out: true },
  { id: 'a4', bar: 3, text: 'paper in my pocket, ink on my sleeve' },
  { id: 'a5', bar: 5, text: '(yeah, yeah)' },
]

async function ok<T = any>(p: Promise<{ status: number, body: T, text: string }>, status: number): Promise<T> {
  const res = await p
  expect(res.status, res.text).toBe(status)
  return res.body
}

/** A new song in `crew` with one draft and one version of `lines`, written by the crew's writer. */
export async function draftWithLines(crew: TestCrew, lines: TestLine[] = SAMPLE_LINES, grid?: { bpm?: number, beatsPerBar?: number, offsetMs?: number, feel?: 'normal' | 'half' }) {
  const writer = crew.as.writer
  const song = await ok(writer.post(`/api/crews/${crew.crewId}/songs`, { title: `Finish ${randomUUID().slice(0, 6)}` }), 201)
  if (grid) {
    const { sql } = await import('./db')
    await sql('UPDATE songs SET bpm = $2, beats_per_bar = $3, offset_ms = $4, feel = $5 WHERE id = $1',
      [song.id, grid.bpm ?? 90, grid.beatsPerBar ?? 4, grid.offsetMs ?? 0, grid.feel ?? 'normal'])
  }
  const draft = await ok(writer.post(`/api/songs/${song.id}/drafts`, { name: 'Main take' }), 201)
  const version = await ok(writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: null, lines }), 201)
  return { songId: song.id as string, draftId: draft.id as string, versionId: version.id as string, title: song.title as string }
}

/** A split sheet of the crew's writer (60 %) and co-writer (40 %), both confirmed. */
export async function confirmedSplit(crew: TestCrew, songId: string) {
  await ok(crew.as.writer.put(`/api/songs/${songId}/split`, {
    lines: [
      { userId: crew.users.writer.id, name: 'Test writer', role: 'lyrics', share: '60.00' },
      { userId: crew.users.cowriter.id, name: 'Test cowriter', role: 'lyrics', share: 40 },
    ],
  }), 200)
  await ok(crew.as.writer.post(`/api/songs/${songId}/split/confirm`, { confirm: true }), 200)
  await ok(crew.as.cowriter.post(`/api/songs/${songId}/split/confirm`, { confirm: true }), 200)
}

export async function requestSignoff(client: ApiClient, versionId: string): Promise<string> {
  const body = await ok(client.post(`/api/versions/${versionId}/signoffs`, {}), 201)
  return body.id as string
}

/** A song whose only version is sealed: the owner chose the writer as the one signer, who approved. */
export async function sealedSong(crew: TestCrew, lines: TestLine[] = SAMPLE_LINES) {
  const d = await draftWithLines(crew, lines)
  await confirmedSplit(crew, d.songId)
  const signoffId = await requestSignoff(crew.as.writer, d.versionId)
  await ok(crew.as.owner.put(`/api/signoffs/${signoffId}/signers`, { userIds: [crew.users.writer.id] }), 200)
  const decided = await ok(crew.as.writer.post(`/api/signoffs/${signoffId}/decision`, { decision: 'approve', comment: 'Ready.' }), 200)
  expect(decided.sealed).toBe(true)
  const seal = await ok(crew.as.listener.get(`/api/songs/${d.songId}/seal`), 200)
  return { ...d, signoffId, sealId: seal.seal.id as string }
}

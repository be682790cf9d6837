// Scratch takes against the built server, PostgreSQL and the `files` storage: what a browser
// records is accepted by its content, anything else refused; list, rename, delete one's own.
import { existsSync, openSync } from 'node:fs'
import { resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { randomFreePort } from '../../scripts/lib/net.mjs'
import { spawnServer, stopChild } from '../../scripts/lib/processes.mjs'
import { audioForm, smallWav } from '../support/beats'
import { sql } from '../support/db'
import { ApiClient } from '../support/http'
import { makeCrew, signedIn, type TestCrew } from '../support/people'
import { chromiumRecording } from '../support/recording'

let crew: TestCrew
let songId: string
let recording: { bytes: Buffer, mimeType: string }

beforeAll(async () => {
  crew = await makeCrew()
  songId = (await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'Scratch song' })).body.id
  recording = await chromiumRecording(1200)
})

const upload = (client: ApiClient, bytes: Uint8Array, filename: string, query = 'bar=5&durationMs=1200', song = songId) =>
  client.post(`/api/songs/${song}/takes?${query}`, audioForm(bytes, filename))

async function bytesOf(client: ApiClient, url: string, headers: Record<string, string> = {}) {
  const res = await fetch(`${inject('baseUrl')}${url}`, { headers: { cookie: client.cookieHeader, ...headers } })
  return { status: res.status, type: res.headers.get('content-type'), range: res.headers.get('content-range'), bytes: Buffer.from(await res.arrayBuffer()) }
}

describe('scratch take uploads', () => {
  it('accepts what Chromium\'s MediaRecorder writes (Opus in WebM), pinned to its bar, and plays it back byte for byte', async () => {
    expect(recording.mimeType).toMatch(/^audio\/webm/)
    const res = await upload(crew.as.cowriter, recording.bytes, 'whatever.bin')
    expect(res.status, res.text).toBe(201)
    expect(res.body).toMatchObject({ bar: 5, durationMs: 1200, format: 'webm', mimeType: 'audio/webm', name: 'Take at bar 5', authorId: crew.users.cowriter.id, sizeBytes: recording.bytes.length })
    const audio = await bytesOf(crew.as.listener, res.body.audioUrl)
    expect(audio.status).toBe(200)
    expect(audio.type).toBe('audio/webm')
    expect(audio.bytes.equals(recording.bytes)).toBe(true)
    const part = await bytesOf(crew.as.listener, res.body.audioUrl, { range: 'bytes=0-99' })
    expect(part.status).toBe(206)
    expect(part.range).toBe(`bytes 0-99/${recording.bytes.length}`)
    expect(part.bytes.equals(recording.bytes.subarray(0, 100))).toBe(true)
  })

  it('accepts the beat formats too (WAV), with a name', async () => {
    const res = await upload(crew.as.producer, smallWav({ bars: 1 }), 'guide.wav', 'bar=9&durationMs=2500&name=Guide%20hum')
    expect(res.status, res.text).toBe(201)
    expect(res.body).toMatchObject({ bar: 9, format: 'wav', name: 'Guide hum' })
  })

  it('refuses a text file named .webm with 415, and a recording whose bytes are cut to nonsense', async () => {
    const text = await upload(crew.as.writer, Buffer.from('These are lyrics, not a take.\n'.repeat(300)), 'take.webm')
    expect(text.status).toBe(415)
    expect(text.body.message).toMatch(/WebM or Ogg with Opus/)
    expect(text.body.message).toMatch(/content decides, not its name/)
    // A WebM with a video track is no voice take.
    const video = Buffer.from(recording.bytes)
    video.write('V_VP8', video.indexOf('A_OPUS'), 'latin1')
    expect((await upload(crew.as.writer, video, 'clip.webm')).status).toBe(415)
    const rows = await sql('SELECT count(*)::int AS n FROM scratch_takes WHERE song_id = $1 AND author_id = $2', [songId, crew.users.writer.id])
    expect(rows[0].n).toBe(0)
  })

  it('checks the bar, duration and role before reading the audio', async () => {
    const noBar = await upload(crew.as.writer, recording.bytes, 't.webm', 'durationMs=1000')
    expect(noBar.status).toBe(400)
    expect(noBar.body.data.fields.bar).toMatch(/bar/)
    expect((await upload(crew.as.writer, recording.bytes, 't.webm', 'bar=0&durationMs=1000')).status).toBe(400)
    expect((await upload(crew.as.writer, recording.bytes, 't.webm', 'bar=2&durationMs=0')).status).toBe(400)
    const listener = await upload(crew.as.listener, recording.bytes, 't.webm')
    expect(listener.status).toBe(403)
    const json = await crew.as.writer.post(`/api/songs/${songId}/takes?bar=1&durationMs=10`, { file: 'x' })
    expect(json.status).toBe(415)
    expect(json.body.message).toMatch(/field "file"/)
  })
})

describe('scratch takes: list, rename, delete', () => {
  it('lists takes in bar order; only the member who recorded one renames or deletes it; the file goes with it', async () => {
    const song = (await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'Takes list' })).body.id
    const late = (await upload(crew.as.writer, recording.bytes, 'a.webm', 'bar=12&durationMs=1200', song)).body
    const early = (await upload(crew.as.cowriter, recording.bytes, 'b.webm', 'bar=3&durationMs=1200', song)).body
    const list = await crew.as.listener.get(`/api/songs/${song}/takes`)
    expect(list.status).toBe(200)
    expect(list.body.map((t: any) => [t.bar, t.authorName])).toEqual([[3, crew.users.cowriter.name], [12, crew.users.writer.name]])

    const renamed = await crew.as.writer.patch(`/api/songs/${song}/takes/${late.id}`, { name: 'Second verse idea' })
    expect(renamed.status).toBe(200)
    expect(renamed.body.name).toBe('Second verse idea')
    expect((await crew.as.writer.patch(`/api/songs/${song}/takes/${late.id}`, { name: '  ' })).status).toBe(400)
    const notMine = await crew.as.writer.patch(`/api/songs/${song}/takes/${early.id}`, { name: 'Mine now' })
    expect(notMine.status).toBe(403)
    expect(notMine.body.message).toMatch(/Only the member who recorded/)
    expect((await crew.as.owner.delete(`/api/songs/${song}/takes/${early.id}`)).status).toBe(403)

    const [row] = await sql('SELECT storage_key FROM scratch_takes WHERE id = $1', [late.id])
    const stored = resolve(inject('storageDir'), ...row.storage_key.split('/'))
    expect(existsSync(stored)).toBe(true)
    expect((await crew.as.writer.delete(`/api/songs/${song}/takes/${late.id}`)).status).toBe(204)
    expect(existsSync(stored)).toBe(false)
    expect((await crew.as.listener.get(`/api/songs/${song}/takes`)).body.map((t: any) => t.id)).toEqual([early.id])
    expect((await crew.as.writer.get(`/api/songs/${song}/takes/${late.id}/audio`)).status).toBe(404)
    // Another crew's take looks like a missing one.
    expect((await crew.as.outsider.get(`/api/songs/${song}/takes`)).status).toBe(404)
    expect((await crew.as.listener.get(`/api/songs/${songId}/takes/${early.id}/audio`)).status).toBe(404)
  })
})

describe('scratch take size limit', () => {
  let server: Awaited<ReturnType<typeof spawnServer>> | undefined
  let base: string
  beforeAll(async () => {
    const port = await randomFreePort()
    base = `http://127.0.0.1:${port}`
    const log = openSync(resolve(inject('storageDir'), '..', 'scratch-limit-server.log'), 'a')
    server = await spawnServer({ port, env: { ...inject('serverEnv'), APP_URL: base, SCRATCH_LIMIT_MB: '1', BARSMITH_WORKERS: '0' }, output: log })
  })
  afterAll(async () => stopChild(server))

  it('answers 413 over the limit and stores nothing', async () => {
    const client = await signedIn(crew.users.writer)
    const limited = Object.assign(new ApiClient(base), { cookies: client.cookies })
    const big = Buffer.concat([recording.bytes, Buffer.alloc(2 * 1024 * 1024, 1)])
    const res = await upload(limited, big, 'long.webm')
    expect(res.status).toBe(413)
    expect(res.body.message).toMatch(/1 MB/)
    // Streamed past the limit (the declared length is within it, the file is not: busboy's counter decides).
    const justOver = Buffer.concat([recording.bytes, Buffer.alloc(1024 * 1024 - recording.bytes.length + 10, 1)])
    expect((await upload(limited, justOver, 'over.webm')).status).toBe(413)
    const rows = await sql('SELECT count(*)::int AS n FROM scratch_takes WHERE song_id = $1 AND name IN ($2)', [songId, 'Take at bar 5'])
    expect(rows[0].n).toBe(1)
  })
})

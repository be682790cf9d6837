// Beats end to end against the built server and PostgreSQL: upload in each accepted format,
// analysis through the job queue, playback ranges, the grid and sections.
import { openSync, readFileSync } from 'node:fs'
import { request as httpRequest } from 'node:http'
import { resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { randomFreePort } from '../../scripts/lib/net.mjs'
import { spawnServer, stopChild } from '../../scripts/lib/processes.mjs'
import { audioForm, smallWav, uploadBeat, waitForBeat } from '../support/beats'
import { makeFixture } from '../support/audio-fixtures'
import { sql } from '../support/db'
import { ApiClient } from '../support/http'
import { makeCrew, signedIn, type TestCrew } from '../support/people'

let crew: TestCrew
const newSong = async (title = 'Beat song') => (await crew.as.owner.post(`/api/crews/${crew.crewId}/songs`, { title })).body.id as string

beforeAll(async () => {
  crew = await makeCrew()
})

// MIREX / Gouyon et al. 2006 Accuracy 1: within ±4 % of the true tempo.
const acc1 = (est: number, truth: number) => Math.abs(est - truth) <= 0.04 * truth

describe('upload and analysis', () => {
  const synth = { bpm: 85, bars: 8, leadInMs: 900, seed: 31, hatsPerBeat: 4 as const }
  for (const format of ['wav', 'mp3', 'flac', 'ogg'] as const) {
    it(`${format}: 201 queued → ready with duration, tempo and bar 1`, async () => {
      const songId = await newSong(`Upload ${format}`)
      const fixture = makeFixture(`upload-85`, synth, format)
      // The name says nothing: the content decides.
      const res = await uploadBeat(crew.as.producer, songId, fixture.bytes, `take-${format}.bin`)
      expect(res.status).toBe(201)
      expect(res.body).toMatchObject({ id: expect.any(String), status: 'queued' })
      const { beat, seen } = await waitForBeat(crew.as.producer, songId, res.body.id)
      expect(beat.status, beat.failureReason).toBe('ready')
      expect(seen.at(-1)!.progress).toBe(100)
      expect(Math.abs(beat.durationMs - fixture.durationMs)).toBeLessThan(50)
      expect(beat.sampleRate).toBe(44_100)
      expect(beat.channels).toBe(2)
      expect(acc1(beat.bpm, 85)).toBe(true)
      expect(beat.bpmConfidence).toBeGreaterThan(0)
      expect(beat.bpmAlternatives).toEqual([beat.bpm / 2, beat.bpm * 2])
      // ±20 ms: the bar-1 tolerance; lossy formats decode on the same timeline (LAME tag honoured).
      expect(Math.abs(beat.offsetMs - fixture.firstDownbeatMs)).toBeLessThanOrEqual(20)
      // The first bounce sets the song's grid.
      const song = await crew.as.writer.get(`/api/songs/${songId}`)
      expect(song.body.grid).toMatchObject({ bpm: beat.bpm, offsetMs: beat.offsetMs })
      const peaks = await crew.as.listener.get(beat.peaksUrl)
      expect(peaks.status).toBe(200)
      expect(Math.abs(peaks.body.data.length - fixture.durationMs / 10)).toBeLessThanOrEqual(2)
      expect(Math.max(...peaks.body.data)).toBeGreaterThan(0.3)
    })
  }

  it('serves the audio with byte ranges for playback', async () => {
    const songId = await newSong('Ranges')
    const bytes = smallWav()
    const up = await uploadBeat(crew.as.producer, songId, bytes)
    const url = `/api/songs/${songId}/beats/${up.body.id}/audio`
    const whole = await crew.as.listener.get(url)
    expect(whole.status).toBe(200)
    expect(whole.headers.get('accept-ranges')).toBe('bytes')
    expect(Number(whole.headers.get('content-length'))).toBe(bytes.length)
    const res = await fetch(new URL(url, inject('baseUrl')), { headers: { cookie: crew.as.listener.cookieHeader, range: 'bytes=4-11' } })
    expect(res.status).toBe(206)
    expect(res.headers.get('content-range')).toBe(`bytes 4-11/${bytes.length}`)
    expect(Buffer.from(await res.arrayBuffer()).toString('latin1')).toBe(bytes.subarray(4, 12).toString('latin1'))
    const bad = await crew.as.listener.get(url, { range: `bytes=${bytes.length + 10}-` })
    expect(bad.status).toBe(416)
    expect(bad.body.message).toMatch(/range/)
  })

  it('refuses a text file named .wav with 415 naming the accepted formats', async () => {
    const songId = await newSong('Not audio')
    const res = await uploadBeat(crew.as.producer, songId, Buffer.from('These are lyrics, not a beat.\n'.repeat(400)), 'beat.wav')
    expect(res.status).toBe(415)
    expect(res.body.message).toMatch(/WAV, MP3, FLAC or OGG/)
    const listed = await crew.as.producer.get(`/api/songs/${songId}/beats`)
    expect(listed.body).toEqual([])
  })

  it('refuses a body that is not multipart and a form without the file field', async () => {
    const songId = await newSong('Wrong body')
    const json = await crew.as.producer.post(`/api/songs/${songId}/beats`, { file: 'x' })
    expect(json.status).toBe(415)
    const form = new FormData()
    form.append('other', 'value')
    const empty = await crew.as.producer.post(`/api/songs/${songId}/beats`, form)
    expect(empty.status).toBe(400)
    expect(empty.body.message).toMatch(/field "file"/)
  })

  it('ends a corrupt file as failed, with a reason', async () => {
    const songId = await newSong('Corrupt')
    const flac = makeFixture('corrupt', { bpm: 90, bars: 2, seed: 2 }, 'flac').bytes
    const damaged = Buffer.concat([flac.subarray(0, 120), Buffer.alloc(200_000, 0x5A)])
    const res = await uploadBeat(crew.as.producer, songId, damaged, 'damaged.flac')
    expect(res.status).toBe(201)
    const { beat } = await waitForBeat(crew.as.producer, songId, res.body.id)
    expect(beat.status).toBe('failed')
    expect(beat.failureReason).toMatch(/FLAC/)
    expect((await crew.as.producer.get(`/api/songs/${songId}/beats/${beat.id}/peaks`)).status).toBe(404)
  })

  it('keeps bounces numbered, the grid carried over and older bounces playable', async () => {
    const songId = await newSong('Bounces')
    const first = await uploadBeat(crew.as.producer, songId, smallWav({ bpm: 96 }))
    await waitForBeat(crew.as.producer, songId, first.body.id)
    await crew.as.producer.patch(`/api/songs/${songId}/grid`, { bpm: 96, offsetMs: 310.5, feel: 'half' })
    const second = await uploadBeat(crew.as.owner, songId, smallWav({ bpm: 96, seed: 9, leadInMs: 500 }))
    expect(second.body.bounce).toBe(2)
    const { beat } = await waitForBeat(crew.as.owner, songId, second.body.id)
    expect(beat.status).toBe('ready')
    const song = await crew.as.writer.get(`/api/songs/${songId}`)
    expect(song.body.grid).toEqual({ bpm: 96, beatsPerBar: 4, offsetMs: 310.5, feel: 'half' })
    const list = await crew.as.listener.get(`/api/songs/${songId}/beats`)
    expect(list.body.map((b: { bounce: number }) => b.bounce)).toEqual([2, 1])
    expect((await crew.as.listener.get(list.body[1].audioUrl)).status).toBe(200)
  })
})

const rssMb = async (pid: number) => Number(/VmRSS:\s+(\d+)/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'))![1]) / 1024

describe('upload limit', () => {
  let server: Awaited<ReturnType<typeof spawnServer>> | undefined
  let base: string
  beforeAll(async () => {
    const port = await randomFreePort()
    base = `http://127.0.0.1:${port}`
    const log = openSync(resolve(inject('storageDir'), '..', 'limit-server.log'), 'a')
    server = await spawnServer({ port, env: { ...inject('serverEnv'), APP_URL: base, UPLOAD_LIMIT_MB: '1', BARSMITH_WORKERS: '0' }, output: log })
  })
  afterAll(async () => stopChild(server))

  it('answers 413 over the limit, declared or streamed, and stores nothing', async () => {
    const client = await signedIn(crew.users.producer)
    const limited = Object.assign(new ApiClient(base), { cookies: client.cookies })
    const songId = await newSong('Too big')
    const big = Buffer.concat([smallWav({ bars: 1 }), Buffer.alloc(3 * 1024 * 1024, 1)])
    const declared = await uploadBeat(limited, songId, big, 'big.wav')
    expect(declared.status).toBe(413)
    expect(declared.body.message).toMatch(/1 MB/)

    // A chunked body with no length, up to 200 MB, sent by a client that reads the reply as
    // soon as it comes (as curl does): refused while it streams, soon after the first megabyte,
    // and the server's memory does not grow by anything like the body.
    const rssBefore = await rssMb(server!.pid!)
    const boundary = 'barsmithlimit'
    const { status, sent } = await new Promise<{ status: number, sent: number }>((resolvePromise, reject) => {
      let sent = 0
      const req = httpRequest(`${base}/api/songs/${songId}/beats`, {
        method: 'POST',
        headers: { 'content-type': `multipart/form-data; boundary=${boundary}`, 'cookie': limited.cookieHeader, 'transfer-encoding': 'chunked' },
      })
      req.on('response', (res) => {
        resolvePromise({ status: res.statusCode!, sent })
        res.resume()
        req.destroy()
      })
      req.on('error', reject)
      req.write(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="s.wav"\r\nContent-Type: audio/wav\r\n\r\n`)
      req.write(smallWav({ bars: 1 }).subarray(0, 4096))
      const chunk = Buffer.alloc(64 * 1024, 2)
      const pump = () => {
        while (sent < 200 * 1024 * 1024 && !req.destroyed) {
          sent += chunk.length
          if (!req.write(chunk)) return void req.once('drain', pump)
        }
        if (!req.destroyed) req.end()
      }
      pump()
    })
    expect(status).toBe(413)
    expect(sent).toBeLessThan(50 * 1024 * 1024)
    expect(await rssMb(server!.pid!) - rssBefore).toBeLessThan(40)
    const rows = await sql('SELECT count(*)::int AS n FROM beats WHERE song_id = $1', [songId])
    expect(rows[0].n).toBe(0)
  })
})

describe('grid', () => {
  it('takes a decimal BPM, a meter, an offset and the feel; refuses nonsense with field messages', async () => {
    const songId = await newSong('Grid')
    const ok = await crew.as.producer.patch(`/api/songs/${songId}/grid`, { bpm: 93.25, beatsPerBar: 3, offsetMs: 12.345, feel: 'half' })
    expect(ok.status).toBe(200)
    expect(ok.body).toEqual({ bpm: 93.25, beatsPerBar: 3, offsetMs: 12.345, feel: 'half' })
    const bad = await crew.as.producer.patch(`/api/songs/${songId}/grid`, { bpm: 900, beatsPerBar: 8, offsetMs: -5, feel: 'double' })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.data.fields).sort()).toEqual(['beatsPerBar', 'bpm', 'feel', 'offsetMs'])
    expect((await crew.as.producer.patch(`/api/songs/${songId}/grid`, {})).status).toBe(400)
    expect((await crew.as.writer.patch(`/api/songs/${songId}/grid`, { bpm: 100 })).status).toBe(403)
  })
})

describe('sections', () => {
  it('lists, refuses overlaps with a clear message (server and database), re-arranges', async () => {
    const songId = await newSong('Sections')
    const intro = await crew.as.producer.post(`/api/songs/${songId}/sections`, { kind: 'intro', startBar: 1, endBar: 4 })
    expect(intro.status).toBe(201)
    const verse = await crew.as.producer.post(`/api/songs/${songId}/sections`, { kind: 'verse', label: 'Verse 1', startBar: 5, endBar: 20 })
    const hook = await crew.as.producer.post(`/api/songs/${songId}/sections`, { kind: 'hook', startBar: 23, endBar: 30 })
    expect(hook.body).toMatchObject({ bars: 8, position: 2 })

    const clash = await crew.as.producer.post(`/api/songs/${songId}/sections`, { kind: 'bridge', startBar: 18, endBar: 24 })
    expect(clash.status).toBe(409)
    expect(clash.body.message).toMatch(/overlap “Verse 1” \(bars 5–20\)/)
    const moved = await crew.as.producer.patch(`/api/songs/${songId}/sections/${hook.body.id}`, { startBar: 20 })
    expect(moved.status).toBe(409)
    const backwards = await crew.as.producer.post(`/api/songs/${songId}/sections`, { kind: 'outro', startBar: 40, endBar: 39 })
    expect(backwards.status).toBe(400)
    expect(backwards.body.data.fields.endBar).toBeTypeOf('string')

    // The database refuses it too, whatever the handler does (exclusion constraint).
    await expect(sql(`INSERT INTO sections (song_id, kind, start_bar, end_bar) VALUES ($1, 'other', 3, 6)`, [songId])).rejects.toMatchObject({ code: '23P01' })

    // Hook first: it keeps 8 bars and starts at bar 1; the 2-bar gap after slot 2 stays there.
    const order = await crew.as.producer.put(`/api/songs/${songId}/sections/order`, { ids: [hook.body.id, intro.body.id, verse.body.id] })
    expect(order.status).toBe(200)
    const list = await crew.as.listener.get(`/api/songs/${songId}/sections`)
    expect(list.body.map((s: any) => [s.kind, s.startBar, s.endBar, s.position])).toEqual([
      ['hook', 1, 8, 0], ['intro', 9, 12, 1], ['verse', 15, 30, 2],
    ])
    const wrong = await crew.as.producer.put(`/api/songs/${songId}/sections/order`, { ids: [hook.body.id] })
    expect(wrong.status).toBe(400)
    expect((await crew.as.producer.delete(`/api/songs/${songId}/sections/${intro.body.id}`)).status).toBe(204)
    expect((await crew.as.producer.delete(`/api/songs/${songId}/sections/${intro.body.id}`)).status).toBe(404)
  })

  it('hides another crew\'s beats and sections (404)', async () => {
    const songId = await newSong('Private')
    const up = await uploadBeat(crew.as.producer, songId, smallWav({ bars: 2 }))
    const other = await makeCrew()
    const otherSong = (await other.as.owner.post(`/api/crews/${other.crewId}/songs`, { title: 'Theirs' })).body.id
    expect((await other.as.owner.get(`/api/songs/${songId}/beats/${up.body.id}`)).status).toBe(404)
    expect((await other.as.owner.get(`/api/songs/${otherSong}/beats/${up.body.id}`)).status).toBe(404)
    expect((await crew.as.owner.get(`/api/songs/${songId}/beats/not-an-id`)).status).toBe(404)
    const form = audioForm(smallWav({ bars: 1 }), 'x.wav')
    expect((await other.as.owner.post(`/api/songs/${songId}/beats`, form)).status).toBe(404)
  })
})

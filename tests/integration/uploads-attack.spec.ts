// Uploads under attack, beats and scratch takes alike, against a server of its own with
// 1 MB limits, its own storage root and its own temporary directory (so what it leaves
// behind can be counted): wrong content behind an audio name, a truncated MP3, an
// over-limit body sent slowly, hostile file names, many uploads at once.
import { existsSync, mkdirSync, openSync, readdirSync, readFileSync, statSync } from 'node:fs'
import { request as httpRequest } from 'node:http'
import { join, relative, resolve, sep } from 'node:path'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { randomFreePort } from '../../scripts/lib/net.mjs'
import { spawnServer, stopChild } from '../../scripts/lib/processes.mjs'
import { makeFixture } from '../support/audio-fixtures'
import { audioForm, smallWav, waitForBeat } from '../support/beats'
import { sql } from '../support/db'
import { ApiClient } from '../support/http'
import { makeCrew, signedIn, type TestCrew } from '../support/people'

let server: Awaited<ReturnType<typeof spawnServer>> | undefined
let base: string
let storageRoot: string
let tmpRoot: string
let crew: TestCrew
let producer: ApiClient
let writer: ApiClient

const runDir = () => resolve(inject('storageDir'), '..')

beforeAll(async () => {
  storageRoot = resolve(runDir(), 'attack-storage')
  // Uploads arrive in the storage root's incoming folder (never under a storage key) and are stored by rename.
  tmpRoot = resolve(storageRoot, '.incoming')
  mkdirSync(storageRoot, { recursive: true })
  mkdirSync(tmpRoot, { recursive: true })
  const port = await randomFreePort()
  base = `http://127.0.0.1:${port}`
  const log = openSync(resolve(runDir(), 'attack-server.log'), 'a')
  server = await spawnServer({
    port,
    env: { ...inject('serverEnv'), APP_URL: base, UPLOAD_LIMIT_MB: '1', SCRATCH_LIMIT_MB: '1', STORAGE_DIR: storageRoot, TMPDIR: resolve(runDir(), 'attack-tmp') },
    output: log,
  })
  crew = await makeCrew()
  const on = async (u: { email: string }) => Object.assign(new ApiClient(base), { cookies: (await signedIn(u)).cookies })
  producer = await on(crew.users.producer)
  writer = await on(crew.users.writer)
}, 120_000)
afterAll(async () => stopChild(server))

const newSong = async (title: string) => (await crew.as.owner.post(`/api/crews/${crew.crewId}/songs`, { title })).body.id as string
const beat = (c: ApiClient, songId: string, bytes: Uint8Array, name: string) => c.post(`/api/songs/${songId}/beats`, audioForm(bytes, name))
const take = (c: ApiClient, songId: string, bytes: Uint8Array, name: string) => c.post(`/api/songs/${songId}/takes?bar=1&durationMs=1000`, audioForm(bytes, name))

function filesUnder(dir: string): string[] {
  if (!existsSync(dir)) return []
  return readdirSync(dir, { recursive: true, encoding: 'utf8' }).map(f => join(dir, f)).filter(f => statSync(f).isFile())
}
const storedKeys = () => filesUnder(storageRoot).map(f => relative(storageRoot, f).split(sep).join('/')).filter(k => !k.startsWith('.incoming/')).sort()
async function keysInDatabase(songIds: string[]) {
  const rows = await sql(`SELECT storage_key AS k FROM beats WHERE song_id = ANY($1::uuid[])
    UNION ALL SELECT storage_key FROM scratch_takes WHERE song_id = ANY($1::uuid[])`, [songIds])
  return rows.map(r => r.k as string).sort()
}
/** Temporary files go once each request is over; give the last lingering close a moment. */
async function tmpIsEmpty() {
  for (let i = 0; i < 40 && filesUnder(tmpRoot).length; i++) await new Promise(r => setTimeout(r, 100))
  return filesUnder(tmpRoot)
}

const songs: string[] = []

describe('uploads under attack', () => {
  it('refuses a text file named .wav (and a page named .webm) by its content, storing nothing', async () => {
    const songId = await newSong('Text as audio')
    songs.push(songId)
    const text = Buffer.from('these are lyrics, not audio\n'.repeat(400))
    const html = Buffer.from('<!doctype html><script>alert(1)</script>'.repeat(200))
    for (const res of [await beat(producer, songId, text, 'beat.wav'), await take(writer, songId, html, 'take.webm'), await beat(producer, songId, Buffer.from('RIFF'), 'tiny.wav')]) {
      expect([400, 415], res.text).toContain(res.status)
      expect(res.body.message).toEqual(expect.any(String))
    }
    expect(await keysInDatabase([songId])).toEqual([])
    expect(storedKeys().filter(k => k.includes(songId))).toEqual([])
    expect(await tmpIsEmpty()).toEqual([])
  })

  it('takes a truncated MP3 or refuses it, and its analysis ends instead of hanging', async () => {
    const songId = await newSong('Cut short')
    songs.push(songId)
    const mp3 = makeFixture('attack-cut', { bpm: 90, bars: 4, leadInMs: 0, seed: 3 }, 'mp3').bytes
    const cut = mp3.subarray(0, Math.floor(mp3.length * 0.37) + 3) // ends inside a frame
    const res = await beat(producer, songId, cut, 'cut.mp3')
    if (res.status === 201) {
      const { beat: done } = await waitForBeat(producer, songId, res.body.id)
      expect(['ready', 'failed']).toContain(done.status)
      const [row] = await sql('SELECT storage_key FROM beats WHERE id = $1', [res.body.id])
      expect(readFileSync(join(storageRoot, row.storage_key))).toEqual(Buffer.from(cut))
    }
    else {
      expect(res.status).toBeGreaterThanOrEqual(400)
      expect(res.status).toBeLessThan(500)
    }
    const t = await take(writer, songId, cut, 'cut.mp3')
    expect(t.status < 500, t.text).toBe(true)
    expect(await tmpIsEmpty()).toEqual([])
  }, 90_000)

  it('refuses a body over the limit sent slowly, with no file left behind', async () => {
    const songId = await newSong('Slow and big')
    songs.push(songId)
    for (const kind of ['beats', 'takes?bar=1&durationMs=1000']) {
      const boundary = 'barsmithslow'
      let sawTemp = false
      const { status, sent } = await new Promise<{ status: number, sent: number }>((done, fail) => {
        let sent = 0
        const req = httpRequest(`${base}/api/songs/${songId}/${kind}`, {
          method: 'POST',
          headers: { 'content-type': `multipart/form-data; boundary=${boundary}`, 'cookie': kind === 'beats' ? producer.cookieHeader : writer.cookieHeader, 'transfer-encoding': 'chunked' },
        })
        req.on('response', (res) => {
          clearInterval(timer)
          done({ status: res.statusCode!, sent })
          res.resume()
          req.destroy()
        })
        req.on('error', (e) => {
          clearInterval(timer)
          fail(e)
        })
        req.write(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="slow.wav"\r\nContent-Type: audio/wav\r\n\r\n`)
        req.write(smallWav({ bars: 1 }).subarray(0, 4096))
        // 32 KB every 15 ms: a slow client, up to 4 MB (four times the limit).
        const timer = setInterval(() => {
          if (sent >= 4 * 1024 * 1024) {
            clearInterval(timer)
            req.end()
            return
          }
          sent += 32 * 1024
          req.write(Buffer.alloc(32 * 1024, 3))
          // While it arrives, the body is in this server's incoming folder (so "empty" below means something).
          if (!sawTemp && sent > 256 * 1024) sawTemp = filesUnder(tmpRoot).length > 0
        }, 15)
      })
      expect(status, kind).toBe(413)
      expect(sent).toBeLessThan(4 * 1024 * 1024)
      expect(sawTemp, kind).toBe(true)
    }
    expect(await keysInDatabase([songId])).toEqual([])
    expect(storedKeys().filter(k => k.includes(songId))).toEqual([])
    expect(await tmpIsEmpty()).toEqual([])
  }, 60_000)

  it('keeps hostile file names as names only: files land under the storage root, named by id', async () => {
    const songId = await newSong('Names')
    songs.push(songId)
    const wav = smallWav({ bars: 1 })
    const names = ['../../../../tmp/escape.wav', '..\\..\\windows\\escape.wav', 'bell\u0007\u001B[2Jname\u0000.wav', 'line\r\nX-Injected: 1.wav', '/etc/passwd', '\u202Ecod.wav', '.wav', 'a'.repeat(600) + '.wav']
    let stored = 0
    for (const name of names) {
      // Stored under its id, or (a NUL in the part's header) refused as an unreadable body.
      const b = await beat(producer, songId, wav, name)
      expect([201, 400], `${JSON.stringify(name)} ${b.text}`).toContain(b.status)
      if (b.status === 201) stored++
      else expect(b.body.message).toEqual(expect.any(String))
      const t = await take(writer, songId, wav, name)
      expect([201, 400], `${JSON.stringify(name)} ${t.text}`).toContain(t.status)
      // eslint-disable-next-line no-control-regex -- control characters are what is being checked for
      if (t.status === 201) expect(t.body.name ?? '').not.toMatch(/[\u0000-\u001F]/)
    }
    expect(stored).toBeGreaterThanOrEqual(names.length - 1)
    const rows = await sql('SELECT original_name FROM beats WHERE song_id = $1', [songId])
    expect(rows.length).toBe(stored)
    // eslint-disable-next-line no-control-regex -- control characters are what is being checked for
    for (const r of rows) expect(r.original_name).not.toMatch(/[\u0000-\u001F\u007F]/)
    const keys = await keysInDatabase([songId])
    for (const k of keys) {
      // eslint-disable-next-line no-control-regex -- control characters are what is being checked for
      expect(k).not.toMatch(/\.\.|escape|passwd|[\u0000-\u001F]/)
      expect(resolve(storageRoot, k).startsWith(storageRoot + sep)).toBe(true)
    }
    expect(existsSync(resolve(runDir(), 'escape.wav'))).toBe(false)
    expect(filesUnder(resolve(storageRoot, '..')).filter(f => /escape|passwd/.test(f))).toEqual([])
    // The listed beats give names without control characters back to the page.
    const listed = await producer.get(`/api/songs/${songId}/beats`)
    expect(listed.status).toBe(200)
    expect(JSON.stringify(listed.body)).not.toMatch(/\\u000[0-9a-f]|\\u001[0-9a-f]|\\r|\\n/i)
  }, 90_000)

  it('stores many uploads at once, each whole, one file per row', async () => {
    const songId = await newSong('Crowd')
    songs.push(songId)
    const wavs = Array.from({ length: 8 }, (_, i) => smallWav({ bars: 1, seed: 40 + i }))
    const results = await Promise.all([
      ...wavs.map((w, i) => beat(producer, songId, w, `crowd-${i}.wav`)),
      ...wavs.map((w, i) => take(writer, songId, w, `crowd-${i}.wav`)),
    ])
    for (const r of results) expect(r.status, r.text).toBe(201)
    const beatRows = await sql('SELECT bounce, storage_key, size_bytes FROM beats WHERE song_id = $1', [songId])
    expect(new Set(beatRows.map(r => r.bounce)).size).toBe(wavs.length)
    for (const r of beatRows) expect(statSync(join(storageRoot, r.storage_key)).size).toBe(Number(r.size_bytes))
    expect(await tmpIsEmpty()).toEqual([])
  }, 90_000)

  it('leaves no file in storage that no row points to', async () => {
    const ours = storedKeys().filter(k => songs.some(s => k.includes(s)))
    // Besides the uploads, only the waveform peaks the analysis writes beside a beat's audio.
    const uploads = ours.filter(k => !k.endsWith('/peaks.json'))
    expect(uploads).toEqual(await keysInDatabase(songs))
    for (const peaks of ours.filter(k => k.endsWith('/peaks.json'))) {
      expect(uploads.some(k => k.startsWith(peaks.replace(/peaks\.json$/, '')))).toBe(true)
    }
  })
})

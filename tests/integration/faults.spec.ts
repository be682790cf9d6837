// Faults: the database stopped and started again under a running server, the mail server
// down, the server killed during an upload and during a beat analysis. This file starts its
// OWN PostgreSQL cluster (.data/faults/pg), fake SMTP process and server processes, so it can
// stop them without disturbing the shared test server the other files use.
import { request as httpRequest } from 'node:http'
import type { ChildProcess } from 'node:child_process'
import { existsSync, mkdirSync, openSync, readdirSync, readFileSync, rmSync } from 'node:fs'
import { resolve } from 'node:path'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { dataDir } from '../../scripts/lib/paths.mjs'
import { ensureDatabase, startCluster, stopCluster } from '../../scripts/lib/pg.mjs'
import { localSecrets } from '../../scripts/lib/secrets.mjs'
import { randomFreePort } from '../../scripts/lib/net.mjs'
import { spawnFakeSmtp, spawnServer, stopChild } from '../../scripts/lib/processes.mjs'
import { serverEnv } from '../../scripts/lib/server-env.mjs'
import { ApiClient, DEMO_EMAILS } from '../support/http'
import { openEventStream } from '../support/sse'
import { smallWav, uploadBeat, waitForBeat } from '../support/beats'

const root = resolve(dataDir, 'faults')
const pgDir = resolve(root, 'pg')
const runDir = resolve(root, 'run')
const mailboxDir = resolve(runDir, 'mailbox')
const storageDir = resolve(runDir, 'storage')
const incoming = resolve(storageDir, '.incoming')

let env: Record<string, string>
let port: number
let baseUrl: string
let smtpPort: number
let server: ChildProcess | undefined
let smtp: ChildProcess | undefined
let pool: pg.Pool

const sleep = (ms: number) => new Promise(r => setTimeout(r, ms))

async function startServer(name: string) {
  const output = openSync(resolve(runDir, `server-${name}.log`), 'a')
  server = await spawnServer({ port, env, output })
  return server
}

function killServer(): Promise<void> {
  const child = server!
  return new Promise((r) => {
    child.once('exit', () => r())
    child.kill('SIGKILL')
  })
}

async function until<T>(what: string, fn: () => Promise<T | undefined | false>, timeoutMs = 60_000, everyMs = 200): Promise<T> {
  const deadline = Date.now() + timeoutMs
  let last: unknown
  while (Date.now() < deadline) {
    try {
      const v = await fn()
      if (v) return v
    }
    catch (error) {
      last = error
    }
    await sleep(everyMs)
  }
  throw new Error(`${what}: not within ${timeoutMs} ms${last ? ` (${(last as Error).message})` : ''}`)
}

async function q<T extends pg.QueryResultRow = any>(text: string, values: unknown[] = []) {
  return (await pool.query<T>(text, values)).rows
}

async function demo(role: keyof typeof DEMO_EMAILS) {
  return new ApiClient(baseUrl).signIn(DEMO_EMAILS[role])
}

async function demoSong(client: ApiClient) {
  const crews = await client.get('/api/crews')
  const crewId = crews.body[0].id as string
  const songs = await client.get(`/api/crews/${crewId}/songs`)
  return songs.body[0].id as string
}

beforeAll(async () => {
  const secrets = localSecrets()
  rmSync(runDir, { recursive: true, force: true })
  mkdirSync(storageDir, { recursive: true })
  const cluster = await startCluster(pgDir, { preferredPort: 55440 })
  const databaseUrl = await ensureDatabase(pgDir, cluster.port, 'barsmith_faults', { password: secrets.dbPassword, fresh: true })
  pool = new pg.Pool({ connectionString: databaseUrl, max: 2 })
  pool.on('error', () => {})
  smtpPort = await randomFreePort()
  smtp = await spawnFakeSmtp({ port: smtpPort, dir: mailboxDir })
  port = await randomFreePort()
  baseUrl = `http://127.0.0.1:${port}`
  env = {
    ...serverEnv({ databaseUrl, secrets, appUrl: baseUrl, smtpPort, mailboxDir, storageDir }),
    TRUST_PROXY: '1',
    // A job whose process died counts as abandoned after 8 s here (180 s by default).
    BEAT_JOB_EXPIRE_SECONDS: '8',
    JOB_MAINTENANCE_SECONDS: '2',
  }
  await startServer('a')
}, 180_000)

afterAll(async () => {
  if (server) await stopChild(server)
  if (smtp) await stopChild(smtp)
  await pool?.end()
  await stopCluster(pgDir)
}, 60_000)

describe('PostgreSQL stopped and started again while the server runs', () => {
  it('answers 503 with a JSON message during the outage and serves again after, without a restart', async () => {
    const owner = await demo('owner')
    const writer = await demo('writer')
    const songId = await demoSong(owner)
    const drafts = await owner.get(`/api/songs/${songId}/drafts`)
    expect(drafts.status).toBe(200)
    const draftId = drafts.body[0].id as string
    expect((await owner.get('/api/crews')).status).toBe(200)
    const pid = server!.pid
    // A member's event stream, open across the outage: its LISTEN connection must come back.
    const events = await openEventStream(owner, `/api/songs/${songId}/events`)
    expect(events.status).toBe(200)
    await events.next('hello')

    await stopCluster(pgDir)
    const seen: number[] = []
    // Reads, writes, a sign-in and the health check, each several times over the outage.
    for (let round = 0; round < 3; round++) {
      const answers = await Promise.all([
        owner.get('/api/crews'),
        owner.get(`/api/songs/${songId}/drafts`),
        owner.post('/api/crews', { name: 'Made during the outage' }),
        new ApiClient(baseUrl).post('/api/auth/login', { email: DEMO_EMAILS.writer, password: 'barsmith-demo' }),
        new ApiClient(baseUrl).get('/api/health'),
      ])
      for (const res of answers) {
        seen.push(res.status)
        expect(res.status, res.text).toBe(503)
        expect(res.headers.get('content-type')).toContain('application/json')
        expect(res.body.message).toMatch(/database is not reachable/i)
        expect(res.headers.get('retry-after')).toBe('5')
      }
      await sleep(300)
    }
    expect(seen.length).toBe(15)
    // The song page (rendered on the server) still renders, with the same message where the song
    // would be and the same status as the API.
    const page = await owner.get(`/songs/${songId}`, { accept: 'text/html' })
    expect(page.status).toBe(503)
    expect(page.headers.get('retry-after')).toBe('5')
    expect(page.text).toContain('The database is not reachable right now.')
    expect(server!.exitCode).toBeNull()

    await startCluster(pgDir)
    await until('the API serves again', async () => (await owner.get('/api/crews')).status === 200, 30_000)
    expect((await owner.get(`/songs/${songId}`, { accept: 'text/html' })).status).toBe(200)
    const made = await owner.post('/api/crews', { name: 'Made after the outage' })
    expect(made.status, made.text).toBe(201)
    expect((await owner.get('/api/crews')).body.map((c: { name: string }) => c.name)).toContain('Made after the outage')
    // Nothing was written while the database was away.
    expect(await q('SELECT 1 FROM crews WHERE name = $1', ['Made during the outage'])).toHaveLength(0)
    // Still the same process: it was never restarted.
    expect(server!.pid).toBe(pid)
    expect(server!.exitCode).toBeNull()

    // The LISTEN connection came back too: a change reaches the stream opened before the outage.
    try {
      await until('a draft change reaches the stream', async () => {
        const renamed = await writer.patch(`/api/drafts/${draftId}`, { name: `Main ${Date.now() % 1000}` })
        if (renamed.status !== 200) return false
        return events.next('draft', d => d.draftId === draftId, 2000).then(() => true, () => false)
      }, 30_000, 500)
    }
    finally {
      events.close()
    }
  }, 120_000)
})

describe('the fake SMTP server down', () => {
  it('keeps mail in the outbox while it is down and sends it when it is back', async () => {
    await stopChild(smtp!, 'SIGKILL')
    const before = new Set(existsSync(mailboxDir) ? readdirSync(mailboxDir) : [])
    const asked = await new ApiClient(baseUrl).post('/api/auth/forgot', { email: DEMO_EMAILS.writer })
    expect(asked.status, asked.text).toBe(200)

    // The worker tried, failed, and left the message pending with the reason.
    const waiting = await until('a failed delivery attempt is recorded', async () => {
      const [row] = await q(`SELECT status, attempts, last_error FROM outbox WHERE "to" = $1 AND subject ILIKE '%reset%' ORDER BY created_at DESC LIMIT 1`, [DEMO_EMAILS.writer])
      return row && row.attempts >= 1 && row.last_error ? row : undefined
    }, 30_000)
    expect(waiting.status).toBe('pending')
    expect(waiting.last_error).toMatch(/ECONNREFUSED|connect/i)
    await sleep(1500)
    const [still] = await q(`SELECT status FROM outbox WHERE "to" = $1 AND subject ILIKE '%reset%' ORDER BY created_at DESC LIMIT 1`, [DEMO_EMAILS.writer])
    expect(still.status).toBe('pending')

    smtp = await spawnFakeSmtp({ port: smtpPort, dir: mailboxDir })
    const mail = await until('the reset mail arrives', async () => {
      const fresh = readdirSync(mailboxDir).filter(f => f.endsWith('.json') && !before.has(f))
      return fresh.map(f => JSON.parse(readFileSync(resolve(mailboxDir, f), 'utf8'))).find(m => m.envelope.to.includes(DEMO_EMAILS.writer))
    }, 60_000, 300)
    expect(mail.text).toContain('/reset?token=')
    const [sent] = await q(`SELECT status, sent_at FROM outbox WHERE "to" = $1 AND subject ILIKE '%reset%' ORDER BY created_at DESC LIMIT 1`, [DEMO_EMAILS.writer])
    expect(sent.status).toBe('sent')
    expect(sent.sent_at).not.toBeNull()
  }, 120_000)
})

/** Starts a multipart beat upload and sends only its first part, keeping the request open. */
function startSlowUpload(client: ApiClient, songId: string, bytes: Buffer) {
  const boundary = '----barsmith-fault-test'
  const head = Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="half.wav"\r\nContent-Type: audio/wav\r\n\r\n`)
  const req = httpRequest(new URL(`/api/songs/${songId}/beats`, baseUrl), {
    method: 'POST',
    headers: {
      'content-type': `multipart/form-data; boundary=${boundary}`,
      'content-length': String(head.length + bytes.length + boundary.length + 8),
      'cookie': client.cookieHeader,
      'x-forwarded-for': client.address,
    },
  })
  req.on('error', () => {})
  req.write(head)
  req.write(bytes.subarray(0, Math.floor(bytes.length / 3)))
  return req
}

describe('the server killed during an upload', () => {
  it('leaves no partial file under the storage keys, removes the leftover on restart and records no beat', async () => {
    const producer = await demo('producer')
    const songId = await demoSong(producer)
    const [{ n: beatsBefore }] = await q('SELECT count(*)::int AS n FROM beats WHERE song_id = $1', [songId])
    const req = startSlowUpload(producer, songId, smallWav({ bars: 16 }))
    // The half-received file sits in the incoming folder (never under a key) while it arrives.
    const leftover = await until('the upload is being received', async () => existsSync(incoming) && readdirSync(incoming).find(f => f.endsWith('.part')), 20_000, 50)
    await killServer()
    req.destroy()
    expect(readdirSync(incoming)).toContain(leftover)

    await startServer('b')
    await until('the leftover is swept', async () => !readdirSync(incoming).includes(leftover), 20_000)
    const [{ n: beatsAfter }] = await q('SELECT count(*)::int AS n FROM beats WHERE song_id = $1', [songId])
    expect(beatsAfter).toBe(beatsBefore)
    // Every stored beat file belongs to a beat row; nothing half-written sits beside them.
    const songDir = resolve(storageDir, 'beats', songId)
    const stored = existsSync(songDir) ? readdirSync(songDir, { recursive: true }).map(String) : []
    expect(stored.filter(f => f.endsWith('.part'))).toEqual([])
    const ids = new Set((await q('SELECT id FROM beats WHERE song_id = $1', [songId])).map(r => r.id))
    for (const dir of stored.filter(f => !f.includes('/'))) expect(ids.has(dir)).toBe(true)

    // And the next upload works on the restarted server.
    const res = await uploadBeat(producer, songId, smallWav())
    expect(res.status, res.text).toBe(201)
  }, 120_000)
})

/**
 * A whole beat upload over node:http, which reads the answer even when the server answers
 * before the body is sent (fetch reports only a broken pipe then), so a refusal shows why.
 */
function rawUpload(client: ApiClient, songId: string, bytes: Buffer): Promise<{ status: number, text: string, body: any }> {
  const boundary = '----barsmith-fault-long'
  const body = Buffer.concat([
    Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="long.wav"\r\nContent-Type: audio/wav\r\n\r\n`),
    bytes,
    Buffer.from(`\r\n--${boundary}--\r\n`),
  ])
  return new Promise((resolvePromise, reject) => {
    const req = httpRequest(new URL(`/api/songs/${songId}/beats`, baseUrl), {
      method: 'POST',
      headers: { 'content-type': `multipart/form-data; boundary=${boundary}`, 'content-length': String(body.length), 'cookie': client.cookieHeader, 'x-forwarded-for': client.address },
    }, (res) => {
      let text = ''
      res.on('data', (d) => {
        text += d
      })
      res.on('end', () => resolvePromise({ status: res.statusCode!, text, body: text ? JSON.parse(text) : null }))
    })
    req.on('error', reject)
    req.end(body)
  })
}

describe('the server killed during a beat analysis', () => {
  it('runs the abandoned job again after the restart and queues a beat stored without a job: both end ready, none stuck', async () => {
    const producer = await demo('producer')
    const songId = await demoSong(producer)
    // A long beat (invented: 160 bars at 90 BPM, about 7 minutes), so the analysis is still running when killed.
    const res = await rawUpload(producer, songId, smallWav({ bpm: 90, bars: 160 }))
    expect(res.status, res.text).toBe(201)
    const beatId = res.body.id as string
    await until('the analysis starts', async () => {
      const [row] = await q('SELECT status FROM beats WHERE id = $1', [beatId])
      return row?.status === 'analysing'
    }, 60_000, 25)
    await killServer()
    const [killed] = await q('SELECT status FROM beats WHERE id = $1', [beatId])
    expect(killed.status).toBe('analysing')
    // A beat stored just before a kill that came before its job was queued: a row without a job.
    const [orphan] = await q(`INSERT INTO beats (song_id, bounce, uploaded_by, original_name, format, size_bytes, storage_key, status, created_at)
      SELECT song_id, (SELECT max(bounce) + 1 FROM beats WHERE song_id = $2), uploaded_by, 'orphan.wav', format, size_bytes, storage_key, 'queued', now() - interval '2 minutes'
      FROM beats WHERE id = $1 RETURNING id`, [beatId, songId])

    await startServer('c')
    const { beat, seen } = await waitForBeat(await demo('producer'), songId, beatId, 90_000)
    expect(seen.length).toBeGreaterThan(0)
    expect(beat.status, beat.failureReason ?? '').toBe('ready')
    // 90 BPM, set by the synthesized beat (invented test data); the estimator may report the half or double time.
    expect([45, 90, 180].some(b => Math.abs(beat.bpm - b) < 1.5)).toBe(true)
    const [job] = await q(`SELECT state, retry_count FROM pgboss.job WHERE data->>'beatId' = $1 ORDER BY created_on DESC LIMIT 1`, [beatId])
    expect(job.state).toBe('completed')
    expect(job.retry_count).toBeGreaterThanOrEqual(1)
    // The row without a job was queued at the start and analysed too.
    const { beat: found } = await waitForBeat(await demo('producer'), songId, orphan.id, 90_000)
    expect(found.status, found.failureReason ?? '').toBe('ready')
  }, 180_000)
})

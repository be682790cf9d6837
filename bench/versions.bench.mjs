// Saves under 20 concurrent writers, and live event delivery across two server processes
// (NOTIFY on one, server-sent event out of the other). Prints a table and writes
// bench/out/versions.json; the targets are Barsmith's own, nothing here asserts.
import { mkdirSync, openSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import pg from 'pg'
import { startBenchApp } from './lib/app.mjs'
import { randomFreePort } from '../scripts/lib/net.mjs'
import { spawnServer, stopChild } from '../scripts/lib/processes.mjs'
import { dataDir, root } from '../scripts/lib/paths.mjs'

const WRITERS = Number(process.env.BENCH_WRITERS || 20)
const SAVES_EACH = 25
const CONTENDED_SAVES_EACH = 8
const EVENTS = 100
const TARGETS = { saveP95Ms: 250, contendedSaveP95Ms: 400, eventAcrossP95Ms: 100 }

const pct = (values, p) => {
  const sorted = [...values].sort((a, b) => a - b)
  return sorted.length ? sorted[Math.min(sorted.length - 1, Math.ceil(p / 100 * sorted.length) - 1)] : NaN
}
const summary = values => ({ n: values.length, p50: pct(values, 50), p95: pct(values, 95), p99: pct(values, 99), max: Math.max(...values) })
const round = o => Object.fromEntries(Object.entries(o).map(([k, v]) => [k, typeof v === 'number' ? Math.round(v * 10) / 10 : v]))

let ip = 0
/** A signed-in HTTP client with its own address (the bench server trusts X-Forwarded-For). */
async function client(baseUrl, email) {
  const address = `198.51.100.${++ip}`
  const res = await fetch(`${baseUrl}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json', 'x-forwarded-for': address }, body: JSON.stringify({ email, password: process.env.DEMO_PASSWORD || 'barsmith-demo' }) })
  if (res.status !== 200) throw new Error(`sign-in of ${email} failed: ${res.status}`)
  const cookie = res.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
  const call = async (method, path, body, base = baseUrl) => {
    const r = await fetch(`${base}${path}`, { method, headers: { cookie, 'x-forwarded-for': address, ...(body ? { 'content-type': 'application/json' } : {}) }, body: body ? JSON.stringify(body) : undefined })
    const text = await r.text()
    return { status: r.status, body: text ? JSON.parse(text) : null }
  }
  return { cookie, address, call }
}

/** Reads a server-sent event stream and calls `onEvent(type, data, receivedAt)`. */
async function listen(url, who, onEvent) {
  const abort = new AbortController()
  const res = await fetch(url, { headers: { 'cookie': who.cookie, 'x-forwarded-for': who.address, 'accept': 'text/event-stream' }, signal: abort.signal })
  if (res.status !== 200) throw new Error(`event stream answered ${res.status}`)
  void (async () => {
    const reader = res.body.pipeThrough(new TextDecoderStream()).getReader()
    let buffer = ''
    try {
      for (;;) {
        const { value, done } = await reader.read()
        if (done) return
        buffer += value
        let cut
        while ((cut = buffer.indexOf('\n\n')) >= 0) {
          const block = buffer.slice(0, cut)
          buffer = buffer.slice(cut + 2)
          const type = block.match(/^event: (.*)$/m)?.[1]
          const data = block.match(/^data: (.*)$/m)?.[1]
          if (type && data) onEvent(type, JSON.parse(data), performance.now())
        }
      }
    }
    catch { /* closed */ }
  })()
  return () => abort.abort()
}

const line = (i, text) => ({ id: `b${i}`, bar: i + 1, text })
const lyric = (n, tag) => Array.from({ length: 24 }, (_, i) => line(i, `${tag} line ${i + 1} take ${n}`))

const app = await startBenchApp()
let second
try {
  const db = new pg.Client({ connectionString: app.databaseUrl })
  await db.connect()
  const [{ crew_id: crewId }] = (await db.query(`SELECT m.crew_id FROM memberships m JOIN users u ON u.id = m.user_id WHERE u.email = 'owner@barsmith.test'`)).rows
  const emails = Array.from({ length: WRITERS }, (_, i) => `bench-writer-${i}@barsmith.test`)
  for (const email of emails) {
    const [{ id }] = (await db.query(`INSERT INTO users (email, name, password_hash, email_verified_at) SELECT $1, $1, password_hash, now() FROM users WHERE email = 'owner@barsmith.test' RETURNING id`, [email])).rows
    await db.query(`INSERT INTO memberships (crew_id, user_id, role) VALUES ($1, $2, 'writer')`, [crewId, id])
  }
  await db.end()
  const writers = await Promise.all(emails.map(e => client(app.baseUrl, e)))
  const songId = (await writers[0].call('POST', `/api/crews/${crewId}/songs`, { title: 'Bench song' })).body.id

  // 1. Twenty writers saving at once, each on a draft of their own (24 lines per version).
  const own = []
  await Promise.all(writers.map(async (w, k) => {
    const draftId = (await w.call('POST', `/api/songs/${songId}/drafts`, { name: `Bench ${k}` })).body.id
    let base = null
    for (let n = 0; n < SAVES_EACH; n++) {
      const t0 = performance.now()
      const res = await w.call('POST', `/api/drafts/${draftId}/versions`, { baseVersionId: base, lines: lyric(n, `w${k}`) })
      own.push(performance.now() - t0)
      if (res.status !== 201) throw new Error(`save answered ${res.status}`)
      base = res.body.id
    }
  }))

  // 2. The same twenty on one draft: every refused save (409) rebases on the head it returns.
  const shared = (await writers[0].call('POST', `/api/songs/${songId}/drafts`, { name: 'Contended' })).body.id
  const first = await writers[0].call('POST', `/api/drafts/${shared}/versions`, { baseVersionId: null, lines: lyric(0, 'start') })
  const contended = []
  let refused = 0
  let created = 0
  await Promise.all(writers.map(async (w, k) => {
    let base = first.body.id
    for (let n = 0; n < CONTENDED_SAVES_EACH;) {
      const t0 = performance.now()
      const res = await w.call('POST', `/api/drafts/${shared}/versions`, { baseVersionId: base, lines: lyric(n, `c${k}`) })
      contended.push(performance.now() - t0)
      if (res.status === 201) {
        created++
        n++
        base = res.body.id
      }
      else if (res.status === 409) {
        refused++
        base = res.body.data.head.id
      }
      else {
        throw new Error(`save answered ${res.status}`)
      }
    }
  }))

  // 3. Event delivery: a save through process A, its event out of process B (and out of A, for comparison).
  const port = await randomFreePort()
  mkdirSync(resolve(dataDir, 'bench-run'), { recursive: true })
  second = await spawnServer({ port, env: app.env, output: openSync(resolve(dataDir, 'bench-run', 'server-b.log'), 'a') })
  const otherUrl = `http://127.0.0.1:${port}`
  const listener = await client(app.baseUrl, 'listener@barsmith.test')
  const waiting = new Map()
  const arrivals = { across: new Map(), same: new Map() }
  const stops = []
  for (const [where, base] of [['across', otherUrl], ['same', app.baseUrl]]) {
    stops.push(await listen(`${base}/api/songs/${songId}/events`, listener, (type, data, at) => {
      if (type !== 'version') return
      arrivals[where].set(data.versionId, at)
      if (arrivals.across.has(data.versionId) && arrivals.same.has(data.versionId)) waiting.get(data.versionId)?.resolve()
    }))
  }
  await new Promise(r => setTimeout(r, 300))
  const eventDraft = (await writers[0].call('POST', `/api/songs/${songId}/drafts`, { name: 'Events' })).body.id
  let base = null
  const across = []
  const sameProcess = []
  const afterResponseAcross = []
  for (let n = 0; n < EVENTS; n++) {
    const t0 = performance.now()
    let resolveArrival
    const arrived = new Promise(r => (resolveArrival = r))
    // The id is only known from the answer, so events are matched once it comes back.
    const res = await writers[0].call('POST', `/api/drafts/${eventDraft}/versions`, { baseVersionId: base, lines: lyric(n, 'event') })
    const tResponse = performance.now()
    base = res.body.id
    waiting.set(base, { resolve: resolveArrival })
    if (arrivals.across.has(base) && arrivals.same.has(base)) resolveArrival()
    await Promise.race([arrived, new Promise((_, reject) => setTimeout(() => reject(new Error('event did not arrive within 5 s')), 5000))])
    across.push(arrivals.across.get(base) - t0)
    sameProcess.push(arrivals.same.get(base) - t0)
    afterResponseAcross.push(arrivals.across.get(base) - tResponse)
  }
  for (const stop of stops) stop()

  const figures = {
    saves: { writers: WRITERS, savesEach: SAVES_EACH, linesPerVersion: 24, ms: round(summary(own)) },
    contended: { writers: WRITERS, createdEach: CONTENDED_SAVES_EACH, created, refused409: refused, ms: round(summary(contended)) },
    events: {
      samples: EVENTS,
      acrossProcessesMs: round(summary(across)),
      sameProcessMs: round(summary(sameProcess)),
      acrossAfterResponseMs: round(summary(afterResponseAcross)),
      note: 'time from sending the save (through process A) to its "version" event arriving out of process B; "same" is the stream on A',
    },
    targets: TARGETS,
    met: {
      saveP95: summary(own).p95 <= TARGETS.saveP95Ms,
      contendedSaveP95: summary(contended).p95 <= TARGETS.contendedSaveP95Ms,
      eventAcrossP95: summary(across).p95 <= TARGETS.eventAcrossP95Ms,
    },
  }
  console.table({
    'save, 20 writers, own drafts': figures.saves.ms,
    'save, 20 writers, one draft (201+409)': figures.contended.ms,
    'event, save on A → stream on B': figures.events.acrossProcessesMs,
    'event, save on A → stream on A': figures.events.sameProcessMs,
  })
  console.log(`contended: ${created} versions, ${refused} refused with 409 and rebased (each kept aside)`)
  console.log(`targets: save p95 ≤ ${TARGETS.saveP95Ms} ms (${figures.met.saveP95 ? 'met' : 'missed'}), contended p95 ≤ ${TARGETS.contendedSaveP95Ms} ms (${figures.met.contendedSaveP95 ? 'met' : 'missed'}), event across processes p95 ≤ ${TARGETS.eventAcrossP95Ms} ms (${figures.met.eventAcrossP95 ? 'met' : 'missed'})`)
  mkdirSync(resolve(root, 'bench/out'), { recursive: true })
  writeFileSync(resolve(root, 'bench/out/versions.json'), `${JSON.stringify({ bench: 'versions', at: new Date().toISOString(), ...figures }, null, 2)}\n`)
}
finally {
  await stopChild(second)
  await app.stop()
}

// Load on the built server over loopback (autocannon): the lyric analysis as the desk sends
// it while a writer types, the rhyme finder, the song page (/songs/:id, the desk, rendered on
// the server) and a version save, each at 10 and 50 connections. Every run is bounded in
// time (DURATION_S) and in count (MAX_REQUESTS). Prints requests/s, p50/p95/p99 latency and
// errors (socket errors, timeouts and non-2xx answers) and the server's RSS before and after;
// writes bench/out/load.json. Nothing here asserts on time.
import { mkdirSync, writeFileSync } from 'node:fs'
import { loadavg } from 'node:os'
import { resolve } from 'node:path'
import autocannon from 'autocannon'
import { rssMb, signInCookie, startBenchApp } from './lib/app.mjs'

const root = resolve(import.meta.dirname, '..')
const DURATION_S = Number(process.env.BENCH_LOAD_SECONDS || 8)
const MAX_REQUESTS = Number(process.env.BENCH_LOAD_MAX_REQUESTS || 20_000)
const LEVELS = [10, 50]
// Barsmith's own targets at 10 connections (the crew size it is built for); at 50 the
// figures are shown for headroom. Analysis p95 follows issue 4's 15 ms at 20 connections
// relaxed for a changed line on every request; the save follows issue 6's 250 ms.
const TARGETS = {
  analysis: { p95Ms: 50, errors: 0 },
  rhymes: { p95Ms: 50, errors: 0 },
  page: { p95Ms: 500, errors: 0 },
  save: { p95Ms: 250, errors: 0 },
}

const load = () => Number(loadavg()[0].toFixed(2))
const pct = (values, p) => {
  const s = [...values].sort((a, b) => a - b)
  return s.length ? s[Math.min(s.length - 1, Math.ceil(p / 100 * s.length) - 1)] : Number.NaN
}
const r1 = x => Math.round(x * 10) / 10

// An invented 32-bar verse and hook (demo text, no real lyrics).
const VERSE = [
  'Porch light flicker and the kettle on the boil', 'Counting up the minutes till the sirens start to coil', 'Notebook on my knee and the beat is running slow',
  'Every little corner got a story I should know', 'Bass line walking like it owns the avenue', 'Tryna catch the rhythm that my uncle used to do',
  'Paper planes and promises, I fold them into gold', 'Whisper to the window what the morning never told',
]
const HOOK = ['Hold the line, hold the line tonight', 'Every bar a lantern and we carry it right', 'Hold the line, hold it till the dawn', 'Sing it to the skyline and we\'re gone']
const baseLines = []
for (let i = 0; baseLines.length < 32; i++) baseLines.push({ id: `l${baseLines.length}`, bar: baseLines.length + 1, text: (i % 12 < 8 ? VERSE[i % 8] : HOOK[i % 4]) })
const WORDS = ['again', 'tonight', 'slow', 'bright', 'home', 'alone', 'ready', 'steady', 'city', 'rain', 'window', 'shadow', 'echo', 'daylight', 'hustle', 'rhythm', 'corner', 'candle', 'gold', 'cold', 'road', 'soul', 'lantern', 'skyline']
/** Request n: one line gains a word, as the desk sends the draft while someone types (the response cache misses). */
const typedLines = (n) => {
  const k = n % baseLines.length
  const word = WORDS[Math.floor(n / baseLines.length) % WORDS.length]
  const round = Math.floor(n / (baseLines.length * WORDS.length))
  return baseLines.map((l, i) => (i === k ? { ...l, text: `${l.text} ${word}${round ? ` ${round}` : ''}` } : l))
}

function cannon(opts) {
  return new Promise((resolvePromise, reject) => {
    const latencies = []
    const statuses = {}
    const instance = autocannon({ duration: DURATION_S, maxOverallRequests: MAX_REQUESTS, timeout: 10, ...opts }, (error, result) => (error ? reject(error) : resolvePromise({ result, latencies, statuses })))
    instance.on('response', (client, statusCode, bytes, ms) => {
      latencies.push(ms)
      statuses[statusCode] = (statuses[statusCode] ?? 0) + 1
    })
  })
}

const app = await startBenchApp()
const runs = []
let rssStartMb
let rssEndMb
try {
  const writerCookie = await signInCookie(app.baseUrl, 'writer@barsmith.test')
  const json = { 'content-type': 'application/json' }
  const get = async (path) => {
    const res = await fetch(`${app.baseUrl}${path}`, { headers: { cookie: writerCookie } })
    if (res.status !== 200) throw new Error(`${path} answered ${res.status}`)
    return res.json()
  }
  const crews = await get('/api/crews')
  const crewId = crews[0].id
  const songs = await get(`/api/crews/${crewId}/songs`)
  const songId = songs[0].id
  // One draft per connection for the saves, so each save is based on its own draft's head (a
  // contended draft answers 409 by design; versions.bench.mjs measures that case).
  const drafts = []
  for (let i = 0; i < Math.max(...LEVELS) + 10; i++) {
    const res = await fetch(`${app.baseUrl}/api/songs/${songId}/drafts`, { method: 'POST', headers: { ...json, cookie: writerCookie }, body: JSON.stringify({ name: `Load ${i + 1}` }) })
    if (res.status !== 201) throw new Error(`draft creation answered ${res.status} ${await res.text()}`)
    drafts.push({ id: (await res.json()).id, base: null })
  }
  // Let the server finish its start-up warm-up (finder index, analysis).
  await new Promise(r => setTimeout(r, 1500))

  let n = 0
  const scenarios = {
    analysis: () => ({
      url: `${app.baseUrl}/api/analysis`, method: 'POST', headers: { ...json, 'cookie': writerCookie, 'accept-encoding': 'gzip, deflate, br' },
      requests: [{ setupRequest: req => ({ ...req, body: JSON.stringify({ crewId, lines: typedLines(n++), grid: { bpm: 90, beatsPerBar: 4 }, sections: [{ id: 'all', startBar: 1, endBar: 32, kind: 'verse' }] }) }) }],
    }),
    rhymes: () => ({
      url: `${app.baseUrl}/api/rhymes`, headers: { cookie: writerCookie },
      requests: [{ setupRequest: req => ({ ...req, path: `/api/rhymes?q=${encodeURIComponent(WORDS[n++ % WORDS.length])}&crewId=${crewId}` }) }],
    }),
    page: () => ({
      url: `${app.baseUrl}/songs/${songId}`, headers: { 'cookie': writerCookie, 'accept': 'text/html', 'accept-encoding': 'gzip, deflate, br' },
    }),
    save: async () => {
      // Saves cut off at the end of the previous run may still have landed: start from each draft's real head.
      const heads = new Map((await get(`/api/songs/${songId}/drafts`)).map(d => [d.id, d.headVersionId ?? null]))
      for (const d of drafts) d.base = heads.get(d.id) ?? d.base
      // A connection takes a free draft for each save and gives it back with the new head.
      const free = [...drafts]
      return {
        url: `${app.baseUrl}/api/drafts/x/versions`, method: 'POST', headers: { ...json, cookie: writerCookie },
        requests: [{
          setupRequest: (req, context) => {
            context.draft = free.shift() ?? drafts[n % drafts.length]
            const take = n++
            return { ...req, path: `/api/drafts/${context.draft.id}/versions`, body: JSON.stringify({ baseVersionId: context.draft.base, lines: typedLines(take).slice(0, 24) }) }
          },
          onResponse: (status, body, context) => {
            try {
              if (status === 201) context.draft.base = JSON.parse(body).id ?? context.draft.base
              // Counted as an error; the next save on this draft rebases on the head it names.
              if (status === 409) context.draft.base = JSON.parse(body).data?.head?.id ?? context.draft.base
            }
            catch { /* kept */ }
            free.push(context.draft)
          },
        }],
      }
    },
  }
  // Warm each route once so the first run does not carry the first-request costs.
  for (const name of Object.keys(scenarios)) await cannon({ ...(await scenarios[name]()), connections: 2, duration: 1, maxOverallRequests: 20 })

  rssStartMb = await rssMb(app.serverPid)
  for (const connections of LEVELS) {
    for (const name of Object.keys(scenarios)) {
      const rssBefore = await rssMb(app.serverPid)
      const loadBefore = load()
      const { result, latencies, statuses } = await cannon({ ...(await scenarios[name]()), connections })
      const rssAfter = await rssMb(app.serverPid)
      const errors = result.errors + result.timeouts + result.non2xx
      const run = {
        scenario: name, connections, durationS: DURATION_S, maxRequests: MAX_REQUESTS,
        requests: result.requests.total, rps: r1(result.requests.average),
        p50Ms: r1(pct(latencies, 50)), p95Ms: r1(pct(latencies, 95)), p99Ms: r1(pct(latencies, 99)), maxMs: r1(Math.max(...latencies)),
        errors, statuses, bytesPerResponse: Math.round(result.throughput.total / Math.max(1, result.requests.total)),
        rssBeforeMb: r1(rssBefore), rssAfterMb: r1(rssAfter), loadAvgBefore: loadBefore, loadAvgAfter: load(),
      }
      runs.push(run)
      console.log(`${name.padEnd(8)} ${String(connections).padStart(2)} conn  ${String(run.requests).padStart(6)} req  ${String(run.rps).padStart(7)} req/s  p50 ${run.p50Ms} / p95 ${run.p95Ms} / p99 ${run.p99Ms} ms  errors ${errors}  RSS ${run.rssBeforeMb} → ${run.rssAfterMb} MB  load ${run.loadAvgAfter}`)
    }
  }
  rssEndMb = await rssMb(app.serverPid)
}
finally {
  await app.stop()
}

const at10 = name => runs.find(r => r.scenario === name && r.connections === 10)
const report = Object.entries(TARGETS).flatMap(([name, t]) => {
  const r = at10(name)
  return [
    { what: `${name}, 10 connections, p95`, value: r.p95Ms, unit: 'ms', target: `≤ ${t.p95Ms} ms`, met: r.p95Ms <= t.p95Ms },
    { what: `${name}, 10 connections, errors`, value: r.errors, unit: '', target: `${t.errors}`, met: r.errors <= t.errors },
  ]
})
const figures = {
  bench: 'load', at: new Date().toISOString(), durationS: DURATION_S, maxRequests: MAX_REQUESTS, levels: LEVELS,
  targets: TARGETS, runs, rss: { startMb: r1(rssStartMb), endMb: r1(rssEndMb), growthMb: r1(rssEndMb - rssStartMb) }, report,
}
console.log(`server RSS ${figures.rss.startMb} → ${figures.rss.endMb} MB over all runs`)
for (const row of report) console.log(`${row.what}: ${row.value}${row.unit ? ` ${row.unit}` : ''} (target ${row.target}) ${row.met ? 'met' : 'MISSED'}`)
mkdirSync(resolve(root, 'bench/out'), { recursive: true })
writeFileSync(resolve(root, 'bench/out/load.json'), `${JSON.stringify(figures, null, 2)}\n`)
console.log('wrote bench/out/load.json')

// The vocal map over HTTP against the built server: how long the producer's main screen takes
// for a long draft (every bar analysed by the prosody engine, with open alts and out lines),
// alone and compared with a second draft.
import { mkdirSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { rssMb, signInCookie, startBenchApp } from './lib/app.mjs'

const BARS = 128
const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 40)
// Targets for a shared 2-core machine: the map redraws within a glance after a save.
const TARGETS = { mapP95Ms: 300, compareP95Ms: 600 }

const app = await startBenchApp()
try {
  const cookies = {}
  for (const role of ['writer', 'producer', 'cowriter']) cookies[role] = await signInCookie(app.baseUrl, `${role}@barsmith.test`)
  const call = async (role, method, path, body) => {
    const res = await fetch(`${app.baseUrl}${path}`, { method, headers: { cookie: cookies[role], ...(body ? { 'content-type': 'application/json' } : {}) }, body: body ? JSON.stringify(body) : undefined })
    const data = await res.json()
    if (res.status >= 400) throw new Error(`${method} ${path} → ${res.status} ${JSON.stringify(data)}`)
    return data
  }
  const [crew] = await call('writer', 'GET', '/api/crews')
  const song = await call('writer', 'POST', `/api/crews/${crew.id}/songs`, { title: 'Bench map' })
  for (let s = 0; s < BARS / 16; s++) {
    await call('producer', 'POST', `/api/songs/${song.id}/sections`, { kind: s % 2 ? 'hook' : 'verse', startBar: s * 16 + 1, endBar: s * 16 + 16 })
  }
  // Invented bench lyric: two lines on some bars, a line over two bars, ad-libs, out lines.
  const words = ['night', 'light', 'bus', 'rain', 'train', 'home', 'alone', 'street', 'beat', 'count', 'sound', 'ground', 'corner', 'window']
  const lines = []
  for (let bar = 1; bar <= BARS; bar++) {
    if (bar % 16 === 0) continue
    const text = Array.from({ length: 6 + (bar % 5) }, (_, k) => words[(bar * 3 + k * 5) % words.length]).join(' ')
    lines.push({ id: `m${bar}`, bar, text: bar % 7 === 0 ? `${text} (yeah)` : text, ...(bar % 9 === 0 ? { bars: 2 } : {}), ...(bar % 11 === 0 ? { out: true } : {}) })
    if (bar % 4 === 0) lines.push({ id: `m${bar}b`, bar, text: '(uh, uh)' })
  }
  const a = await call('writer', 'POST', `/api/songs/${song.id}/drafts`, { name: 'Take A' })
  await call('writer', 'POST', `/api/drafts/${a.id}/versions`, { baseVersionId: null, lines })
  const b = await call('writer', 'POST', `/api/songs/${song.id}/drafts`, { name: 'Take B' })
  await call('writer', 'POST', `/api/drafts/${b.id}/versions`, { baseVersionId: null, lines: lines.map((l, i) => (i % 5 === 0 ? { ...l, text: `${l.text} again` } : l)) })
  for (let i = 0; i < 20; i++) await call('cowriter', 'POST', `/api/drafts/${a.id}/alts`, { lineId: lines[i * 5].id, text: `another way to say it ${i}` })

  const time = async (fn) => {
    const t = performance.now()
    await fn()
    return performance.now() - t
  }
  const pct = (xs, p) => [...xs].sort((x, y) => x - y)[Math.min(xs.length - 1, Math.floor(p * xs.length))]
  // Warm up first: the engine loads the CMU dictionary once (about 60 MB) and the heap grows to
  // its working size over the first hundred or so calls; growth after that would be a leak.
  for (let i = 0; i < 100; i++) await call('producer', 'GET', `/api/songs/${song.id}/vocal-map?draftId=${a.id}${i % 2 ? `&compare=${b.id}` : ''}`)
  const rssBefore = await rssMb(app.serverPid)
  const map = []
  const compare = []
  let sample
  for (let i = 0; i < ROUNDS; i++) {
    map.push(await time(async () => {
      sample = await call('producer', 'GET', `/api/songs/${song.id}/vocal-map?draftId=${a.id}`)
    }))
    compare.push(await time(() => call('producer', 'GET', `/api/songs/${song.id}/vocal-map?draftId=${a.id}&compare=${b.id}`)))
  }
  const rssAfter = await rssMb(app.serverPid)
  const figures = {
    bars: sample.bars.length, lines: lines.length, rounds: ROUNDS,
    mapP50Ms: pct(map, 0.5), mapP95Ms: pct(map, 0.95),
    compareP50Ms: pct(compare, 0.5), compareP95Ms: pct(compare, 0.95),
    rssBeforeMb: rssBefore, rssAfterMb: rssAfter, rssGrowthMb: rssAfter - rssBefore,
  }
  const rows = [
    [`Vocal map (${figures.bars} bars, ${lines.length} lines)`, figures.mapP50Ms, figures.mapP95Ms, TARGETS.mapP95Ms],
    ['Vocal map compared with a second draft', figures.compareP50Ms, figures.compareP95Ms, TARGETS.compareP95Ms],
  ]
  console.table(rows.map(([what, p50, p95, target]) => ({ what, 'p50 ms': p50.toFixed(1), 'p95 ms': p95.toFixed(1), 'target p95 ms': target, 'met': p95 <= target ? 'yes' : 'NO' })))
  // RSS follows the collector's rhythm (±70 MB between runs here), so it is shown, not held to a target.
  console.log(`server RSS ${rssBefore.toFixed(0)} → ${rssAfter.toFixed(0)} MB after the warm-up (${figures.rssGrowthMb.toFixed(1)} MB)`)
  mkdirSync(resolve('bench/out'), { recursive: true })
  writeFileSync(resolve('bench/out/vocal-map.json'), JSON.stringify({ figures, targets: TARGETS }, null, 2))
}
finally {
  await app.stop()
}

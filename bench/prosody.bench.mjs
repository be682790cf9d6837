// Prosody engine figures in one run: dictionary load and index time and heap, analysis of a
// 64-bar invented lyric in-process and over HTTP (20 connections, autocannon), rhyme finder
// query time, and the npm `syllable` and `rhymes` packages on the same text and words.
// Prints a table and writes bench/out/prosody.json. Nothing here asserts on time.
import { mkdirSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import autocannon from 'autocannon'
import { build } from 'esbuild'
import { startBenchApp, signInCookie } from './lib/app.mjs'

const root = resolve(import.meta.dirname, '..')
const outDir = resolve(root, 'bench/out')
mkdirSync(outDir, { recursive: true })

// The engine as the server runs it: bundled from its TypeScript (dictionary kept external).
const bundle = resolve(outDir, 'prosody-engine.mjs')
await build({
  stdin: { contents: 'export * from "./server/utils/prosody/analyse"; export * from "./server/utils/prosody/finder"; export * from "./server/utils/prosody/dictionary"', resolveDir: root, loader: 'ts' },
  bundle: true, platform: 'node', format: 'esm', external: ['cmu-pronouncing-dictionary'], outfile: bundle, logLevel: 'warning',
})

const mb = () => process.memoryUsage().heapUsed / 1048576
global.gc?.()
const heap0 = mb()
let t = performance.now()
const { dictionary } = await import('cmu-pronouncing-dictionary')
const loadMs = performance.now() - t
const heapDict = mb()
t = performance.now()
const engine = await import(bundle)
const engineImportMs = performance.now() - t
t = performance.now()
engine.dictionaryPronunciations('warmup')
const lookupIndexMs = performance.now() - t
t = performance.now()
const idx = engine.finderIndex()
const finderIndexMs = performance.now() - t
global.gc?.()
const heapAll = mb()

// An invented 64-bar lyric: ~100 lines, hooks repeated, ad-libs, numbers, slang.
const verse = [
  'Night bus home with the window fogged up tight', 'Counting every streetlight like a metronome at night', 'Got my notebook open and my 808 on loud (skrrt)',
  'Lamplight on the pages while I\'m drifting through the crowd', 'Runnin\' through the city with a rhythm in my chest', 'Tryna find a way to put the restless thoughts to rest',
  'Stagelight dreams since \'96, I never took a break', 'Every line I\'m writing is a promise I can make', 'Bounce it off the bricks until the echo sounds like gold (yeah)',
  'Stories from the corner that my grandma never told', 'Money coming funny but the honey never stays', 'Sipping lemonade while I\'m plotting renegade ways',
  'They call me a poet and the people know it', 'Got a seed of something and I\'m patient while I grow it', 'Twenty-four/seven on the grind until it\'s done', 'Chasing down the morning till I\'m racing with the sun',
]
const hook = ['Ride the night bus, ride the night bus home', 'Every stop a story and I\'m never on my own (uh)', 'Ride the night bus, ride it till the dawn', 'Write it on the window and I\'m gone, gone, gone']
const lines = []
let bar = 1
for (let section = 0; section < 4; section++) {
  for (const text of verse) lines.push({ id: `v${section}-${lines.length}`, bar: bar++, text })
  for (let r = 0; r < 2; r++) for (const text of hook) lines.push({ id: `h${section}-${lines.length}`, bar: bar, text: text }) && (bar += (lines.length % 2 === 0 ? 1 : 0))
}
while (lines.length > 100) lines.pop()
const maxBar = Math.max(...lines.map(l => l.bar))
const input = { lines, grid: { bpm: 90, beatsPerBar: 4 }, sections: [{ id: 'all', startBar: 1, endBar: maxBar, kind: 'verse' }] }

function median(xs) {
  const s = [...xs].sort((a, b) => a - b)
  return s[Math.floor(s.length / 2)]
}
function pct(xs, p) {
  const s = [...xs].sort((a, b) => a - b)
  return s[Math.min(s.length - 1, Math.floor(s.length * p))]
}

// In-process analysis: cold (first call, resolution caches empty) and warm.
t = performance.now()
const first = engine.analyseDraft(input)
const coldMs = performance.now() - t
const warm = []
for (let i = 0; i < 300; i++) {
  const s = performance.now()
  engine.analyseDraft(input)
  warm.push(performance.now() - s)
}
const totalSyllables = first.lines.reduce((n, l) => n + l.syllables, 0)

// Finder queries, warm.
const queries = ['day', 'money', 'night', 'flow', 'lemonade', 'know it', 'orange', 'home', 'poet', 'city']
const finderTimes = []
for (let r = 0; r < 20; r++) {
  for (const q of queries) {
    const s = performance.now()
    engine.findRhymes(q)
    finderTimes.push(performance.now() - s)
  }
}

// Comparison packages on the same text and words.
const { syllable } = await import('syllable')
const words = lines.flatMap(l => l.text.replace(/\([^)]*\)/g, ' ').split(/[^A-Za-z0-9']+/).filter(Boolean))
const sylTimes = []
let sylTotal = 0
for (let i = 0; i < 300; i++) {
  const s = performance.now()
  sylTotal = 0
  for (const l of lines) sylTotal += syllable(l.text.replace(/\([^)]*\)/g, ' '))
  sylTimes.push(performance.now() - s)
}
let rhymesLoadMs = null
const rhymesTimes = []
try {
  t = performance.now()
  const rhymes = (await import('rhymes')).default
  rhymes('warm')
  rhymesLoadMs = performance.now() - t
  for (let r = 0; r < 3; r++) {
    for (const q of queries.filter(q => !q.includes(' '))) {
      const s = performance.now()
      rhymes(q)
      rhymesTimes.push(performance.now() - s)
    }
  }
}
catch (error) {
  console.log('[bench] rhymes package failed:', error.message)
}

// Over HTTP on loopback: 20 connections for 10 s.
const app = await startBenchApp()
let http
try {
  const cookie = await signInCookie(app.baseUrl, 'writer@barsmith.test')
  const body = JSON.stringify(input)
  const warmRes = await fetch(`${app.baseUrl}/api/analysis`, { method: 'POST', headers: { cookie, 'content-type': 'application/json' }, body })
  if (warmRes.status !== 200) throw new Error(`warm-up answered ${warmRes.status}`)
  const result = await autocannon({ url: `${app.baseUrl}/api/analysis`, method: 'POST', connections: 20, duration: 10, headers: { cookie, 'content-type': 'application/json' }, body })
  http = { requests: result.requests.total, p50: result.latency.p50, p95: result.latency.p97_5 !== undefined ? null : null, p975: result.latency.p97_5, p99: result.latency.p99, errors: result.errors + result.non2xx, rps: result.requests.average }
  // autocannon reports p97.5, not p95: measure p95 with our own sample of sequential-20 bursts too.
  const sample = []
  for (let burst = 0; burst < 25; burst++) {
    await Promise.all(Array.from({ length: 20 }, async () => {
      const s = performance.now()
      const r = await fetch(`${app.baseUrl}/api/analysis`, { method: 'POST', headers: { cookie, 'content-type': 'application/json' }, body })
      await r.arrayBuffer()
      sample.push(performance.now() - s)
    }))
  }
  http.p95 = pct(sample, 0.95)
  http.p50Sample = median(sample)
}
finally {
  await app.stop()
}

const figures = {
  dictionary: { loadMs: loadMs, lookupIndexMs, finderIndexMs: finderIndexMs, loadAndIndexMs: loadMs + lookupIndexMs + finderIndexMs, engineImportMs, heapDictionaryMb: heapDict - heap0, heapAllMb: heapAll - heap0, finderEntries: idx.words.length, target: { ms: 400, heapMb: 80 } },
  analysisInProcess: { lines: lines.length, bars: maxBar, syllables: totalSyllables, families: first.families.length, coldMs, warmMedianMs: median(warm), warmP95Ms: pct(warm, 0.95), target: { warmMedianMs: 1 } },
  analysisHttp: { connections: 20, ...http, target: { p95Ms: 15, errors: 0 } },
  finder: { queries: queries.length, medianMs: median(finderTimes), p95Ms: pct(finderTimes, 0.95) },
  npmSyllable: { words: words.length, syllables: sylTotal, medianMs: median(sylTimes) },
  npmRhymes: { loadMs: rhymesLoadMs, medianMs: rhymesTimes.length ? median(rhymesTimes) : null },
  ours: { syllables: totalSyllables },
}
const f = (x, d = 2) => (x === null || x === undefined ? '—' : Number(x).toFixed(d))
const rows = [
  ['dictionary import (cmu-pronouncing-dictionary)', `${f(loadMs, 0)} ms`, `heap +${f(heapDict - heap0, 1)} MB`],
  ['lookup index (in place, own properties)', `${f(lookupIndexMs, 2)} ms`, ''],
  ['rhyme finder index (lazy, once)', `${f(finderIndexMs, 0)} ms`, `${idx.words.length} entries`],
  ['load + index total (target ≤ 400 ms, ≤ 80 MB)', `${f(loadMs + lookupIndexMs + finderIndexMs, 0)} ms`, `heap +${f(heapAll - heap0, 1)} MB`],
  [`analysis in-process, ${lines.length} lines / ${maxBar} bars, cold`, `${f(coldMs)} ms`, ''],
  ['analysis in-process, warm median (target ≤ 1 ms)', `${f(median(warm), 3)} ms`, `p95 ${f(pct(warm, 0.95), 3)} ms`],
  ['analysis over HTTP, 20 conn, p50 (autocannon)', `${f(http.p50, 1)} ms`, `${http.requests} req, ${f(http.rps, 0)} req/s`],
  ['analysis over HTTP, 20 in flight, p95 (target ≤ 15 ms)', `${f(http.p95, 1)} ms`, `p97.5 autocannon ${f(http.p975, 1)} ms`],
  ['analysis over HTTP, errors (target 0)', `${http.errors}`, ''],
  ['rhyme finder query, warm median', `${f(median(finderTimes), 3)} ms`, `p95 ${f(pct(finderTimes, 0.95), 3)} ms`],
  ['npm syllable on the same lines, median', `${f(median(sylTimes), 3)} ms`, `${sylTotal} syllables vs ours ${totalSyllables}`],
  ['npm rhymes, load / query median', `${f(rhymesLoadMs, 0)} ms / ${f(rhymesTimes.length ? median(rhymesTimes) : null, 2)} ms`, ''],
]
const w0 = Math.max(...rows.map(r => r[0].length))
const w1 = Math.max(...rows.map(r => r[1].length))
for (const r of rows) console.log(`${r[0].padEnd(w0)}  ${r[1].padStart(w1)}  ${r[2]}`)
writeFileSync(resolve(outDir, 'prosody.json'), `${JSON.stringify(figures, null, 2)}\n`)
console.log(`\nwrote bench/out/prosody.json (dictionary ${Object.keys(dictionary).length} keys)`)

// Prosody engine figures in one run: dictionary load and index time and heap, analysis of a
// 64-bar invented lyric in-process and over HTTP (20 connections, autocannon), rhyme finder
// query time, and the npm `syllable` and `rhymes` packages on the same text and words.
// Each analysis figure comes twice: "identical" sends the same draft every time (the response
// cache answers), "typing" changes one line per request as the lyric desk does while a writer
// types (the cache misses; only the unchanged lines' facts are reused). The machine's load
// average is printed beside every figure: other work on the same cores inflates wall times,
// so CPU time is shown too. Prints a table and writes bench/out/prosody.json. Nothing here
// asserts on time.
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { loadavg } from 'node:os'
import { resolve } from 'node:path'
import autocannon from 'autocannon'
import { build } from 'esbuild'
import { startBenchApp, signInCookie } from './lib/app.mjs'

const root = resolve(import.meta.dirname, '..')
const outDir = resolve(root, 'bench/out')
mkdirSync(outDir, { recursive: true })
const load = () => Number(loadavg()[0].toFixed(2))
const cpuMs = (from) => {
  const u = process.cpuUsage(from)
  return (u.user + u.system) / 1000
}

// The engine as the server runs it: bundled from its TypeScript (the dictionary's data file is
// read at run time, as in the built server).
const bundle = resolve(outDir, 'prosody-engine.mjs')
await build({
  stdin: { contents: 'export * from "./server/utils/prosody/analyse"; export * from "./server/utils/prosody/finder"; export * from "./server/utils/prosody/dictionary"; export * from "./server/utils/prosody/response"', resolveDir: root, loader: 'ts' },
  bundle: true, platform: 'node', format: 'esm', external: ['cmu-pronouncing-dictionary', 'lru-cache'], outfile: bundle, logLevel: 'warning',
})

// Load and index: the engine's modules (word lists, letter-to-sound rules), the dictionary's
// data file read and indexed, and the rhyme finder's index.
const mb = () => process.memoryUsage().heapUsed / 1048576
global.gc?.()
const heap0 = mb()
let t = performance.now()
let c = process.cpuUsage()
const engine = await import(bundle)
const engineImportMs = performance.now() - t
const engineImportCpuMs = cpuMs(c)
t = performance.now()
c = process.cpuUsage()
const dictionaryMs = engine.dictionaryLoadMs()
const dictionaryWallMs = performance.now() - t
const dictionaryCpuMs = cpuMs(c)
global.gc?.()
const heapDict = mb()
t = performance.now()
c = process.cpuUsage()
const idx = engine.finderIndex()
const finderIndexMs = performance.now() - t
const finderIndexCpuMs = cpuMs(c)
global.gc?.()
const heapAll = mb()
const loadLoad = load()
const totalMs = engineImportMs + dictionaryWallMs + finderIndexMs
const totalCpuMs = engineImportCpuMs + dictionaryCpuMs + finderIndexCpuMs

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

// "Typing": request n adds one word to one line, a different (line, word) pair each time.
const TYPED = ['again', 'tonight', 'slow', 'bright', 'home', 'alone', 'ready', 'steady', 'flowing', 'glowing', 'city', 'pity', 'rain', 'lane', 'moving', 'proving',
  'window', 'shadow', 'echo', 'ghetto', 'daylight', 'stagelight', 'hustle', 'muscle', 'rhythm', 'with them', 'heavy', 'levy', 'corner', 'mourner', 'candle', 'handle',
  'yeah', 'uh', 'okay', 'runnin\'', 'tryna', 'y\'all', 'skrrt', '808', 'nineteen', 'gold', 'cold', 'told', 'soul', 'road', 'zorbleen', 'quixotic', 'lemonade', 'renegade']
const typedInput = (n) => {
  const k = n % lines.length
  const word = TYPED[Math.floor(n / lines.length) % TYPED.length]
  const round = Math.floor(n / (lines.length * TYPED.length))
  return { ...input, lines: lines.map((l, i) => (i === k ? { ...l, text: `${l.text} ${word}${round ? ` ${word}` : ''}` } : l)) }
}

function median(xs) {
  const s = [...xs].sort((a, b) => a - b)
  return s[Math.floor(s.length / 2)]
}
function pct(xs, p) {
  const s = [...xs].sort((a, b) => a - b)
  return s[Math.min(s.length - 1, Math.floor(s.length * p))]
}
function timed(n, fn) {
  const times = []
  const c0 = process.cpuUsage()
  for (let i = 0; i < n; i++) {
    const s = performance.now()
    fn(i)
    times.push(performance.now() - s)
  }
  return { medianMs: median(times), p95Ms: pct(times, 0.95), cpuMeanMs: cpuMs(c0) / n, loadAvg: load() }
}

// In-process: cold (first call, caches empty), then warm.
t = performance.now()
const first = engine.analyseDraft(input)
const coldMs = performance.now() - t
const totalSyllables = first.lines.reduce((n, l) => n + l.syllables, 0)
for (let i = 0; i < 50; i++) engine.analyseDraft(input)
const inProcess = {
  // analyseDraft alone (the object the engine returns): every line's facts come from the line cache
  identical: timed(500, () => engine.analyseDraft(input)),
  typing: timed(500, i => engine.analyseDraft(typedInput(100_000 + i))),
  // The route's whole path to JSON text: response cache hit, or analysis + serialisation
  responseIdentical: timed(500, () => engine.analysisResponse(input, undefined, 'words')),
  responseTyping: timed(500, i => engine.analysisResponse(typedInput(200_000 + i), undefined, 'words')),
}
const bytesWords = engine.analysisResponse(input, undefined, 'words').length
const bytesFull = engine.analysisResponse(input, undefined, 'full').length

// Finder queries, warm.
const queries = ['day', 'money', 'night', 'flow', 'lemonade', 'know it', 'orange', 'home', 'poet', 'city']
const finder = timed(200, i => engine.findRhymes(queries[i % queries.length]))

// Comparison packages on the same text and words.
const { syllable } = await import('syllable')
const words = lines.flatMap(l => l.text.replace(/\([^)]*\)/g, ' ').split(/[^A-Za-z0-9']+/).filter(Boolean))
let sylTotal = 0
const npmSyllable = timed(300, () => {
  sylTotal = 0
  for (const l of lines) sylTotal += syllable(l.text.replace(/\([^)]*\)/g, ' '))
})
let rhymesLoadMs = null
let npmRhymes = null
try {
  t = performance.now()
  const rhymes = (await import('rhymes')).default
  rhymes('warm')
  rhymesLoadMs = performance.now() - t
  const single = queries.filter(q => !q.includes(' '))
  npmRhymes = timed(single.length * 3, i => rhymes(single[i % single.length]))
}
catch (error) {
  console.log('[bench] rhymes package failed:', error.message)
}

// Over HTTP on loopback: 20 connections for 10 s per mode, as the desk sends it (with the
// crew's id, so the crew check and its lexicon are read on every request; one run without
// it shows what those two queries cost).
const serverCpuMs = (pid) => {
  const f = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ')
  return (Number(f[11]) + Number(f[12])) * 1000 / 100
}
function cannon(opts) {
  return new Promise((resolvePromise, reject) => {
    const latencies = []
    const instance = autocannon(opts, (error, result) => (error ? reject(error) : resolvePromise({ result, latencies })))
    instance.on('response', (client, statusCode, bytes, ms) => latencies.push(ms))
  })
}
const app = await startBenchApp()
const http = {}
try {
  const cookie = await signInCookie(app.baseUrl, 'writer@barsmith.test')
  const crews = await (await fetch(`${app.baseUrl}/api/crews`, { headers: { cookie } })).json()
  const crewId = crews.find(x => x.name === 'Lamplight Collective')?.id ?? crews[0].id
  // As a browser sends it (it accepts Brotli and gzip); the plain runs show the uncompressed cost.
  const headers = { 'cookie': cookie, 'content-type': 'application/json', 'accept-encoding': 'gzip, deflate, br' }
  const plainHeaders = { ...headers, 'accept-encoding': 'identity' }
  const body = JSON.stringify({ ...input, crewId })
  // Let the server finish its start-up warm-up (finder index) first.
  await new Promise(r => setTimeout(r, 1500))
  for (let i = 0; i < 30; i++) {
    const res = await fetch(`${app.baseUrl}/api/analysis`, { method: 'POST', headers, body: i % 2 ? body : JSON.stringify({ ...typedInput(900_000 + i), crewId }) })
    if (res.status !== 200) throw new Error(`warm-up answered ${res.status}`)
    await res.arrayBuffer()
  }
  let n = 0
  const typing = { requests: [{ setupRequest: req => ({ ...req, body: JSON.stringify({ ...typedInput(n++), crewId }) }) }] }
  const modes = {
    identical: { body },
    typing,
    identicalUncompressed: { body, headers: plainHeaders },
    identicalWithoutCrew: { body: JSON.stringify(input) },
    typingUncompressed: { ...typing, headers: plainHeaders },
  }
  for (const [mode, extra] of Object.entries(modes)) {
    const cpu0 = serverCpuMs(app.serverPid)
    const { result, latencies } = await cannon({ url: `${app.baseUrl}/api/analysis`, method: 'POST', connections: 20, duration: 10, headers, ...extra })
    const requests = result.requests.total
    http[mode] = {
      requests, rps: result.requests.average, p50Ms: median(latencies), p95Ms: pct(latencies, 0.95), p99Ms: pct(latencies, 0.99),
      p975AutocannonMs: result.latency.p97_5, errors: result.errors + result.non2xx + result.timeouts, bytesPerResponse: Math.round(result.throughput.total / Math.max(1, requests)),
      serverCpuMsPerRequest: (serverCpuMs(app.serverPid) - cpu0) / Math.max(1, requests), loadAvg: load(),
    }
  }
  // For scale: the cheapest route on the same server, same connections.
  const { result: health, latencies: hl } = await cannon({ url: `${app.baseUrl}/api/health`, connections: 20, duration: 3 })
  http.healthForScale = { rps: health.requests.average, p50Ms: median(hl), p95Ms: pct(hl, 0.95), loadAvg: load() }
}
finally {
  await app.stop()
}

const figures = {
  dictionary: {
    engineImportMs, engineImportCpuMs, dictionaryReadAndIndexMs: dictionaryMs, dictionaryCpuMs, finderIndexMs, finderIndexCpuMs,
    loadAndIndexMs: totalMs, loadAndIndexCpuMs: totalCpuMs, heapDictionaryMb: heapDict - heap0, heapAllMb: heapAll - heap0,
    finderEntries: idx.words.length, dictionaryKeys: engine.dictionarySize(), loadAvg: loadLoad, target: { ms: 400, heapMb: 80 },
  },
  analysisInProcess: {
    lines: lines.length, bars: maxBar, syllables: totalSyllables, families: first.families.length, coldMs, ...inProcess,
    responseBytes: { words: bytesWords, full: bytesFull }, target: { warmMedianMs: 1 },
  },
  analysisHttp: { connections: 20, durationS: 10, withCrewLexicon: true, ...http, target: { p95Ms: 15, errors: 0 } },
  finder: { queries: queries.length, ...finder },
  npmSyllable: { words: words.length, syllables: sylTotal, ...npmSyllable },
  npmRhymes: { loadMs: rhymesLoadMs, ...(npmRhymes ?? {}) },
  ours: { syllables: totalSyllables },
}
const f = (x, d = 2) => (x === null || x === undefined ? '—' : Number(x).toFixed(d))
const la = x => `load ${f(x, 2)}`
const ip = inProcess
const rows = [
  ['engine modules (word lists, letter-to-sound rules)', `${f(engineImportMs, 0)} ms`, `cpu ${f(engineImportCpuMs, 0)} ms`, la(loadLoad)],
  ['dictionary data file read + indexed (once)', `${f(dictionaryMs, 0)} ms`, `heap +${f(heapDict - heap0, 1)} MB with the modules`, la(loadLoad)],
  ['rhyme finder index (once, at start-up in the server)', `${f(finderIndexMs, 0)} ms`, `${idx.words.length} entries, cpu ${f(finderIndexCpuMs, 0)} ms`, la(loadLoad)],
  ['load + index total (target ≤ 400 ms, ≤ 80 MB)', `${f(totalMs, 0)} ms`, `cpu ${f(totalCpuMs, 0)} ms, heap +${f(heapAll - heap0, 1)} MB`, la(loadLoad)],
  [`in-process, ${lines.length} lines / ${maxBar} bars, cold`, `${f(coldMs)} ms`, '', la(loadLoad)],
  ['in-process IDENTICAL analyseDraft, median (target ≤ 1 ms)', `${f(ip.identical.medianMs, 3)} ms`, `p95 ${f(ip.identical.p95Ms, 3)} ms, cpu mean ${f(ip.identical.cpuMeanMs, 3)} ms`, la(ip.identical.loadAvg)],
  ['in-process TYPING analyseDraft (one line changed), median', `${f(ip.typing.medianMs, 3)} ms`, `p95 ${f(ip.typing.p95Ms, 3)} ms, cpu mean ${f(ip.typing.cpuMeanMs, 3)} ms`, la(ip.typing.loadAvg)],
  ['in-process IDENTICAL to JSON text (response cache), median', `${f(ip.responseIdentical.medianMs, 3)} ms`, `p95 ${f(ip.responseIdentical.p95Ms, 3)} ms`, la(ip.responseIdentical.loadAvg)],
  ['in-process TYPING to JSON text (analysis + JSON), median', `${f(ip.responseTyping.medianMs, 3)} ms`, `p95 ${f(ip.responseTyping.p95Ms, 3)} ms, ${bytesWords} B (full ${bytesFull} B)`, la(ip.responseTyping.loadAvg)],
]
const modeName = { identical: 'IDENTICAL', typing: 'TYPING', identicalUncompressed: 'IDENTICAL uncompressed', typingUncompressed: 'TYPING uncompressed', identicalWithoutCrew: 'IDENTICAL no crewId (no lexicon)' }
for (const mode of Object.keys(modeName)) {
  const h = http[mode]
  if (!h) continue
  rows.push(
    [`HTTP ${modeName[mode]}, 20 conn, p50 / p95 (target p95 ≤ 15 ms)`, `${f(h.p50Ms, 1)} / ${f(h.p95Ms, 1)} ms`, `p99 ${f(h.p99Ms, 1)} ms, ${h.requests} req, ${f(h.rps, 0)} req/s`, la(h.loadAvg)],
    [`HTTP ${modeName[mode]}, errors (target 0) / server cpu`, `${h.errors}`, `${f(h.serverCpuMsPerRequest, 2)} ms cpu/req, ${h.bytesPerResponse} B/response`, la(h.loadAvg)],
  )
}
if (http.healthForScale) rows.push(['HTTP /api/health for scale, 20 conn, p50 / p95', `${f(http.healthForScale.p50Ms, 1)} / ${f(http.healthForScale.p95Ms, 1)} ms`, `${f(http.healthForScale.rps, 0)} req/s`, la(http.healthForScale.loadAvg)])
rows.push(
  ['rhyme finder query, warm median', `${f(finder.medianMs, 3)} ms`, `p95 ${f(finder.p95Ms, 3)} ms`, la(finder.loadAvg)],
  ['npm syllable on the same lines, median', `${f(npmSyllable.medianMs, 3)} ms`, `${sylTotal} syllables vs ours ${totalSyllables}`, la(npmSyllable.loadAvg)],
  ['npm rhymes, load / query median', `${f(rhymesLoadMs, 0)} ms / ${f(npmRhymes?.medianMs, 2)} ms`, '', la(npmRhymes?.loadAvg)],
)
const w = [0, 1, 2].map(i => Math.max(...rows.map(r => r[i].length)))
for (const r of rows) console.log(`${r[0].padEnd(w[0])}  ${r[1].padStart(w[1])}  ${r[2].padEnd(w[2])}  ${r[3]}`)
writeFileSync(resolve(outDir, 'prosody.json'), `${JSON.stringify(figures, null, 2)}\n`)
console.log(`\nwrote bench/out/prosody.json (dictionary ${engine.dictionarySize()} keys)`)

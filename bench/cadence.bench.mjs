// The cadence grid on the demo song, against the built server: how far the AudioContext-
// scheduled ticks sit from the computed slot times in Chromium (and what output latency the
// context reports), and what printing the cadence rows adds to the sheet's text and PDF.
// Figures are printed and written to bench/out/cadence.json; nothing is asserted.
import { mkdirSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { chromium } from 'playwright-core'
import { signInCookie, startBenchApp } from './lib/app.mjs'

const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 20)
const pct = (xs, p) => [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor(p * xs.length))]

const app = await startBenchApp()
const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', headless: true, args: ['--headless', '--no-sandbox', '--disable-gpu', '--autoplay-policy=no-user-gesture-required'] })
try {
  const cookie = await signInCookie(app.baseUrl, 'writer@barsmith.test')
  const get = async path => fetch(`${app.baseUrl}${path}`, { headers: { cookie } })
  const [crew] = await (await get('/api/crews')).json()
  const song = (await (await get(`/api/crews/${crew.id}/songs`)).json()).find(s => s.title === 'Night Bus Home')
  const { grid } = await (await get(`/api/songs/${song.id}`)).json()
  const hook = (await (await get(`/api/songs/${song.id}/sections`)).json()).find(s => s.kind === 'hook')
  const main = (await (await get(`/api/songs/${song.id}/drafts`)).json()).find(d => d.isMain)

  // Chromium: play the hook, read the schedule, compare with offset + n × slot length (16ths).
  const context = await browser.newContext({ baseURL: app.baseUrl })
  await context.addCookies([{ name: cookie.split('=')[0], value: cookie.split('=').slice(1).join('=').split(';')[0], url: app.baseUrl }])
  const page = await context.newPage()
  await page.goto(`/songs/${song.id}/cadence?section=${hook.id}`)
  await page.waitForFunction(() => !!document.querySelector('#__nuxt')?.__vue_app__)
  await page.locator('[data-testid^="cadence-line-"]').nth(7).waitFor()
  await page.getByTestId('cadence-play').click()
  await page.waitForFunction(() => window.__barsmithCadence?.ticks?.length > 0)
  const schedule = await page.evaluate(() => window.__barsmithCadence)
  const latency = await page.evaluate(async () => {
    const c = new AudioContext()
    await c.resume()
    const out = { baseLatencyMs: c.baseLatency * 1000, outputLatencyMs: (c.outputLatency ?? 0) * 1000, sampleRate: c.sampleRate }
    await c.close()
    return out
  })
  const slotMs = 60 / grid.bpm * grid.beatsPerBar / 16 * 1000
  const deviations = schedule.ticks.filter(t => t.pass === 0).map((t) => {
    const n = Math.round((t.slotMs - grid.offsetMs) / slotMs)
    return Math.abs(schedule.startMs + (t.at - schedule.contextStart) * 1000 - (grid.offsetMs + n * slotMs))
  })

  // The sheet with and without the cadence rows of the hook and verse (bars 5–28).
  const samples = { txt: [], txtCadence: [], pdf: [], pdfCadence: [] }
  const time = async (key, path) => {
    const t = performance.now()
    const res = await get(path)
    await res.arrayBuffer()
    samples[key].push(performance.now() - t)
  }
  for (let i = 0; i < ROUNDS; i++) {
    await time('txt', `/api/versions/${main.headVersionId}/sheet.txt`)
    await time('txtCadence', `/api/versions/${main.headVersionId}/sheet.txt?cadence=5-28`)
    await time('pdf', `/api/versions/${main.headVersionId}/sheet.pdf`)
    await time('pdfCadence', `/api/versions/${main.headVersionId}/sheet.pdf?cadence=5-28`)
  }
  const figures = {
    ticks: deviations.length,
    tickDeviationMaxMs: Math.max(...deviations),
    ...latency,
    beatPlayed: schedule.beat,
    ...Object.fromEntries(Object.entries(samples).flatMap(([k, xs]) => [[`${k}P50Ms`, pct(xs, 0.5)], [`${k}P95Ms`, pct(xs, 0.95)]])),
  }
  console.log(`Chromium: ${figures.ticks} ticks, largest distance from the computed slot time ${figures.tickDeviationMaxMs.toFixed(3)} ms; context base latency ${latency.baseLatencyMs.toFixed(1)} ms, output latency ${latency.outputLatencyMs.toFixed(1)} ms at ${latency.sampleRate} Hz`)
  console.table(Object.entries(samples).map(([what, xs]) => ({ what, 'p50 ms': pct(xs, 0.5).toFixed(1), 'p95 ms': pct(xs, 0.95).toFixed(1) })))
  mkdirSync(resolve('bench/out'), { recursive: true })
  writeFileSync(resolve('bench/out/cadence.json'), JSON.stringify({ figures }, null, 2))
}
finally {
  await browser.close()
  await app.stop()
}

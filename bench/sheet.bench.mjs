// Final sheet exports and sealing, over HTTP against the built server: how long a 200-line
// sheet takes as PDF, WebVTT and text, how long the approval that seals (PDF rendered, stored,
// mailed to the crew) takes, and what the server's memory does meanwhile.
import { mkdirSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { rssMb, signInCookie, startBenchApp } from './lib/app.mjs'

const LINES = 200
const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 40)
const SEALS = 6
// Targets for a shared 2-core machine: a sheet prints well within a second; sealing stays interactive.
const TARGETS = { pdfP95Ms: 1000, vttP95Ms: 250, txtP95Ms: 250, sealP95Ms: 2500, rssGrowthMb: 80 }

const app = await startBenchApp()
try {
  const cookies = {}
  for (const role of ['writer', 'owner', 'cowriter', 'producer']) cookies[role] = await signInCookie(app.baseUrl, `${role}@barsmith.test`)
  const call = async (role, method, path, body) => {
    const res = await fetch(`${app.baseUrl}${path}`, { method, headers: { cookie: cookies[role], ...(body ? { 'content-type': 'application/json' } : {}) }, body: body ? JSON.stringify(body) : undefined })
    const data = (res.headers.get('content-type') ?? '').includes('json') ? await res.json() : Buffer.from(await res.arrayBuffer())
    if (res.status >= 400) throw new Error(`${method} ${path} → ${res.status} ${JSON.stringify(data)}`)
    return data
  }
  const [crew] = await call('writer', 'GET', '/api/crews')
  const members = await call('writer', 'GET', `/api/crews/${crew.id}/members`)
  const id = role => members.find(m => m.email === `${role}@barsmith.test`).userId
  const lines = Array.from({ length: LINES }, (_, i) => ({ id: `b${i}`, bar: i + 1, text: `bench line ${i + 1} with a few more words to wrap (ad-lib ${i % 3 === 0 ? 'yeah' : 'uh'})`, ...(i % 17 === 5 ? { out: true } : {}) }))

  async function song(title) {
    const s = await call('writer', 'POST', `/api/crews/${crew.id}/songs`, { title })
    const d = await call('writer', 'POST', `/api/songs/${s.id}/drafts`, { name: 'Bench take' })
    const v = await call('writer', 'POST', `/api/drafts/${d.id}/versions`, { baseVersionId: null, lines })
    return { songId: s.id, versionId: v.id }
  }

  const time = async (fn) => {
    const t = performance.now()
    await fn()
    return performance.now() - t
  }
  const pct = (xs, p) => [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor(p * xs.length))]

  const { versionId } = await song('Bench sheet')
  const rssBefore = await rssMb(app.serverPid)
  const samples = { pdf: [], vtt: [], txt: [] }
  let pdfBytes = 0
  for (let i = 0; i < ROUNDS; i++) {
    samples.pdf.push(await time(async () => {
      pdfBytes = (await call('writer', 'GET', `/api/versions/${versionId}/sheet.pdf`)).length
    }))
    samples.vtt.push(await time(() => call('writer', 'GET', `/api/versions/${versionId}/sheet.vtt`)))
    samples.txt.push(await time(() => call('writer', 'GET', `/api/versions/${versionId}/sheet.txt`)))
  }

  const seals = []
  for (let i = 0; i < SEALS; i++) {
    const s = await song(`Bench seal ${i}`)
    await call('writer', 'PUT', `/api/songs/${s.songId}/split`, { lines: [{ userId: id('writer'), name: 'Writer', share: '50' }, { userId: id('cowriter'), name: 'Co-writer', share: '50' }] })
    await call('writer', 'POST', `/api/songs/${s.songId}/split/confirm`, {})
    await call('cowriter', 'POST', `/api/songs/${s.songId}/split/confirm`, {})
    const request = await call('writer', 'POST', `/api/versions/${s.versionId}/signoffs`, {})
    await call('owner', 'PUT', `/api/signoffs/${request.id}/signers`, { userIds: [id('writer')] })
    seals.push(await time(async () => {
      const res = await call('writer', 'POST', `/api/signoffs/${request.id}/decision`, { decision: 'approve', comment: '' })
      if (!res.sealed) throw new Error('not sealed')
    }))
  }
  const rssAfter = await rssMb(app.serverPid)

  const figures = {
    lines: LINES,
    rounds: ROUNDS,
    pdfBytes,
    pdfP50Ms: pct(samples.pdf, 0.5), pdfP95Ms: pct(samples.pdf, 0.95),
    vttP50Ms: pct(samples.vtt, 0.5), vttP95Ms: pct(samples.vtt, 0.95),
    txtP50Ms: pct(samples.txt, 0.5), txtP95Ms: pct(samples.txt, 0.95),
    sealP50Ms: pct(seals, 0.5), sealP95Ms: pct(seals, 0.95),
    rssBeforeMb: rssBefore, rssAfterMb: rssAfter, rssGrowthMb: rssAfter - rssBefore,
  }
  const rows = [
    ['PDF export (200 lines)', figures.pdfP50Ms, figures.pdfP95Ms, TARGETS.pdfP95Ms],
    ['WebVTT export', figures.vttP50Ms, figures.vttP95Ms, TARGETS.vttP95Ms],
    ['Text export', figures.txtP50Ms, figures.txtP95Ms, TARGETS.txtP95Ms],
    ['Sealing approval (PDF + mail)', figures.sealP50Ms, figures.sealP95Ms, TARGETS.sealP95Ms],
  ]
  console.table(rows.map(([what, p50, p95, target]) => ({ what, 'p50 ms': p50.toFixed(1), 'p95 ms': p95.toFixed(1), 'target p95 ms': target, 'met': p95 <= target ? 'yes' : 'NO' })))
  console.log(`PDF size ${(pdfBytes / 1024).toFixed(1)} KB; server RSS ${rssBefore.toFixed(0)} → ${rssAfter.toFixed(0)} MB (growth ${figures.rssGrowthMb.toFixed(1)} MB, target ≤ ${TARGETS.rssGrowthMb})`)
  mkdirSync(resolve('bench/out'), { recursive: true })
  writeFileSync(resolve('bench/out/sheet.json'), JSON.stringify({ figures, targets: TARGETS }, null, 2))
}
finally {
  await app.stop()
}

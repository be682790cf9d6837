// Answer times of sign-in, sign-up and reset for an address with an account and one without,
// interleaved, each request from its own address so no throttle interferes. An attacker who
// could tell the two apart by time could list accounts; the gap between medians should be
// small beside the spread. Prints a table and writes bench/out/auth-timing.json; nothing here asserts.
import { mkdirSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { randomUUID } from 'node:crypto'
import { startBenchApp } from './lib/app.mjs'
import { root } from '../scripts/lib/paths.mjs'

const ROUNDS = Number(process.env.BENCH_AUTH_ROUNDS || 30)
// Barsmith's own target: medians within 10 % of each other (or 5 ms, whichever is larger).
const TARGET = 'median gap ≤ max(10 % of the median, 5 ms)'

const pct = (values, p) => {
  const s = [...values].sort((a, b) => a - b)
  return s[Math.min(s.length - 1, Math.ceil(p / 100 * s.length) - 1)]
}
let ip = 0
const address = () => `203.0.${113 + Math.floor(++ip / 250) % 2}.${ip % 250 + 1}`

const app = await startBenchApp()
try {
  const known = 'owner@barsmith.test'
  const cases = {
    'sign-in (wrong password)': email => ({ path: '/api/auth/login', body: { email, password: 'not-the-password-1' } }),
    'sign-up': email => ({ path: '/api/auth/register', body: { name: 'Bench Bo', email, password: 'long enough password' } }),
    'reset request': email => ({ path: '/api/auth/forgot', body: { email } }),
    // The demo owner is confirmed, so a known address gets no new link here, as an unknown one.
    'confirmation link again': email => ({ path: '/api/auth/resend', body: { email } }),
  }
  const rows = {}
  for (const [name, make] of Object.entries(cases)) {
    const times = { known: [], unknown: [] }
    for (let i = 0; i < ROUNDS; i++) {
      for (const who of i % 2 ? ['known', 'unknown'] : ['unknown', 'known']) {
        const email = who === 'known' ? known : `nobody-${randomUUID().slice(0, 8)}@barsmith.test`
        const { path, body } = make(email)
        const t0 = performance.now()
        const res = await fetch(`${app.baseUrl}${path}`, { method: 'POST', headers: { 'content-type': 'application/json', 'x-forwarded-for': address() }, body: JSON.stringify(body) })
        await res.text()
        times[who].push(performance.now() - t0)
        if (name.startsWith('sign-in') && who === 'known' && res.status === 429) throw new Error('sign-in throttled during the bench')
      }
      if (name.startsWith('sign-in')) {
        // Clear the known account's failure count between rounds (as a successful sign-in does).
        await fetch(`${app.baseUrl}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json', 'x-forwarded-for': address() }, body: JSON.stringify({ email: known, password: process.env.DEMO_PASSWORD || 'barsmith-demo' }) })
      }
    }
    const k50 = pct(times.known, 50)
    const u50 = pct(times.unknown, 50)
    const gap = Math.abs(k50 - u50)
    rows[name] = {
      'known p50 ms': +k50.toFixed(1), 'unknown p50 ms': +u50.toFixed(1),
      'known p95 ms': +pct(times.known, 95).toFixed(1), 'unknown p95 ms': +pct(times.unknown, 95).toFixed(1),
      'gap ms': +gap.toFixed(1), 'meets target': gap <= Math.max(0.1 * Math.max(k50, u50), 5),
    }
  }
  console.log(`auth answer times, ${ROUNDS} rounds each; target: ${TARGET}`)
  console.table(rows)
  mkdirSync(resolve(root, 'bench/out'), { recursive: true })
  writeFileSync(resolve(root, 'bench/out/auth-timing.json'), `${JSON.stringify({ bench: 'auth-timing', at: new Date().toISOString(), rounds: ROUNDS, target: TARGET, rows }, null, 2)}\n`)
}
finally {
  await app.stop()
}

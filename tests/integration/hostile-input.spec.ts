// Property-based hostile input (npm fast-check) against every route under server/api,
// discovered from the file tree: generated bodies, queries and route parameters with wrong
// types, huge strings, deep nesting, Unicode edge cases and SQL/HTML/script fragments. The
// server must never answer 5xx, every error must be a JSON body with a message, and it must
// still answer /api/health afterwards. Replay a failure with FUZZ_SEED=<printed seed>.
import fc from 'fast-check'
import { randomUUID } from 'node:crypto'
import { beforeAll, describe, expect, it, inject } from 'vitest'
import { ApiClient } from '../support/http'
import { makeCrew, type TestCrew } from '../support/people'
import { discoverRoutes } from '../support/routes'

const SEED = Number(process.env.FUZZ_SEED ?? 20261202)
const RUNS = Number(process.env.FUZZ_RUNS ?? 3000)

const routes = discoverRoutes().map((r) => {
  const [method, route] = r.split(' ') as [string, string]
  return { method, route }
})

// Unicode edge cases (Unicode Standard ch. 3 surrogates; UAX #9 bidi controls; ch. 23 format characters).
const EDGE_STRINGS = [
  '\uD800', 'a\uDC00b', '\uDBFF\uDFFF', '\u202Eevil\u202C', '\u05D0\u05D1\u200F', 'zero\u200Bwidth\u200D\uFEFF',
  'nul\u0000byte', '\u0000', '\u0007\u001B[31m', 'e\u0301\u0301\u0301', '\uFFFF\uFFFE', '👩🏽‍🎤', '\r\n\r\n',
  // SQL, HTML and script fragments (OWASP testing guide, common practice).
  '\' OR \'1\'=\'1', '\'; DROP TABLE users; --', '1; SELECT pg_sleep(0)', '%27%20OR%201=1', '$1', '\\', '\\u0000',
  '<script>alert(1)</script>', '<img src=x onerror=alert(1)>', '"><svg onload=alert(1)>', 'javascript:alert(1)',
  '{{constructor.constructor("alert(1)")()}}', '../../../../etc/passwd', '..%2F..%2Fetc%2Fpasswd', '%00', '%',
  '__proto__', 'constructor', 'prototype', 'NaN', 'Infinity', '-0', '1e309', '99999999999999999999999', '-1',
  '00000000-0000-0000-0000-000000000000', 'ffffffff-ffff-ffff-ffff-ffffffffffff', '', ' ', 'null', 'true', '[]', '{}',
]

const edge = fc.constantFrom(...EDGE_STRINGS)
const hugeString = fc.tuple(fc.constantFrom('a', 'é', '\uD83C\uDFA4', '<b>', '\'', '\u0000'), fc.integer({ min: 1_000, max: 120_000 }))
  .map(([s, n]) => s.repeat(n))
const hostileString = fc.oneof(
  { weight: 4, arbitrary: edge },
  { weight: 3, arbitrary: fc.string({ unit: 'binary', maxLength: 40 }) },
  { weight: 2, arbitrary: fc.string({ maxLength: 40 }) },
  { weight: 1, arbitrary: hugeString },
  { weight: 1, arbitrary: fc.uuid() },
)
const scalar = fc.oneof(
  hostileString,
  fc.integer(), fc.double(), fc.boolean(), fc.constant(null),
  fc.constantFrom(Number.MAX_SAFE_INTEGER, -Number.MAX_SAFE_INTEGER, 2 ** 53 + 1, 1e308, -1e308, 0.1, -1, 0),
)
const deep = fc.tuple(fc.integer({ min: 50, max: 5_000 }), fc.constantFrom('[', '{"a":'))
  .map(([n, open]) => ({ raw: open.repeat(n) + '1' + (open === '[' ? ']' : '}').repeat(n) }))
const rawBody = fc.oneof(
  deep,
  fc.constantFrom('{', '{"a":}', 'nul', '[1,2', '"\\ud800"', '{"__proto__":{"admin":true}}', '\u0000', '{"a":1}{"b":2}').map(raw => ({ raw })),
  fc.string({ unit: 'binary', maxLength: 200 }).map(raw => ({ raw })),
)
const fieldNames = fc.oneof(
  fc.constantFrom('name', 'title', 'email', 'password', 'role', 'text', 'lines', 'doc', 'note', 'bar', 'bpm', 'word', 'phones',
    'lineId', 'baseVersionId', 'versionId', 'token', 'startBar', 'endBar', 'label', 'shares', 'vote', 'body', 'q', 'detail',
    'limit', 'before', 'after', 'id', 'ids', 'kind', 'order', 'offsetMs', 'bar1Ms', 'beatsPerBar', 'confirm', 'from', 'to',
    '__proto__', 'constructor'),
  fc.string({ maxLength: 12 }),
)
const jsonish: fc.Arbitrary<unknown> = fc.letrec(tie => ({
  value: fc.oneof({ depthSize: 'small', withCrossShrink: true },
    scalar,
    fc.array(tie('value'), { maxLength: 6 }),
    fc.dictionary(fieldNames, tie('value'), { maxKeys: 6 }),
  ),
})).value
// Plausible shapes with one wrong part are what reach past the first check.
const lineArray = fc.array(fc.record({ id: fc.oneof(hostileString, fc.integer()), bar: scalar, text: fc.oneof(hostileString, scalar) }, { requiredKeys: [] }), { maxLength: 5 })
const body = fc.oneof(
  { weight: 4, arbitrary: fc.dictionary(fieldNames, jsonish, { maxKeys: 8 }).map(json => ({ json })) },
  { weight: 2, arbitrary: fc.record({ lines: fc.oneof(lineArray, scalar), baseVersionId: fc.oneof(scalar, fc.constant(null)), text: hostileString, name: hostileString }, { requiredKeys: [] }).map(json => ({ json })) },
  { weight: 1, arbitrary: jsonish.map(json => ({ json })) },
  { weight: 1, arbitrary: rawBody },
)
const query = fc.dictionary(fieldNames, fc.oneof(hostileString, fc.array(hostileString, { maxLength: 3 })), { maxKeys: 4 })

let crew: TestCrew
let real: Record<string, string>
let baseUrl: string

beforeAll(async () => {
  baseUrl = inject('baseUrl')
  crew = await makeCrew()
  const songId = (await crew.as.owner.post(`/api/crews/${crew.crewId}/songs`, { title: 'Fuzz target' })).body.id
  const draftId = (await crew.as.owner.post(`/api/songs/${songId}/drafts`, { name: 'Fuzz' })).body.id
  const versionId = (await crew.as.owner.post(`/api/drafts/${draftId}/versions`, { baseVersionId: null, lines: [{ id: 'f1', bar: 1, text: 'first bar' }] })).body.id
  real = { crewId: crew.crewId, songId, draftId, versionId, userId: crew.users.writer.id }
  console.log(`[hostile-input] fast-check seed ${SEED}, ${RUNS} requests over ${routes.length} routes (replay: FUZZ_SEED=${SEED})`)
})

/** Percent-encodes a path segment; lone surrogates go as their (invalid) WTF-8 bytes, which a browser never sends. */
function encodePath(value: string): string {
  let out = ''
  for (const ch of value) {
    const c = ch.codePointAt(0)!
    out += c >= 0xD800 && c <= 0xDFFF
      ? [0xE0 | (c >> 12), 0x80 | ((c >> 6) & 63), 0x80 | (c & 63)].map(b => `%${b.toString(16).toUpperCase()}`).join('')
      : encodeURIComponent(ch)
  }
  return out
}

/** True for requests that would end the fuzzing session or its crew rather than test input handling. */
const ending = (method: string, route: string) => method === 'DELETE' || /\/(leave|logout)$/.test(route) || route.endsWith('/members/[userId]')

async function send(client: ApiClient, method: string, path: string, b: { json?: unknown, raw?: string } | undefined) {
  const headers: Record<string, string> = { 'x-forwarded-for': client.address, 'cookie': client.cookieHeader }
  let payload: string | undefined
  if (b && method !== 'GET') {
    headers['content-type'] = 'application/json'
    payload = b.raw ?? JSON.stringify(b.json)
  }
  const res = await fetch(new URL(path, baseUrl), { method, headers, body: payload, redirect: 'manual', signal: AbortSignal.timeout(30_000) })
  const type = res.headers.get('content-type') ?? ''
  if (type.includes('text/event-stream')) {
    await res.body?.cancel()
    return { status: res.status, type, text: '' }
  }
  return { status: res.status, type, text: await res.text() }
}

describe('hostile input to every route', () => {
  it(`never answers 5xx, always a JSON error with a message (${RUNS} generated requests)`, async () => {
    const statuses: Record<number, number> = {}
    const client = crew.as.owner
    const request = fc.record({
      r: fc.constantFrom(...routes),
      // One value per [param] of the route, in order; null means the real id when there is one.
      params: fc.array(fc.option(hostileString, { nil: null, freq: 2 }), { minLength: 4, maxLength: 4 }),
      query,
      body: fc.option(body, { nil: undefined, freq: 8 }),
    })
    const outcome = await fc.check(fc.asyncProperty(request, async ({ r, params, query: q, body: b }) => {
      let i = 0
      const path = r.route.replace(/\[(\w+)\]/g, (_, name: string) => {
        const generated = params[i++ % params.length] ?? null
        const known = real[name]
        const value = generated === null && known && !ending(r.method, r.route) ? known : (generated ?? randomUUID())
        // Node refuses request lines past its header limit (16 KB) itself, with a bare 431.
        return encodePath(value).slice(0, 1_500)
      })
      const qs = new URLSearchParams()
      for (const [k, v] of Object.entries(q)) for (const one of [v].flat()) qs.append(k, one.slice(0, 300))
      const url = qs.size ? `${path}?${qs}` : path
      const res = await send(client, r.method, url, b)
      statuses[res.status] = (statuses[res.status] ?? 0) + 1
      const where = `${r.method} ${url.slice(0, 300)} → ${res.status} ${res.text.slice(0, 300)}`
      expect(res.status, where).toBeLessThan(500)
      if (res.status >= 400) {
        expect(res.type, where).toContain('application/json')
        const parsed = JSON.parse(res.text)
        expect(typeof parsed.message, where).toBe('string')
        expect(parsed.message.length, where).toBeGreaterThan(0)
      }
    }), { seed: SEED, numRuns: RUNS, endOnFailure: true })
    // Reported without the (possibly huge) generated value; replay with the seed and path.
    if (outcome.failed) throw new Error(`seed ${outcome.seed}, path ${outcome.counterexamplePath}: ${String(outcome.errorInstance).slice(0, 1_500)}`)
    console.log('[hostile-input] statuses seen', JSON.stringify(statuses))
    // The run reached past the first checks: some requests were accepted, some refused.
    expect(Object.keys(statuses).some(s => Number(s) < 300)).toBe(true)
    expect(Object.keys(statuses).some(s => Number(s) >= 400)).toBe(true)

    const health = await new ApiClient().get('/api/health')
    expect(health.status).toBe(200)
  }, 600_000)
})

// Sessions and abuse: tampered and expired session cookies, requests from another origin on
// every state-changing route (discovered from server/api), throttles on sign-in, sign-up,
// invite and reset, identical answers for known and unknown addresses, and security headers.
import { randomUUID } from 'node:crypto'
import { sealSession, unsealSession, type H3Event } from 'h3'
import { beforeAll, describe, expect, inject, it } from 'vitest'
import { ApiClient, DEMO_PASSWORD } from '../support/http'
import { makeCrew, makeUser, signedIn } from '../support/people'
import { discoverRoutes, fillRoute } from '../support/routes'

const COOKIE = 'barsmith-session'
const MAX_AGE_S = 60 * 60 * 24 * 14 // nuxt.config.ts runtimeConfig.session.maxAge
let password: string

beforeAll(() => {
  password = inject('serverEnv').NUXT_SESSION_PASSWORD!
})

const config = (extra: Record<string, unknown> = {}) => ({ name: COOKIE, password, maxAge: MAX_AGE_S, ...extra })
/** h3's own sealing, as the server does it, of a session object of our making. */
async function seal(session: Record<string, unknown>, extra: Record<string, unknown> = {}) {
  const event = { context: { sessions: { [COOKIE]: session } } } as unknown as H3Event
  return sealSession(event, config(extra))
}
const withCookie = (value: string) => {
  const c = new ApiClient()
  c.cookies.set(COOKIE, value)
  return c
}

describe('session cookies', () => {
  it('accepts a session re-sealed with the server secret, so the refusals below are for the reason given', async () => {
    const client = await signedIn(await makeUser('reseal'))
    const real = await unsealSession({} as H3Event, config(), client.cookies.get(COOKIE)!)
    const again = withCookie(await seal({ ...real, createdAt: Date.now() }))
    expect((await again.get('/api/me')).status).toBe(200)
  })

  it('refuses a session older than its max-age, though its seal is valid', async () => {
    const client = await signedIn(await makeUser('old'))
    const real = await unsealSession({} as H3Event, config(), client.cookies.get(COOKIE)!)
    const old = withCookie(await seal({ ...real, createdAt: Date.now() - MAX_AGE_S * 1000 - 60_000 }))
    const res = await old.get('/api/me')
    expect(res.status).toBe(401)
    expect(res.body.message).toEqual(expect.any(String))
  })

  it('refuses a seal past its own expiry', async () => {
    const client = await signedIn(await makeUser('expired-seal'))
    const real = await unsealSession({} as H3Event, config(), client.cookies.get(COOKIE)!)
    // Sealed as if by a clock two weeks and a minute behind (iron's localtimeOffsetMsec), so its expiry has passed.
    const expired = withCookie(await seal({ ...real, createdAt: Date.now() }, { seal: { localtimeOffsetMsec: -(MAX_AGE_S * 1000 + 60_000) } }))
    expect((await expired.get('/api/me')).status).toBe(401)
  })

  it('refuses a session sealed with another secret, a mangled cookie and a made-up user', async () => {
    const client = await signedIn(await makeUser('forged'))
    const value = client.cookies.get(COOKIE)!
    const real = await unsealSession({} as H3Event, config(), value)
    const otherSecret = await sealSession({ context: { sessions: { [COOKIE]: real } } } as unknown as H3Event, config({ password: 'x'.repeat(40) }))
    const parts = value.split('*')
    const swapped = [...parts.slice(0, 4), parts[5], parts[4], ...parts.slice(6)].join('*')
    const madeUp = await seal({ ...real, createdAt: Date.now(), data: { ...(real.data as object), user: { ...(real.data as { user: object }).user, id: randomUUID() } } })
    for (const cookie of [otherSecret, swapped, 'Fe26.2**garbage', value.slice(0, -10), '', `${value}x`, madeUp]) {
      const res = await withCookie(cookie).get('/api/me')
      expect(res.status, cookie.slice(0, 40)).toBe(401)
      expect(res.body.message).toEqual(expect.any(String))
    }
  })
})

describe('requests from another origin', () => {
  const changing = discoverRoutes().filter(r => !r.startsWith('GET ')).map(r => r.split(' ') as [string, string])

  it('are refused on every state-changing route, by Origin or by Sec-Fetch-Site', async () => {
    expect(changing.length).toBeGreaterThan(10)
    const base = new URL(inject('baseUrl'))
    for (const [method, route] of changing) {
      const path = fillRoute(route, new Proxy({}, { get: () => randomUUID() }) as Record<string, string>)
      const body = method === 'DELETE' ? undefined : {}
      for (const headers of [{ origin: 'https://elsewhere.example' }, { origin: `http://${base.hostname}:1` }, { 'sec-fetch-site': 'cross-site' }, { 'sec-fetch-site': 'same-site' }]) {
        const res = await new ApiClient().request(method, path, body, headers)
        expect(res.status, `${method} ${route} ${JSON.stringify(headers)}`).toBe(403)
        expect(res.body.message).toMatch(/another site/)
      }
      // The same request from the app's own origin passes the check (whatever the route then says).
      const own = await new ApiClient().request(method, path, body, { 'origin': base.origin, 'sec-fetch-site': 'same-origin' })
      expect(own.body?.message ?? '', `${method} ${route} from its own origin`).not.toMatch(/another site/)
    }
  })

  it('do not stop reads', async () => {
    const res = await new ApiClient().get('/api/health', { 'origin': 'https://elsewhere.example', 'sec-fetch-site': 'cross-site' })
    expect(res.status).toBe(200)
  })
})

async function until429(send: () => Promise<{ status: number }>, max: number) {
  const statuses: number[] = []
  for (let i = 0; i < max; i++) {
    const { status } = await send()
    statuses.push(status)
    if (status === 429) break
  }
  return statuses
}

describe('throttles', () => {
  it('sign-in: 5 wrong passwords lock the account', async () => {
    const user = await makeUser('throttle-login')
    const statuses = await until429(() => new ApiClient().post('/api/auth/login', { email: user.email, password: 'wrong-password' }), 8)
    expect(statuses).toEqual([401, 401, 401, 401, 401, 429])
  })

  it('sign-up: 10 per address per hour', async () => {
    const client = new ApiClient()
    const statuses = await until429(() => client.post('/api/auth/register', { name: 'Throttle Tess', email: `t-${randomUUID().slice(0, 8)}@example.test`, password: 'long enough password' }), 13)
    expect(statuses.at(-1)).toBe(429)
    expect(statuses.length).toBe(11)
    expect(statuses.slice(0, -1).every(s => s < 300)).toBe(true)
  })

  it('reset e-mails: 5 per address and account per hour', async () => {
    const client = new ApiClient()
    const email = `r-${randomUUID().slice(0, 8)}@example.test`
    const statuses = await until429(() => client.post('/api/auth/forgot', { email }), 8)
    expect(statuses).toEqual([200, 200, 200, 200, 200, 429])
  })

  it('reset links: 20 wrong links per address in 15 minutes', async () => {
    const client = new ApiClient()
    const statuses = await until429(() => client.post('/api/auth/reset', { token: randomUUID().replace(/-/g, '').repeat(2), password: 'a new long password' }), 24)
    expect(statuses.slice(0, 20).every(s => s === 400)).toBe(true)
    expect(statuses[20]).toBe(429)
  })

  it('invites: 50 per owner per hour', async () => {
    const crew = await makeCrew()
    const statuses = await until429(() => crew.as.owner.post(`/api/crews/${crew.crewId}/invites`, { email: `i-${randomUUID().slice(0, 8)}@example.test`, role: 'listener' }), 53)
    expect(statuses.length).toBe(51)
    expect(statuses.at(-1)).toBe(429)
    expect(statuses.slice(0, -1).every(s => s < 300)).toBe(true)
  }, 120_000)
})

describe('e-mail enumeration', () => {
  it('sign-in, sign-up and reset answer a known address exactly as an unknown one', async () => {
    const known = await makeUser('enum')
    const unknown = `nobody-${randomUUID().slice(0, 8)}@barsmith.test`
    const pair = async (send: (email: string) => Promise<{ status: number, body: unknown }>) => {
      const [a, b] = [await send(known.email), await send(unknown)]
      return [{ status: a.status, body: a.body }, { status: b.status, body: b.body }]
    }
    const [loginKnown, loginUnknown] = await pair(email => new ApiClient().post('/api/auth/login', { email, password: `${DEMO_PASSWORD}-not` }))
    expect(loginKnown).toEqual(loginUnknown)
    expect(loginKnown!.status).toBe(401)
    const [upKnown, upUnknown] = await pair(email => new ApiClient().post('/api/auth/register', { name: 'Enum Ella', email, password: 'long enough password' }))
    expect(upKnown).toEqual(upUnknown)
    const [resetKnown, resetUnknown] = await pair(email => new ApiClient().post('/api/auth/forgot', { email }))
    expect(resetKnown).toEqual(resetUnknown)
  })
})

describe('security headers', () => {
  it('are on pages, API answers (errors too) and static files', async () => {
    const client = new ApiClient()
    for (const path of ['/signin', '/api/health', '/api/me', '/favicon.svg', '/no-such-page']) {
      const res = await client.get(path)
      expect(res.headers.get('x-content-type-options'), path).toBe('nosniff')
      // Nitro's error handler sends the stricter no-referrer on error pages.
      expect(res.headers.get('referrer-policy'), path).toMatch(/^(strict-origin-when-cross-origin|no-referrer)$/)
      expect(res.headers.get('x-frame-options'), path).toBe('DENY')
      // CSP Level 3, frame-ancestors: 'none' forbids framing by any page (W3C Content Security Policy Level 3 §6.4.2).
      expect(res.headers.get('content-security-policy'), path).toMatch(/frame-ancestors 'none'/)
    }
    const page = await client.get('/signin')
    const csp = page.headers.get('content-security-policy')!
    const nonce = csp.match(/'nonce-([^']+)'/)![1]!
    expect(csp).not.toMatch(/script-src[^;]*'unsafe-inline'/)
    expect(csp).not.toMatch(/'unsafe-eval'/)
    // Every script element of the page carries this response's nonce.
    const scripts = page.text.match(/<script\b[^>]*>/g) ?? []
    expect(scripts.length).toBeGreaterThan(0)
    for (const tag of scripts) expect(tag).toContain(`nonce="${nonce}"`)
    const again = await client.get('/signin')
    expect(again.headers.get('content-security-policy')).not.toContain(nonce)
    expect((await client.get('/api/health')).headers.get('content-security-policy')).toMatch(/default-src 'none'/)
  })

  it('leave the sheet PDF viewable (framing refused, nothing else locked) and unsniffable', async () => {
    const crew = await makeCrew()
    const songId = (await crew.as.owner.post(`/api/crews/${crew.crewId}/songs`, { title: 'Header sheet' })).body.id
    const draftId = (await crew.as.owner.post(`/api/songs/${songId}/drafts`, { name: 'Main' })).body.id
    const versionId = (await crew.as.owner.post(`/api/drafts/${draftId}/versions`, { baseVersionId: null, lines: [{ id: 'h1', bar: 1, text: 'one line' }] })).body.id
    const pdf = await crew.as.owner.get(`/api/versions/${versionId}/sheet.pdf`)
    expect(pdf.status).toBe(200)
    expect(pdf.headers.get('content-type')).toMatch(/^application\/pdf/)
    expect(pdf.headers.get('content-security-policy')).toBe('frame-ancestors \'none\'')
    expect(pdf.headers.get('x-content-type-options')).toBe('nosniff')
  })
})

// Bad input on every form route answers 400 with a message per field, never a 5xx.
import { beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/http'
import { makeCrew, type TestCrew } from '../support/people'

let crew: TestCrew
let songId: string
let memberId: string
beforeAll(async () => {
  crew = await makeCrew()
  songId = (await crew.as.owner.post(`/api/crews/${crew.crewId}/songs`, { title: 'Bad input song' })).body.id
  memberId = crew.users.writer.id
})

interface FormCase { name: string, method: 'POST' | 'PATCH', path: () => string, client: () => ApiClient, body: unknown, fields: string[] }

const cases: FormCase[] = [
  { name: 'sign-up with a bad address and short password', method: 'POST', path: () => '/api/auth/register', client: () => new ApiClient(), body: { name: '', email: 'not-an-address', password: 'short' }, fields: ['name', 'email', 'password'] },
  { name: 'sign-up with wrong types', method: 'POST', path: () => '/api/auth/register', client: () => new ApiClient(), body: { name: 42, email: ['a'], password: { x: 1 } }, fields: ['name', 'email', 'password'] },
  { name: 'sign-in without a password', method: 'POST', path: () => '/api/auth/login', client: () => new ApiClient(), body: { email: 'writer@barsmith.test' }, fields: ['password'] },
  { name: 'sign-in with a huge address', method: 'POST', path: () => '/api/auth/login', client: () => new ApiClient(), body: { email: `${'a'.repeat(5000)}@x.test`, password: 'x' }, fields: ['email'] },
  { name: 'verify with a malformed token', method: 'POST', path: () => '/api/auth/verify', client: () => new ApiClient(), body: { token: '../../etc/passwd' }, fields: ['token'] },
  { name: 'resend without an address', method: 'POST', path: () => '/api/auth/resend', client: () => new ApiClient(), body: {}, fields: ['email'] },
  { name: 'forgot with a bad address', method: 'POST', path: () => '/api/auth/forgot', client: () => new ApiClient(), body: { email: 'nope' }, fields: ['email'] },
  { name: 'reset with a short password', method: 'POST', path: () => '/api/auth/reset', client: () => new ApiClient(), body: { token: 'x'.repeat(43), password: '123' }, fields: ['password'] },
  { name: 'new crew without a name', method: 'POST', path: () => '/api/crews', client: () => crew.as.owner, body: { name: '   ' }, fields: ['name'] },
  { name: 'rename crew with a huge name', method: 'PATCH', path: () => `/api/crews/${crew.crewId}`, client: () => crew.as.owner, body: { name: 'x'.repeat(500) }, fields: ['name'] },
  { name: 'invite with an unknown role', method: 'POST', path: () => `/api/crews/${crew.crewId}/invites`, client: () => crew.as.owner, body: { email: 'ok@example.test', role: 'boss' }, fields: ['role'] },
  { name: 'role change to an unknown role', method: 'PATCH', path: () => `/api/crews/${crew.crewId}/members/${memberId}`, client: () => crew.as.owner, body: { role: 'admin' }, fields: ['role'] },
  { name: 'new song without a title', method: 'POST', path: () => `/api/crews/${crew.crewId}/songs`, client: () => crew.as.writer, body: {}, fields: ['title'] },
  { name: 'rename song with a number', method: 'PATCH', path: () => `/api/songs/${songId}`, client: () => crew.as.writer, body: { title: 7 }, fields: ['title'] },
]

describe('bad input on form routes', () => {
  for (const c of cases) {
    it(`${c.name} → 400 with field messages`, async () => {
      const res = await c.client().request(c.method, c.path(), c.body)
      expect(res.status).toBe(400)
      expect(res.body.statusCode).toBe(400)
      expect(typeof res.body.message).toBe('string')
      for (const f of c.fields) expect(typeof res.body.data.fields[f], `field ${f}`).toBe('string')
    })
  }

  it('answers malformed JSON, a JSON array and a non-JSON type with 4xx', async () => {
    const client = crew.as.owner
    const bad = await client.request('POST', '/api/crews', '{"name": ', { 'content-type': 'application/json' })
    expect(bad.status).toBe(400)
    const arr = await client.post('/api/crews', [1, 2, 3])
    expect(arr.status).toBe(400)
    const text = await client.request('POST', '/api/crews', 'name=x', { 'content-type': 'text/plain' })
    expect(text.status).toBe(415)
  })

  it('answers ids that are not ids with 404, not 500', async () => {
    for (const path of ['/api/songs/not-a-uuid', `/api/crews/1'%20OR%201=1`, '/api/crews/00000000-0000-0000-0000-000000000000']) {
      const res = await crew.as.owner.get(path)
      expect(res.status, path).toBe(404)
    }
  })
})

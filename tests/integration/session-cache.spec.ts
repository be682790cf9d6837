// Sessions are unsealed once per sealed cookie and reused (server/utils/session-cache.ts): a
// reused session must still end when the account's session version moves on, and a cookie
// that was tampered with must still be refused.
import { describe, expect, it } from 'vitest'
import { sql } from '../support/db'
import { ApiClient } from '../support/http'
import { makeUser, signedIn } from '../support/people'

describe('reused sessions', () => {
  it('still end at once when the session version changes (password reset, sign out everywhere)', async () => {
    const user = await makeUser('cached')
    const client = await signedIn(user)
    expect((await client.get('/api/me')).status).toBe(200)
    expect((await client.get('/api/me')).status).toBe(200) // now from the unsealed-session cache
    await sql('UPDATE users SET session_version = session_version + 1 WHERE id = $1', [user.id])
    const after = await client.get('/api/me')
    expect(after.status).toBe(401)
    expect(after.body.message).toMatch(/session has ended/i)
  })

  it('refuses a cookie changed by one character, even after the real one was used', async () => {
    const user = await makeUser('tamper')
    const client = await signedIn(user)
    expect((await client.get('/api/me')).status).toBe(200)
    const [name, value] = [...client.cookies].find(([k]) => k.includes('session'))!
    const forged = new ApiClient()
    const at = value.length - 5
    forged.cookies.set(name, `${value.slice(0, at)}${value[at] === 'A' ? 'B' : 'A'}${value.slice(at + 1)}`)
    expect((await forged.get('/api/me')).status).toBe(401)
  })
})

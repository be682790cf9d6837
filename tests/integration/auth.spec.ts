import { randomUUID } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { sql } from '../support/db'
import { ApiClient } from '../support/http'
import { linkIn, waitForMail } from '../support/mail'

const newEmail = (label: string) => `${label}-${randomUUID().slice(0, 8)}@example.test`
const password = 'a-long-pass-phrase'

async function signUp(email: string, name = 'New Writer') {
  const client = new ApiClient()
  const res = await client.post('/api/auth/register', { name, email, password })
  expect(res.status).toBe(201)
  return client
}

function tokenOf(url: string) {
  return new URL(url).searchParams.get('token')!
}

describe('sign-up and e-mail verification', () => {
  it('sends a verification mail whose link verifies the account', async () => {
    const email = newEmail('verify')
    const client = await signUp(email)

    const refused = await client.post('/api/auth/login', { email, password })
    expect(refused.status).toBe(403)
    expect(refused.body.message).toMatch(/Confirm your e-mail/)

    const mail = await waitForMail(email, m => /Confirm your e-mail/.test(m.subject))
    const link = linkIn(mail, '/verify?token=')
    const verified = await client.post('/api/auth/verify', { token: tokenOf(link) })
    expect(verified.status).toBe(200)

    const login = await client.post('/api/auth/login', { email, password })
    expect(login.status).toBe(200)
    expect(login.body.user.email).toBe(email)
    const crews = await client.get('/api/crews')
    expect(crews.status).toBe(200)
    expect(crews.body).toEqual([])

    const again = await client.post('/api/auth/verify', { token: tokenOf(link) })
    expect(again.status).toBe(400)
  })

  it('gives up at once on a mail the mail server refuses for good, and the mail behind it still goes out', async () => {
    // The fake SMTP server answers 550 for reject.test, as a real one does for an unknown mailbox;
    // a 5xx reply is a permanent failure (RFC 5321, 4.2.1), so retrying it would only hold up other mail.
    const refusedAddress = `${randomUUID().slice(0, 8)}@reject.test`
    await signUp(refusedAddress)
    let row: Array<{ status: string, attempts: number, last_error: string | null }> = []
    for (let i = 0; i < 100; i++) {
      row = await sql(`SELECT status, attempts, last_error FROM outbox WHERE "to" = $1`, [refusedAddress])
      if (row[0]?.status !== 'pending') break
      await new Promise(r => setTimeout(r, 200))
    }
    expect(row[0]).toMatchObject({ status: 'failed', attempts: 1 })
    expect(row[0]!.last_error).toMatch(/550/)
    const email = newEmail('after-refused')
    await signUp(email)
    await waitForMail(email, m => /Confirm your e-mail/.test(m.subject))
  })

  it('answers a sign-up with an existing address exactly like a new one', async () => {
    const email = newEmail('twice')
    const first = await new ApiClient().post('/api/auth/register', { name: 'One', email, password })
    const second = await new ApiClient().post('/api/auth/register', { name: 'Two', email, password })
    expect(second.status).toBe(first.status)
    expect(second.body).toEqual(first.body)
    await waitForMail(email, m => /tried to sign up/.test(m.subject))
  })

  it('signs out', async () => {
    const client = await new ApiClient().signIn('writer@barsmith.test')
    expect((await client.get('/api/me')).status).toBe(200)
    expect((await client.post('/api/auth/logout')).status).toBe(204)
    expect((await client.get('/api/me')).status).toBe(401)
  })
})

describe('password reset', () => {
  it('resets with a single-use link and refuses old and used links', async () => {
    const email = newEmail('reset')
    const client = await signUp(email)
    const verifyMail = await waitForMail(email, m => /Confirm/.test(m.subject))
    await client.post('/api/auth/verify', { token: tokenOf(linkIn(verifyMail, '/verify?token=')) })
    const oldSession = await new ApiClient().signIn(email, password)

    expect((await client.post('/api/auth/forgot', { email })).status).toBe(200)
    const first = await waitForMail(email, m => /Reset/.test(m.subject))
    const firstToken = tokenOf(linkIn(first, '/reset?token='))
    // A second request makes a second link; using either one uses up both.
    await client.post('/api/auth/forgot', { email })
    const second = await waitForMail(email, m => /Reset/.test(m.subject) && m.id !== first.id)
    const secondToken = tokenOf(linkIn(second, '/reset?token='))
    expect(secondToken).not.toBe(firstToken)

    const newPassword = 'another-long-phrase'
    const reset = await client.post('/api/auth/reset', { token: secondToken, password: newPassword })
    expect(reset.status).toBe(200)

    expect((await client.post('/api/auth/reset', { token: secondToken, password: 'yet-another-phrase' })).status).toBe(400)
    expect((await client.post('/api/auth/reset', { token: firstToken, password: 'yet-another-phrase' })).status).toBe(400)

    expect((await new ApiClient().post('/api/auth/login', { email, password })).status).toBe(401)
    expect((await new ApiClient().post('/api/auth/login', { email, password: newPassword })).status).toBe(200)
    // The session made with the old password has ended.
    expect((await oldSession.get('/api/me')).status).toBe(401)
  })

  it('refuses an expired reset link', async () => {
    const email = newEmail('expired')
    const client = await signUp(email)
    await client.post('/api/auth/forgot', { email })
    const mail = await waitForMail(email, m => /Reset/.test(m.subject))
    await sql(`UPDATE email_tokens SET expires_at = now() - interval '1 minute' WHERE user_id = (SELECT id FROM users WHERE email = $1) AND kind = 'reset'`, [email])
    const res = await client.post('/api/auth/reset', { token: tokenOf(linkIn(mail, '/reset?token=')), password: 'whatever-long-enough' })
    expect(res.status).toBe(400)
    expect(res.body.message).toMatch(/expired or was already used/)
  })

  it('gives the same answer for unknown addresses', async () => {
    const client = new ApiClient()
    const known = await client.post('/api/auth/forgot', { email: 'listener@barsmith.test' })
    const unknown = await client.post('/api/auth/forgot', { email: newEmail('nobody') })
    expect(unknown.status).toBe(known.status)
    expect(unknown.body).toEqual(known.body)
  })
})

describe('sign-in throttling', () => {
  it('locks an account after 5 bad passwords, even from new addresses', async () => {
    const email = newEmail('throttle')
    const client = await signUp(email)
    const mail = await waitForMail(email, m => /Confirm/.test(m.subject))
    await client.post('/api/auth/verify', { token: tokenOf(linkIn(mail, '/verify?token=')) })

    for (let i = 0; i < 5; i++) {
      expect((await new ApiClient().post('/api/auth/login', { email, password: 'wrong-password' })).status).toBe(401)
    }
    const locked = await new ApiClient().post('/api/auth/login', { email, password })
    expect(locked.status).toBe(429)
    expect(locked.headers.get('retry-after')).toMatch(/^\d+$/)
    expect(locked.body.message).toMatch(/Too many sign-in attempts/)
  })

  it('throttles one address that tries many accounts', async () => {
    const attacker = new ApiClient()
    let status = 0
    for (let i = 0; i < 31; i++) {
      status = (await attacker.post('/api/auth/login', { email: newEmail('spray'), password: 'guess-guess' })).status
    }
    expect(status).toBe(429)
    // Another address is unaffected.
    expect((await new ApiClient().post('/api/auth/login', { email: 'writer@barsmith.test', password: 'barsmith-demo' })).status).toBe(200)
  })
})

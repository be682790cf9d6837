// Sign-off from request to seal and back: who may ask and sign, what closes a request, what
// a seal needs, and what the crew is told.
import { execFileSync } from 'node:child_process'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { sql } from '../support/db'
import { attachmentPath, waitForMail } from '../support/mail'
import { makeCrew, type TestCrew } from '../support/people'
import { confirmedSplit, draftWithLines, requestSignoff, SAMPLE_LINES } from '../support/finish'

let crew: TestCrew
let listener: pg.Client
const events: any[] = []

beforeAll(async () => {
  crew = await makeCrew()
  listener = new pg.Client({ connectionString: inject('databaseUrl') })
  await listener.connect()
  listener.on('notification', n => events.push(JSON.parse(n.payload!)))
  await listener.query('LISTEN barsmith_song')
})
afterAll(async () => listener?.end())

async function waitForEvent(match: (e: any) => boolean) {
  for (let i = 0; i < 50; i++) {
    const found = events.find(match)
    if (found) return found
    await new Promise(r => setTimeout(r, 100))
  }
  throw new Error('no matching song event')
}

describe('asking for sign-off', () => {
  it('defaults the signers to every writer and producer and tells each by e-mail', async () => {
    const d = await draftWithLines(crew)
    const res = await crew.as.writer.post(`/api/versions/${d.versionId}/signoffs`, { note: 'Hook is done.' })
    expect(res.status, res.text).toBe(201)
    expect(res.body).toMatchObject({ status: 'open', versionNumber: 1, requestedBy: { id: crew.users.writer.id }, note: 'Hook is done.' })
    expect(res.body.signers.map((s: any) => s.userId).sort()).toEqual([crew.users.producer.id, crew.users.writer.id].sort())
    const mail = await waitForMail(crew.users.producer.email, m => m.subject.includes(d.title) && m.subject.startsWith('Sign-off asked'))
    expect(mail.text).toContain('Hook is done.')
    expect(mail.text).toContain(`/songs/${d.songId}/signoff`)
  })

  it('lets a listener read sign-offs but never ask, choose signers or sign', async () => {
    const d = await draftWithLines(crew)
    expect((await crew.as.listener.post(`/api/versions/${d.versionId}/signoffs`, {})).status).toBe(403)
    const id = await requestSignoff(crew.as.writer, d.versionId)
    expect((await crew.as.listener.get(`/api/signoffs/${id}`)).status).toBe(200)
    expect((await crew.as.listener.post(`/api/signoffs/${id}/decision`, { decision: 'approve' })).status).toBe(403)
    const listed = await crew.as.owner.put(`/api/signoffs/${id}/signers`, { userIds: [crew.users.writer.id, crew.users.listener.id] })
    expect(listed.status).toBe(400)
    expect(listed.body.message).toMatch(/listener in this crew and cannot sign off/)
    expect((await crew.as.writer.put(`/api/signoffs/${id}/signers`, { userIds: [crew.users.writer.id] })).status).toBe(403)
  })

  it('lets only listed signers decide', async () => {
    const d = await draftWithLines(crew)
    const id = await requestSignoff(crew.as.writer, d.versionId)
    const res = await crew.as.cowriter.post(`/api/signoffs/${id}/decision`, { decision: 'approve' })
    expect(res.status).toBe(403)
    expect(res.body.message).toMatch(/not a signer/)
  })

  it('asks only on the newest version, once per draft, and not with nothing performed', async () => {
    const d = await draftWithLines(crew)
    const v2 = await crew.as.writer.post(`/api/drafts/${d.draftId}/versions`, { baseVersionId: d.versionId, lines: SAMPLE_LINES.slice(0, 2) })
    const old = await crew.as.writer.post(`/api/versions/${d.versionId}/signoffs`, {})
    expect(old.status).toBe(409)
    expect(old.body.message).toMatch(/not the newest/)
    await requestSignoff(crew.as.writer, v2.body.id)
    const again = await crew.as.owner.post(`/api/versions/${v2.body.id}/signoffs`, {})
    expect(again.status).toBe(409)
    expect(again.body.message).toMatch(/already has an open sign-off/)

    const empty = await draftWithLines(crew, [{ id: 'o', bar: 1, text: 'gone', out: true }, { id: 'e', bar: 2, text: '' }])
    const nothing = await crew.as.writer.post(`/api/versions/${empty.versionId}/signoffs`, {})
    expect(nothing.status).toBe(409)
    expect(nothing.body.message).toMatch(/nothing to sign off/)
  })

  it('answers bad input with 4xx and a message', async () => {
    const d = await draftWithLines(crew)
    const id = await requestSignoff(crew.as.writer, d.versionId)
    const cases: Array<[string, string, unknown, number]> = [
      ['POST', `/api/signoffs/${id}/decision`, { decision: 'maybe' }, 400],
      ['POST', `/api/signoffs/${id}/decision`, { decision: 'decline', comment: '   ' }, 400],
      ['POST', `/api/signoffs/${id}/decision`, { decision: 'approve', comment: 'x'.repeat(2000) }, 400],
      ['PUT', `/api/signoffs/${id}/signers`, { userIds: [] }, 400],
      ['PUT', `/api/signoffs/${id}/signers`, { userIds: ['nope'] }, 400],
      ['PUT', `/api/signoffs/${id}/signers`, { userIds: [crew.users.writer.id, crew.users.writer.id] }, 400],
      ['PUT', `/api/signoffs/${id}/signers`, { userIds: [crew.users.outsider.id] }, 400],
      ['POST', `/api/versions/${d.versionId}/signoffs`, { note: 42 }, 400],
      ['POST', '/api/signoffs/not-an-id/decision', { decision: 'approve' }, 404],
      ['POST', '/api/seals/00000000-0000-0000-0000-000000000000/unseal', { reason: 'long enough' }, 404],
    ]
    for (const [method, path, body, status] of cases) {
      const client = method === 'PUT' ? crew.as.owner : crew.as.writer
      const res = await client.request(method, path, body)
      expect(res.status, `${method} ${path} ${JSON.stringify(body)}`).toBe(status)
      expect(res.body).toMatchObject({ statusCode: status, message: expect.any(String) })
    }
  })
})

describe('closing a sign-off', () => {
  it('closes on a decline, with the comment, and tells the requester', async () => {
    const d = await draftWithLines(crew)
    const id = await requestSignoff(crew.as.writer, d.versionId)
    const res = await crew.as.producer.post(`/api/signoffs/${id}/decision`, { decision: 'decline', comment: 'Bar 3 is crowded; drop a line.' })
    expect(res.status, res.text).toBe(200)
    expect(res.body.signoff).toMatchObject({ status: 'declined', closedReason: expect.stringContaining('Bar 3 is crowded') })
    const mail = await waitForMail(crew.users.writer.email, m => m.subject.startsWith('Sign-off declined') && m.subject.includes(d.title))
    expect(mail.text).toContain('Bar 3 is crowded; drop a line.')
    expect((await crew.as.writer.post(`/api/signoffs/${id}/decision`, { decision: 'approve' })).status).toBe(409)
  })

  it('is cancelled by a new version of the draft; signers are told by mail and a song event', async () => {
    const d = await draftWithLines(crew)
    const id = await requestSignoff(crew.as.writer, d.versionId)
    const v2 = await crew.as.writer.post(`/api/drafts/${d.draftId}/versions`, { baseVersionId: d.versionId, lines: SAMPLE_LINES.slice(1) })
    expect(v2.status).toBe(201)
    const got = await crew.as.listener.get(`/api/signoffs/${id}`)
    expect(got.body).toMatchObject({ status: 'cancelled', closedReason: expect.stringContaining('Version 2 was saved') })
    const mail = await waitForMail(crew.users.producer.email, m => m.subject.startsWith('Sign-off cancelled') && m.subject.includes(d.title))
    expect(mail.text).toContain('Version 2 was saved')
    await waitForEvent(e => e.type === 'signoff' && e.signoffId === id && e.status === 'cancelled' && e.songId === d.songId)
  })

  it('is cancelled when the producer marks a line out (that is a new version too)', async () => {
    const d = await draftWithLines(crew)
    const id = await requestSignoff(crew.as.writer, d.versionId)
    const lines = SAMPLE_LINES.map(l => (l.id === 'a2' ? { ...l, out: true } : l))
    expect((await crew.as.producer.post(`/api/drafts/${d.draftId}/out-marks`, { baseVersionId: d.versionId, lines })).status).toBe(201)
    expect((await crew.as.listener.get(`/api/signoffs/${id}`)).body.status).toBe('cancelled')
  })

  it('can be withdrawn by its requester or an owner only', async () => {
    const d = await draftWithLines(crew)
    const id = await requestSignoff(crew.as.owner, d.versionId)
    expect((await crew.as.writer.post(`/api/signoffs/${id}/withdraw`)).status).toBe(403)
    const res = await crew.as.owner.post(`/api/signoffs/${id}/withdraw`)
    expect(res.body.status).toBe('withdrawn')
  })
})

describe('sealing', () => {
  it('refuses the last approval until the split sheet totals 100.00 % and is confirmed; then seals and mails the PDF', async () => {
    const d = await draftWithLines(crew)
    const id = await requestSignoff(crew.as.writer, d.versionId)
    expect((await crew.as.producer.post(`/api/signoffs/${id}/decision`, { decision: 'approve', comment: 'Beat sits right.' })).body.sealed).toBe(false)
    const early = await crew.as.writer.post(`/api/signoffs/${id}/decision`, { decision: 'approve' })
    expect(early.status).toBe(409)
    expect(early.body.message).toMatch(/split sheet is empty/)
    // Nothing was recorded for the refused approval.
    const [writerRow] = await sql('SELECT decision FROM signoff_signers WHERE request_id = $1 AND user_id = $2', [id, crew.users.writer.id])
    expect(writerRow.decision).toBeNull()

    await crew.as.writer.put(`/api/songs/${d.songId}/split`, { lines: [
      { userId: crew.users.writer.id, name: 'Test writer', share: '70' },
      { userId: crew.users.cowriter.id, name: 'Test cowriter', share: '30' },
    ] })
    await crew.as.writer.post(`/api/songs/${d.songId}/split/confirm`, {})
    const unconfirmed = await crew.as.writer.post(`/api/signoffs/${id}/decision`, { decision: 'approve' })
    expect(unconfirmed.status).toBe(409)
    expect(unconfirmed.body.message).toMatch(/still to confirm: Test cowriter/)
    await crew.as.cowriter.post(`/api/songs/${d.songId}/split/confirm`, {})

    const last = await crew.as.writer.post(`/api/signoffs/${id}/decision`, { decision: 'approve', comment: 'Final.' })
    expect(last.status, last.text).toBe(200)
    expect(last.body).toMatchObject({ sealed: true, signoff: { status: 'sealed' } })
    const version = await crew.as.listener.get(`/api/versions/${d.versionId}`)
    expect(version.body).toMatchObject({ sealed: true, sealedAt: expect.any(String) })
    const seal = (await crew.as.listener.get(`/api/songs/${d.songId}/seal`)).body.seal
    expect(seal.signers.map((s: any) => s.name).sort()).toEqual(['Test producer', 'Test writer'])
    expect(seal.split.map((s: any) => s.shareBp)).toEqual([7000, 3000])

    // Every member gets the PDF, the listener too.
    for (const who of ['listener', 'owner', 'cowriter'] as const) {
      const mail = await waitForMail(crew.users[who].email, m => m.subject.startsWith('Sealed') && m.subject.includes(d.title))
      expect(mail.attachments[0]).toMatchObject({ contentType: 'application/pdf' })
      if (who === 'listener') {
        // Debian poppler-utils reads the attachment back.
        const text = execFileSync('pdftotext', ['-layout', attachmentPath(mail), '-'], { encoding: 'utf8' })
        expect(text).toContain(SAMPLE_LINES[0]!.text)
        expect(text).not.toContain('this line stays out')
      }
    }
  })

  it('keeps a sealed draft from taking new versions and the song from a second seal', async () => {
    const d = await draftWithLines(crew)
    await confirmedSplit(crew, d.songId)
    const id = await requestSignoff(crew.as.writer, d.versionId)
    await crew.as.owner.put(`/api/signoffs/${id}/signers`, { userIds: [crew.users.owner.id] })
    expect((await crew.as.owner.post(`/api/signoffs/${id}/decision`, { decision: 'approve' })).body.sealed).toBe(true)

    const save = await crew.as.writer.post(`/api/drafts/${d.draftId}/versions`, { baseVersionId: d.versionId, lines: [] })
    expect(save.status).toBe(409)
    expect(save.body.message).toMatch(/holds the sealed final sheet/)
    const split = await crew.as.writer.put(`/api/songs/${d.songId}/split`, { lines: [{ name: 'Someone', share: 100 }] })
    expect(split.status).toBe(409)
    const other = await crew.as.writer.post(`/api/songs/${d.songId}/drafts`, { name: 'Other', fromVersionId: d.versionId })
    const second = await crew.as.writer.post(`/api/versions/${other.body.headVersionId}/signoffs`, {})
    expect(second.status).toBe(409)
    expect(second.body.message).toMatch(/already has a sealed final sheet/)
  })

  it('lets only the owner unseal, with a reason; the sealed version stays and a new main draft starts from it', async () => {
    const d = await draftWithLines(crew)
    await confirmedSplit(crew, d.songId)
    const id = await requestSignoff(crew.as.writer, d.versionId)
    await crew.as.owner.put(`/api/signoffs/${id}/signers`, { userIds: [crew.users.writer.id] })
    await crew.as.writer.post(`/api/signoffs/${id}/decision`, { decision: 'approve' })
    const { seal } = (await crew.as.owner.get(`/api/songs/${d.songId}/seal`)).body

    expect((await crew.as.writer.post(`/api/seals/${seal.id}/unseal`, { reason: 'Writers want a new bridge' })).status).toBe(403)
    const noReason = await crew.as.owner.post(`/api/seals/${seal.id}/unseal`, { reason: ' ' })
    expect(noReason.status).toBe(400)
    expect(noReason.body.data.fields.reason).toMatch(/reason/)

    const res = await crew.as.owner.post(`/api/seals/${seal.id}/unseal`, { reason: 'The label asked for a clean hook.' })
    expect(res.status, res.text).toBe(201)
    expect((await crew.as.owner.post(`/api/seals/${seal.id}/unseal`, { reason: 'Twice over' })).status).toBe(409)

    const before = (await crew.as.listener.get(`/api/versions/${d.versionId}`)).body
    expect(before).toMatchObject({ sealed: false, lines: SAMPLE_LINES })
    const copy = (await crew.as.listener.get(`/api/versions/${res.body.versionId}`)).body
    expect(copy).toMatchObject({ kind: 'copy', lines: SAMPLE_LINES, draftId: res.body.draftId })
    const drafts = (await crew.as.listener.get(`/api/songs/${d.songId}/drafts`)).body
    expect(drafts.find((x: any) => x.isMain).id).toBe(res.body.draftId)

    const history = (await crew.as.listener.get(`/api/songs/${d.songId}/seal`)).body
    expect(history.seal).toBeNull()
    expect(history.history[0].lifted).toMatchObject({ reason: 'The label asked for a clean hook.', by: 'Test owner' })
    const activity = (await crew.as.listener.get(`/api/songs/${d.songId}/activity`)).body
    expect(activity.map((a: any) => a.kind)).toEqual(expect.arrayContaining(['version', 'signoff.requested', 'signoff.approved', 'seal', 'unseal']))
    expect(activity.find((a: any) => a.kind === 'unseal').detail).toBe('The label asked for a clean hook.')
    await waitForMail(crew.users.producer.email, m => m.subject.startsWith('Unsealed') && m.text.includes('clean hook'))
    // The old draft takes versions again once unsealed.
    expect((await crew.as.writer.post(`/api/drafts/${d.draftId}/versions`, { baseVersionId: d.versionId, lines: [] })).status).toBe(201)
  })
})

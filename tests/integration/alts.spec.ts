import { beforeAll, describe, expect, it } from 'vitest'
import { sql } from '../support/db'
import { allMail, waitForMail } from '../support/mail'
import { makeCrew, makeUser, signedIn, type TestCrew } from '../support/people'

let crew: TestCrew
let songId: string

beforeAll(async () => {
  crew = await makeCrew()
  songId = (await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'Alts song' })).body.id
})

const LINES = [
  { id: 'a1', bar: 1, text: 'Lamps on the avenue blinking in code' },
  { id: 'a2', bar: 2, text: 'I read every window along the road' },
  { id: 'a3', bar: 3, text: 'Pocket full of lint and a borrowed coat' },
]

/** A draft whose first version (by the writer) holds LINES. */
async function draftWithLines(lines = LINES) {
  const draft = (await crew.as.writer.post(`/api/songs/${songId}/drafts`, { name: 'Alt take' })).body
  const v1 = await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: null, lines })
  expect(v1.status).toBe(201)
  return { draftId: draft.id as string, headId: v1.body.id as string }
}

describe('alts', () => {
  it('a co-writer proposes an alt on an exact line (201) but can never save the draft (403)', async () => {
    const { draftId, headId } = await draftWithLines()
    const proposed = await crew.as.cowriter.post(`/api/drafts/${draftId}/alts`, { lineId: 'a2', text: 'I read every window on the long way home' })
    expect(proposed.status).toBe(201)
    expect(proposed.body).toMatchObject({
      lineId: 'a2', lineText: LINES[1]!.text, text: 'I read every window on the long way home', status: 'open',
      authorId: crew.users.cowriter.id, up: 0, down: 0, myVote: null, commentCount: 0,
    })
    // Figures from the prosody engine (CMU Pronouncing Dictionary): "every" has 3 or 2
    // syllables, so the alt counts 11–12 and the line 10–11; "home" leaves the code/road family.
    expect(proposed.body.figures).toEqual({ syllables: '11–12', keepsFamily: false })
    expect(proposed.body.lineFigures).toMatchObject({ syllables: '10–11', family: expect.any(String) })
    const save = await crew.as.cowriter.post(`/api/drafts/${draftId}/versions`, { baseVersionId: headId, lines: LINES.map(l => (l.id === 'a2' ? { ...l, text: 'sneaked in' } : l)) })
    expect(save.status).toBe(403)
    expect((await crew.as.cowriter.post(`/api/versions/${headId}/restore`)).status).toBe(403)
    expect((await crew.as.cowriter.post(`/api/alts/${proposed.body.id}/take`)).status).toBe(403)
    expect((await crew.as.cowriter.patch(`/api/drafts/${draftId}`, { name: 'mine now' })).status).toBe(403)
    // The draft is exactly as the writer left it.
    const versions = await sql('SELECT number, lines FROM versions WHERE draft_id = $1', [draftId])
    expect(versions).toEqual([{ number: 1, lines: LINES }])
  })

  it('refuses alts on lines that are not in the head, and bad input', async () => {
    const { draftId } = await draftWithLines()
    const missing = await crew.as.cowriter.post(`/api/drafts/${draftId}/alts`, { lineId: 'nope', text: 'for a line that is not there' })
    expect(missing.status).toBe(409)
    expect(missing.body.message).toMatch(/not in the draft/)
    expect((await crew.as.cowriter.post(`/api/drafts/${draftId}/alts`, { lineId: 'a1', text: '   ' })).status).toBe(400)
    expect((await crew.as.cowriter.post(`/api/drafts/${draftId}/alts`, { lineId: 'a1', text: LINES[0]!.text })).status).toBe(400)
    expect((await crew.as.cowriter.post(`/api/drafts/${draftId}/alts`, { lineId: 'bad id!', text: 'x' })).body.data.fields).toHaveProperty('lineId')
    expect((await crew.as.cowriter.post(`/api/drafts/${draftId}/alts`, { text: 'x'.repeat(401), lineId: 'a1' })).status).toBe(400)
    expect((await crew.as.cowriter.get(`/api/drafts/${draftId}/alts?status=maybe`)).status).toBe(400)
    const empty = (await crew.as.writer.post(`/api/songs/${songId}/drafts`, { name: 'Empty' })).body.id
    expect((await crew.as.cowriter.post(`/api/drafts/${empty}/alts`, { lineId: 'a1', text: 'no head yet' })).status).toBe(409)
    expect((await crew.as.cowriter.put(`/api/alts/not-a-uuid/vote`, { value: 1 })).status).toBe(404)
  })

  it('one vote per member, changeable and retractable, with tallies and my vote', async () => {
    const { draftId } = await draftWithLines()
    const alt = (await crew.as.cowriter.post(`/api/drafts/${draftId}/alts`, { lineId: 'a1', text: 'Lamps on the avenue spelling my code' })).body
    expect((await crew.as.producer.put(`/api/alts/${alt.id}/vote`, { value: 1 })).body).toEqual({ altId: alt.id, up: 1, down: 0, myVote: 1 })
    expect((await crew.as.producer.put(`/api/alts/${alt.id}/vote`, { value: 1 })).body).toMatchObject({ up: 1, down: 0 })
    expect((await crew.as.writer.put(`/api/alts/${alt.id}/vote`, { value: -1 })).body).toMatchObject({ up: 1, down: 1, myVote: -1 })
    expect((await crew.as.producer.put(`/api/alts/${alt.id}/vote`, { value: -1 })).body).toMatchObject({ up: 0, down: 2 })
    expect((await crew.as.writer.put(`/api/alts/${alt.id}/vote`, { value: 0 })).body).toMatchObject({ up: 0, down: 1, myVote: null })
    expect((await crew.as.listener.put(`/api/alts/${alt.id}/vote`, { value: 1 })).status).toBe(403)
    expect((await crew.as.producer.put(`/api/alts/${alt.id}/vote`, { value: 2 })).status).toBe(400)
    expect((await sql('SELECT count(*)::int AS n FROM alt_votes WHERE alt_id = $1', [alt.id]))[0].n).toBe(1)
    // The database keeps votes to +1/−1 on its own.
    await expect(sql(`UPDATE alt_votes SET value = 5 WHERE alt_id = $1`, [alt.id])).rejects.toThrow(/alt_votes_value_check/)
    const listed = (await crew.as.producer.get(`/api/drafts/${draftId}/alts?lineId=a1`)).body
    expect(listed).toHaveLength(1)
    expect(listed[0]).toMatchObject({ id: alt.id, up: 0, down: 1, myVote: -1 })
  })

  it('comments: listed oldest first, counted on the alt', async () => {
    const { draftId } = await draftWithLines()
    const alt = (await crew.as.cowriter.post(`/api/drafts/${draftId}/alts`, { lineId: 'a3', text: 'Pocket full of lint and a coat that I owe' })).body
    expect((await crew.as.producer.post(`/api/alts/${alt.id}/comments`, { body: 'Owe lands better on the beat.' })).status).toBe(201)
    expect((await crew.as.writer.post(`/api/alts/${alt.id}/comments`, { body: 'Agreed, trying it.' })).status).toBe(201)
    expect((await crew.as.writer.post(`/api/alts/${alt.id}/comments`, { body: '' })).status).toBe(400)
    expect((await crew.as.listener.post(`/api/alts/${alt.id}/comments`, { body: 'just listening' })).status).toBe(403)
    const comments = (await crew.as.listener.get(`/api/alts/${alt.id}/comments`)).body
    expect(comments.map((c: any) => [c.authorId, c.body])).toEqual([[crew.users.producer.id, 'Owe lands better on the beat.'], [crew.users.writer.id, 'Agreed, trying it.']])
    expect((await crew.as.listener.get(`/api/alts/${alt.id}`)).body.commentCount).toBe(2)
  })

  it('take: a new version on the head with only that line replaced; the alt records it', async () => {
    const { draftId, headId } = await draftWithLines()
    // The head moved after the alt was proposed: the take still lands on the current head.
    const alt = (await crew.as.cowriter.post(`/api/drafts/${draftId}/alts`, { lineId: 'a2', text: 'I count all the windows along the road' })).body
    const v2Lines = [...LINES, { id: 'a4', bar: 4, text: 'Last stop calling and I know it by heart' }]
    const v2 = await crew.as.writer.post(`/api/drafts/${draftId}/versions`, { baseVersionId: headId, lines: v2Lines })
    const taken = await crew.as.writer.post(`/api/alts/${alt.id}/take`)
    expect(taken.status).toBe(201)
    expect(taken.body.version.number).toBe(3)
    expect(taken.body.alt).toMatchObject({ status: 'taken', decidedBy: crew.users.writer.id, takenVersionId: taken.body.version.id })
    const v3 = (await crew.as.listener.get(`/api/versions/${taken.body.version.id}`)).body
    expect(v3.lines).toEqual(v2Lines.map(l => (l.id === 'a2' ? { ...l, text: 'I count all the windows along the road' } : l)))
    expect(v3).toMatchObject({ kind: 'alt', parentId: v2.body.id, authorId: crew.users.writer.id })
    expect(JSON.stringify(v3.doc)).toContain('I count all the windows along the road')
    const again = await crew.as.owner.post(`/api/alts/${alt.id}/take`)
    expect(again.status).toBe(409)
    expect((await crew.as.owner.post(`/api/alts/${alt.id}/pass`)).status).toBe(409)
    expect((await crew.as.producer.put(`/api/alts/${alt.id}/vote`, { value: 1 })).status).toBe(409)
  })

  it('take answers 409 when the line is gone; pass keeps the alt and leaves the draft alone', async () => {
    const { draftId, headId } = await draftWithLines()
    const gone = (await crew.as.cowriter.post(`/api/drafts/${draftId}/alts`, { lineId: 'a3', text: 'A coat full of lint and a borrowed tone' })).body
    const kept = (await crew.as.cowriter.post(`/api/drafts/${draftId}/alts`, { lineId: 'a1', text: 'Lamps on the avenue talking in code' })).body
    await crew.as.writer.post(`/api/drafts/${draftId}/versions`, { baseVersionId: headId, lines: LINES.slice(0, 2) })
    const refused = await crew.as.writer.post(`/api/alts/${gone.id}/take`)
    expect(refused.status).toBe(409)
    expect(refused.body.message).toMatch(/no longer in the draft/)
    expect((await crew.as.writer.get(`/api/alts/${gone.id}`)).body.status).toBe('open')

    const passed = await crew.as.owner.post(`/api/alts/${kept.id}/pass`)
    expect(passed.status).toBe(200)
    expect(passed.body).toMatchObject({ id: kept.id, status: 'passed', decidedBy: crew.users.owner.id, takenVersionId: null })
    expect((await sql('SELECT count(*)::int AS n FROM versions WHERE draft_id = $1', [draftId]))[0].n).toBe(2)
    const all = (await crew.as.listener.get(`/api/drafts/${draftId}/alts`)).body
    expect(all.map((a: any) => [a.id, a.status])).toEqual([[gone.id, 'open'], [kept.id, 'passed']])
    expect((await crew.as.listener.get(`/api/drafts/${draftId}/alts?status=passed`)).body).toHaveLength(1)
  })
})

describe('alt notifications', () => {
  it('tell the line\'s writer (the author of the earliest version holding it) in the app, and the alt\'s author when decided', async () => {
    // The owner wrote line o1; the writer edits it later: o1 stays the owner's line.
    const draft = (await crew.as.owner.post(`/api/songs/${songId}/drafts`, { name: 'Whose line' })).body
    const v1 = await crew.as.owner.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: null, lines: [{ id: 'o1', bar: 5, text: 'Owner wrote this first' }] })
    await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: v1.body.id, lines: [{ id: 'o1', bar: 5, text: 'Writer touched it after' }, { id: 'w1', bar: 6, text: 'Writer line' }] })
    const alt = (await crew.as.cowriter.post(`/api/drafts/${draft.id}/alts`, { lineId: 'o1', text: 'Co-writer idea for bar five' })).body

    const ownerInbox = (await crew.as.owner.get('/api/notifications?unread=1')).body
    const mine = ownerInbox.items.filter((n: any) => n.altId === alt.id)
    expect(mine).toHaveLength(1)
    expect(mine[0]).toMatchObject({ kind: 'alt.proposed', songId, draftId: draft.id, readAt: null })
    expect(mine[0].body).toContain('bar 5')
    expect((await crew.as.writer.get('/api/notifications')).body.items.filter((n: any) => n.altId === alt.id)).toHaveLength(0)

    const before = ownerInbox.unread
    const read = await crew.as.owner.post('/api/notifications/read', { ids: [mine[0].id] })
    expect(read.body.unread).toBe(before - 1)
    expect((await crew.as.owner.post('/api/notifications/read', { ids: ['nope'] })).status).toBe(400)
    expect((await crew.as.owner.post('/api/notifications/read', {})).status).toBe(400)
    // Someone else's notification id changes nothing.
    await crew.as.writer.post('/api/notifications/read', { ids: [mine[0].id] })

    await crew.as.writer.post(`/api/alts/${alt.id}/pass`)
    const cowriter = (await crew.as.cowriter.get('/api/notifications')).body
    expect(cowriter.items.find((n: any) => n.altId === alt.id)).toMatchObject({ kind: 'alt.passed', readAt: null })
    expect((await crew.as.cowriter.post('/api/notifications/read', { all: true })).body.unread).toBe(0)
  })

  it('ten alts on a writer\'s lines in a short window make one e-mail (through the outbox)', async () => {
    // A writer of their own, so no other test's alts fall into the same batch.
    const poet = await makeUser('poet')
    await sql(`INSERT INTO memberships (crew_id, user_id, role) VALUES ($1, $2, 'writer')`, [crew.crewId, poet.id])
    const asPoet = await signedIn(poet)
    // A song of its own too: a line's writer is looked up across the song's drafts by line id.
    const poetSong = (await asPoet.post(`/api/crews/${crew.crewId}/songs`, { title: 'Poet song' })).body.id
    const draftId = (await asPoet.post(`/api/songs/${poetSong}/drafts`, { name: 'Poet draft' })).body.id
    expect((await asPoet.post(`/api/drafts/${draftId}/versions`, { baseVersionId: null, lines: LINES })).status).toBe(201)
    const texts = Array.from({ length: 10 }, (_, i) => `Batch alt number ${i + 1} for the road`)
    for (const [i, text] of texts.entries()) {
      const res = await crew.as.cowriter.post(`/api/drafts/${draftId}/alts`, { lineId: LINES[i % 3]!.id, text })
      expect(res.status).toBe(201)
    }
    const mail = await waitForMail(poet.email, m => m.text.includes('Batch alt number 1 '))
    expect(mail.subject).toBe('10 new alts on your lines')
    for (const text of texts) expect(mail.text).toContain(text)
    // Exactly one message for the ten, even after the worker ran again (it runs every 500 ms here).
    await new Promise(r => setTimeout(r, 1500))
    const toPoet = (await allMail()).filter(m => m.envelope.to.includes(poet.email.toLowerCase()))
    expect(toPoet).toHaveLength(1)
    const outbox = await sql(`SELECT count(*)::int AS n FROM outbox WHERE "to" = $1`, [poet.email])
    expect(outbox[0].n).toBe(1)
    const pending = await sql(`SELECT count(*)::int AS n FROM notifications WHERE user_id = $1 AND email AND mailed_at IS NULL`, [poet.id])
    expect(pending[0].n).toBe(0)
  })
})

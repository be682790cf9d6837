import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { sql } from '../support/db'
import { ApiClient } from '../support/http'
import { makeCrew, type TestCrew } from '../support/people'
import { startAnotherServer } from '../support/servers'
import { openEventStream, type EventStreamClient } from '../support/sse'

let crew: TestCrew
let songId: string
let other: Awaited<ReturnType<typeof startAnotherServer>>
const streams: EventStreamClient[] = []

/** The same signed-in browser, talking to the second server process. */
function onOther(client: ApiClient): ApiClient {
  const copy = new ApiClient(other.baseUrl)
  copy.cookies = new Map(client.cookies)
  return copy
}

async function open(client: ApiClient, song = songId) {
  const s = await openEventStream(client, `/api/songs/${song}/events`)
  streams.push(s)
  return s
}

beforeAll(async () => {
  crew = await makeCrew()
  songId = (await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'Live song' })).body.id
  other = await startAnotherServer('live')
})

afterAll(async () => {
  for (const s of streams) s.close()
  await other?.stop()
})

async function draftWithLine() {
  const draft = (await crew.as.writer.post(`/api/songs/${songId}/drafts`, { name: `Live ${Date.now()}` })).body
  const v1 = (await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: null, lines: [{ id: 'x1', bar: 1, text: 'Heard it on the other side' }] })).body
  return { draftId: draft.id as string, headId: v1.id as string }
}

describe('live events (server-sent events over LISTEN/NOTIFY)', () => {
  it('members get a stream (hello, then the song\'s events); others are refused', async () => {
    const s = await open(crew.as.listener)
    expect(s.status).toBe(200)
    await s.next('hello', d => d.songId === songId && d.userId === crew.users.listener.id)
    const { draftId } = await draftWithLine()
    const draft = await s.next('draft', d => d.draftId === draftId)
    expect(draft.data.songId).toBe(songId)
    const version = await s.next('version', d => d.draftId === draftId)
    expect(version.data).toMatchObject({ number: 1, authorId: crew.users.writer.id })

    expect((await open(crew.as.outsider)).status).toBe(404)
    expect((await open(crew.as.anonymous)).status).toBe(401)
  })

  it('keeps the stream alive with comments and does not leak other songs\' events', async () => {
    const s = await open(crew.as.producer)
    await s.next('hello')
    const elsewhere = (await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'Another song' })).body.id
    const d = (await crew.as.writer.post(`/api/songs/${elsewhere}/drafts`, { name: 'Elsewhere' })).body
    // A marker on our own song after it: once it arrives, the other song's event would have too.
    const { draftId } = await draftWithLine()
    await s.next('draft', e => e.draftId === draftId)
    expect(s.events.some(e => e.data?.draftId === d.id)).toBe(false)
    expect(s.events.every(e => e.type === 'hello' || e.type === 'presence' || e.data.songId === songId)).toBe(true)
    await new Promise(r => setTimeout(r, 1300))
    expect(s.comments).toBeGreaterThan(0)
  })

  it('two server processes: an event published through one reaches a client of the other', async () => {
    // Listener's stream on process B; the writer works through process A (the main test server).
    const onB = await open(onOther(crew.as.listener))
    expect(onB.status).toBe(200)
    await onB.next('hello')
    const { draftId, headId } = await draftWithLine()
    await onB.next('version', d => d.draftId === draftId && d.number === 1)
    const alt = (await crew.as.cowriter.post(`/api/drafts/${draftId}/alts`, { lineId: 'x1', text: 'Heard it from the other room' })).body
    await onB.next('alt', d => d.altId === alt.id && d.action === 'proposed')
    await crew.as.producer.put(`/api/alts/${alt.id}/vote`, { value: 1 })
    await onB.next('vote', d => d.altId === alt.id)
    await crew.as.producer.post(`/api/alts/${alt.id}/comments`, { body: 'heard' })
    await onB.next('comment', d => d.altId === alt.id)
    await crew.as.writer.post(`/api/alts/${alt.id}/take`)
    await onB.next('alt', d => d.altId === alt.id && d.action === 'taken')
    await onB.next('version', d => d.draftId === draftId && d.number === 2)

    // And the other way round: a save through B reaches a stream on A.
    const onA = await open(crew.as.owner)
    await onA.next('hello')
    const head = (await crew.as.owner.get(`/api/drafts/${draftId}`)).body.headVersionId
    expect(head).not.toBe(headId)
    const saved = await onOther(crew.as.writer).post(`/api/drafts/${draftId}/versions`, { baseVersionId: head, lines: [{ id: 'x1', bar: 1, text: 'Saved through process B' }] })
    expect(saved.status).toBe(201)
    await onA.next('version', d => d.versionId === saved.body.id)
  })

  it('presence: both processes list who has the song open, and drop them when they leave', async () => {
    const song = (await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'Presence song' })).body.id
    const watcher = await open(crew.as.owner, song)
    await watcher.next('hello')
    const cowriterOnB = await open(onOther(crew.as.cowriter), song)
    await cowriterOnB.next('hello')
    await watcher.next('presence', d => d.userId === crew.users.cowriter.id && d.action === 'joined')
    for (const client of [crew.as.writer, onOther(crew.as.writer)]) {
      const list = (await client.get(`/api/songs/${song}/presence`)).body
      expect(list.map((p: any) => [p.userId, p.role]).sort()).toEqual([[crew.users.owner.id, 'owner'], [crew.users.cowriter.id, 'cowriter']].sort())
    }
    cowriterOnB.close()
    await watcher.next('presence', d => d.userId === crew.users.cowriter.id && d.action === 'left')
    const after = (await crew.as.writer.get(`/api/songs/${song}/presence`)).body
    expect(after.map((p: any) => p.userId)).toEqual([crew.users.owner.id])
    expect((await crew.as.outsider.get(`/api/songs/${song}/presence`)).status).toBe(404)
  })

  it('a member removed from the crew is dropped from the stream', async () => {
    const c = await makeCrew()
    const song = (await c.as.writer.post(`/api/crews/${c.crewId}/songs`, { title: 'Leaving' })).body.id
    const s = await open(c.as.listener, song)
    await s.next('hello')
    expect((await c.as.owner.delete(`/api/crews/${c.crewId}/members/${c.users.listener.id}`)).status).toBe(204)
    const closed = await s.next('closed', () => true, 8000)
    expect(closed.data.reason).toMatch(/no longer a member/)
    await s.closed
    let left = -1
    for (let i = 0; i < 30 && left !== 0; i++) {
      left = (await sql('SELECT count(*)::int AS n FROM presence WHERE song_id = $1', [song]))[0].n
      if (left) await new Promise(r => setTimeout(r, 100))
    }
    expect(left).toBe(0)
  })
})

import { beforeAll, describe, expect, it } from 'vitest'
import { sql } from '../support/db'
import { makeCrew, makeUser, signedIn, type TestCrew } from '../support/people'
import type { ApiClient } from '../support/http'

let crew: TestCrew
let songId: string

beforeAll(async () => {
  crew = await makeCrew()
  songId = (await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'Versions song' })).body.id
})

async function newDraft(name = 'Main take') {
  const res = await crew.as.writer.post(`/api/songs/${songId}/drafts`, { name })
  expect(res.status).toBe(201)
  return res.body as { id: string, name: string, headVersionId: string | null }
}

const line = (id: string, bar: number, text: string) => ({ id, bar, text })

describe('drafts and versions (contract)', () => {
  it('creates drafts and lists them with their head', async () => {
    const draft = await newDraft('Hook ideas')
    expect(draft).toMatchObject({ name: 'Hook ideas', headVersionId: null })
    const list = await crew.as.listener.get(`/api/songs/${songId}/drafts`)
    expect(list.status).toBe(200)
    expect(list.body.find((d: any) => d.id === draft.id)).toMatchObject({ id: draft.id, name: 'Hook ideas', headVersionId: null })
  })

  it('saves versions on the head and refuses a stale base with 409 and the head', async () => {
    const draft = await newDraft()
    const first = await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: null, lines: [line('l1', 1, 'first line')], note: 'start' })
    expect(first.status).toBe(201)
    expect(first.body).toEqual({ id: expect.any(String), number: 1 })
    const second = await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: first.body.id, lines: [line('l1', 1, 'first line, better')] })
    expect(second.body.number).toBe(2)

    const stale = await crew.as.owner.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: first.body.id, lines: [line('l1', 1, 'owner edit on v1')] })
    expect(stale.status).toBe(409)
    expect(stale.body).toMatchObject({ statusCode: 409, message: expect.stringContaining('version 2'), data: { head: { id: second.body.id, number: 2 } } })
    // The refused text is kept, whole.
    const [kept] = await sql('SELECT lines FROM side_saves WHERE id = $1', [stale.body.data.sideSaveId])
    expect(kept.lines).toEqual([line('l1', 1, 'owner edit on v1')])

    const list = await crew.as.listener.get(`/api/drafts/${draft.id}/versions`)
    expect(list.body.map((v: any) => v.number)).toEqual([2, 1])
    expect(list.body[1]).toMatchObject({ id: first.body.id, number: 1, authorId: crew.users.writer.id, note: 'start', createdAt: expect.any(String) })

    const got = await crew.as.listener.get(`/api/versions/${second.body.id}`)
    expect(got.body).toMatchObject({ id: second.body.id, number: 2, draftId: draft.id, lines: [line('l1', 1, 'first line, better')], sealed: false })
    expect(got.body.doc.type).toBe('doc')
  })

  it('refuses the first save when the draft already has a head', async () => {
    const draft = await newDraft()
    await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: null, lines: [] })
    const again = await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: null, lines: [] })
    expect(again.status).toBe(409)
    expect(again.body.data.head.number).toBe(1)
  })

  it('lets co-writers, producers and listeners read but not save (403)', async () => {
    const draft = await newDraft()
    for (const role of ['cowriter', 'producer', 'listener'] as const) {
      const res = await crew.as[role].post(`/api/drafts/${draft.id}/versions`, { baseVersionId: null, lines: [line('x', 1, 'not mine to write')] })
      expect(res.status, role).toBe(403)
    }
    expect((await sql('SELECT count(*)::int AS n FROM versions WHERE draft_id = $1', [draft.id]))[0].n).toBe(0)
    expect((await crew.as.outsider.get(`/api/drafts/${draft.id}/versions`)).status).toBe(404)
  })

  it('checks a sent document against the lines', async () => {
    const draft = await newDraft()
    const lines = [line('a', 1, 'one'), line('b', 2, 'two')]
    const doc = { type: 'doc', content: [{ type: 'block', attrs: { sectionId: null, kind: null, label: null }, content: lines.map(l => ({ type: 'line', attrs: { lineId: l.id, bar: l.bar, bars: 1, out: false }, content: [{ type: 'text', text: l.text }] })) }] }
    const ok = await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: null, lines, doc })
    expect(ok.status).toBe(201)
    const mismatch = await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: ok.body.id, lines: [line('a', 1, 'one')], doc })
    expect(mismatch.status).toBe(400)
    const foreign = await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: ok.body.id, lines: [], doc: { type: 'doc', content: [{ type: 'script', text: 'x' }] } })
    expect(foreign.status).toBe(400)
    const dup = await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: ok.body.id, lines: [line('a', 1, 'x'), line('a', 2, 'y')] })
    expect(dup.status).toBe(400)
    expect(dup.body.data.fields['lines.1.id']).toMatch(/appears twice/)
  })
})

describe('nothing anyone wrote is lost', () => {
  it('50 concurrent saves on one head: one becomes the head, 49 get 409 with it, all 50 texts are kept', async () => {
    const draft = await newDraft('Race')
    const base = await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: null, lines: [line('r', 1, 'base')] })
    // 50 different writers, each with their own session.
    const writers: ApiClient[] = []
    for (let i = 0; i < 50; i++) {
      const u = await makeUser(`racer${i}`)
      await sql(`INSERT INTO memberships (crew_id, user_id, role) VALUES ($1, $2, 'writer')`, [crew.crewId, u.id])
      writers.push(await signedIn(u))
    }
    const results = await Promise.all(writers.map((w, i) =>
      w.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: base.body.id, lines: [line('r', 1, `take number ${i}`)] })))

    const created = results.filter(r => r.status === 201)
    const refused = results.filter(r => r.status === 409)
    expect(created).toHaveLength(1)
    expect(refused).toHaveLength(49)
    for (const r of refused) expect(r.body.data.head).toEqual({ id: created[0]!.body.id, number: 2 })

    const inVersions = await sql(`SELECT lines->0->>'text' AS text FROM versions WHERE draft_id = $1 AND number = 2`, [draft.id])
    const aside = await sql(`SELECT lines->0->>'text' AS text FROM side_saves WHERE draft_id = $1`, [draft.id])
    const kept = new Set([...inVersions, ...aside].map(r => r.text))
    expect(kept.size).toBe(50)
    for (let i = 0; i < 50; i++) expect(kept.has(`take number ${i}`)).toBe(true)
  })
})

describe('history', () => {
  it('restores an old version as a new head and leaves history intact', async () => {
    const draft = await newDraft('Restore me')
    const v1 = await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: null, lines: [line('a', 1, 'the original')] })
    const v2 = await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: v1.body.id, lines: [line('a', 1, 'a worse idea')] })
    const restored = await crew.as.writer.post(`/api/versions/${v1.body.id}/restore`)
    expect(restored.status).toBe(201)
    expect(restored.body.number).toBe(3)
    const list = await crew.as.writer.get(`/api/drafts/${draft.id}/versions`)
    expect(list.body.map((v: any) => [v.number, v.kind])).toEqual([[3, 'restore'], [2, 'save'], [1, 'save']])
    expect((await crew.as.writer.get(`/api/versions/${v2.body.id}`)).body.lines[0].text).toBe('a worse idea')
    expect((await crew.as.writer.get(`/api/versions/${restored.body.id}`)).body.lines[0].text).toBe('the original')
    expect((await crew.as.cowriter.post(`/api/versions/${v1.body.id}/restore`)).status).toBe(403)
  })

  it('the database refuses to update or delete a version row (try it)', async () => {
    const draft = await newDraft('Immutable')
    const v1 = await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: null, lines: [line('a', 1, 'set in stone')] })
    await expect(sql(`UPDATE versions SET note = 'sneaky' WHERE id = $1`, [v1.body.id])).rejects.toThrow(/cannot be changed/)
    await expect(sql(`UPDATE versions SET lines = '[]'::jsonb WHERE id = $1`, [v1.body.id])).rejects.toThrow(/cannot be changed/)
    await expect(sql(`DELETE FROM versions WHERE id = $1`, [v1.body.id])).rejects.toThrow(/cannot be deleted/)
    expect((await sql('SELECT lines FROM versions WHERE id = $1', [v1.body.id]))[0].lines[0].text).toBe('set in stone')
  })

  it('deleting a song still removes its drafts and versions', async () => {
    const song = (await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'Short-lived' })).body.id
    const draft = (await crew.as.writer.post(`/api/songs/${song}/drafts`, { name: 'x' })).body.id
    await crew.as.writer.post(`/api/drafts/${draft}/versions`, { baseVersionId: null, lines: [line('a', 1, 'gone soon')] })
    expect((await crew.as.owner.delete(`/api/songs/${song}`)).status).toBe(204)
    expect((await sql('SELECT count(*)::int AS n FROM versions WHERE draft_id = $1', [draft]))[0].n).toBe(0)
  })

  it('duplicates a draft from any version', async () => {
    const draft = await newDraft('Source')
    const v1 = await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: null, lines: [line('a', 1, 'copy me')] })
    const copy = await crew.as.writer.post(`/api/songs/${songId}/drafts`, { name: 'Copy', fromVersionId: v1.body.id })
    expect(copy.status).toBe(201)
    const head = await crew.as.writer.get(`/api/versions/${copy.body.headVersionId}`)
    expect(head.body).toMatchObject({ number: 1, lines: [line('a', 1, 'copy me')] })
  })
})

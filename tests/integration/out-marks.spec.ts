// Marking lines out: the producer decides what is performed without rewriting a writer's words.
import { beforeAll, describe, expect, it } from 'vitest'
import { sql } from '../support/db'
import { makeCrew, type TestCrew } from '../support/people'
import { draftWithLines, SAMPLE_LINES } from '../support/finish'

let crew: TestCrew
beforeAll(async () => {
  crew = await makeCrew()
})

const withOut = (ids: string[]) => SAMPLE_LINES.map(l => ({ ...l, out: ids.includes(l.id) }))

describe('marking lines out', () => {
  it('lets the producer save a version whose only change is the out marks', async () => {
    const d = await draftWithLines(crew)
    const res = await crew.as.producer.post(`/api/drafts/${d.draftId}/out-marks`, { baseVersionId: d.versionId, lines: withOut(['a2']) })
    expect(res.status, res.text).toBe(201)
    expect(res.body).toMatchObject({ number: 2, marked: ['a2'], restored: ['a3'] })
    const v = (await crew.as.listener.get(`/api/versions/${res.body.id}`)).body
    expect(v.lines.map((l: any) => !!l.out)).toEqual([false, true, false, false, false])
    expect(v.lines.map((l: any) => l.text)).toEqual(SAMPLE_LINES.map(l => l.text))
    expect(v.doc.content.flatMap((b: any) => b.content.map((n: any) => n.attrs.out))).toEqual([false, true, false, false, false])
    expect(v.note).toBe('Marked 1 line out, brought 1 line back in')
    const [row] = await sql('SELECT author_id FROM versions WHERE id = $1', [res.body.id])
    expect(row.author_id).toBe(crew.users.producer.id)
    const sheet = (await crew.as.listener.get(`/api/versions/${res.body.id}/sheet`)).body
    expect(sheet.sections.flatMap((s: any) => s.lines.map((l: any) => l.id))).toEqual(['a1', 'a3', 'a4', 'a5'])
    expect(sheet.omitted).toBe(1)
  })

  it('refuses any change to words, bars or ids, and saves nothing', async () => {
    const d = await draftWithLines(crew)
    const rewritten = SAMPLE_LINES.map(l => (l.id === 'a1' ? { ...l, text: 'the producer\'s own words' } : l))
    const res = await crew.as.producer.post(`/api/drafts/${d.draftId}/out-marks`, { baseVersionId: d.versionId, lines: rewritten })
    expect(res.status).toBe(400)
    expect(res.body.message).toMatch(/Only out marks may change here: the words/)
    const moved = SAMPLE_LINES.map(l => (l.id === 'a1' ? { ...l, bar: 7 } : l))
    expect((await crew.as.producer.post(`/api/drafts/${d.draftId}/out-marks`, { baseVersionId: d.versionId, lines: moved })).status).toBe(400)
    const added = [...SAMPLE_LINES, { id: 'new', bar: 8, text: 'extra' }]
    expect((await crew.as.producer.post(`/api/drafts/${d.draftId}/out-marks`, { baseVersionId: d.versionId, lines: added })).status).toBe(400)
    const same = await crew.as.producer.post(`/api/drafts/${d.draftId}/out-marks`, { baseVersionId: d.versionId, lines: SAMPLE_LINES })
    expect(same.status).toBe(400)
    expect(same.body.message).toMatch(/Nothing to save/)
    expect((await sql('SELECT count(*)::int AS n FROM versions WHERE draft_id = $1', [d.draftId]))[0].n).toBe(1)
  })

  it('refuses a stale base with 409 and the head', async () => {
    const d = await draftWithLines(crew)
    const v2 = await crew.as.writer.post(`/api/drafts/${d.draftId}/versions`, { baseVersionId: d.versionId, lines: SAMPLE_LINES })
    const res = await crew.as.producer.post(`/api/drafts/${d.draftId}/out-marks`, { baseVersionId: d.versionId, lines: withOut(['a1']) })
    expect(res.status).toBe(409)
    expect(res.body.data.head).toEqual({ id: v2.body.id, number: 2 })
  })

  it('is for producers, writers and owners only; bad input is a 400', async () => {
    const d = await draftWithLines(crew)
    for (const role of ['cowriter', 'listener'] as const) {
      expect((await crew.as[role].post(`/api/drafts/${d.draftId}/out-marks`, { baseVersionId: d.versionId, lines: withOut(['a1']) })).status, role).toBe(403)
    }
    for (const body of [{}, { baseVersionId: 'x', lines: [] }, { baseVersionId: d.versionId, lines: 'a1' }, { baseVersionId: d.versionId, lines: [{ id: 'a1', bar: 0, text: '' }] }]) {
      const res = await crew.as.producer.post(`/api/drafts/${d.draftId}/out-marks`, body)
      expect(res.status, JSON.stringify(body)).toBe(400)
      expect(res.body.data.fields).toBeTypeOf('object')
    }
  })
})

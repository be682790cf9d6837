// Cadence placements stored with draft versions: sent with a save, carried over for unchanged
// lines, cleared with null, refused when malformed, and only writers and owners save them.
import { beforeAll, describe, expect, it } from 'vitest'
import { sql } from '../support/db'
import { makeCrew, type TestCrew } from '../support/people'

let crew: TestCrew
let songId: string
beforeAll(async () => {
  crew = await makeCrew()
  songId = (await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'Cadence song' })).body.id
})

const line = (id: string, bar: number, text: string) => ({ id, bar, text })
const lines = [line('a', 1, 'night bus home'), line('b', 2, 'window fogged with my name')]
const placement = { sub: '16', slots: [0, 4, 8] }

async function draftWithVersion() {
  const draft = (await crew.as.writer.post(`/api/songs/${songId}/drafts`, { name: 'Cadence take' })).body
  const v1 = await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: null, lines })
  expect(v1.status).toBe(201)
  return { draftId: draft.id as string, v1: v1.body.id as string }
}

describe('cadence with versions', () => {
  it('stores a placement with a new version and carries it over while the line is unchanged', async () => {
    const { draftId, v1 } = await draftWithVersion()
    expect((await crew.as.listener.get(`/api/versions/${v1}`)).body.cadence).toEqual({})
    const v2 = await crew.as.writer.post(`/api/drafts/${draftId}/versions`, { baseVersionId: v1, lines, cadence: { a: placement } })
    expect(v2.status).toBe(201)
    expect((await crew.as.cowriter.get(`/api/versions/${v2.body.id}`)).body.cadence).toEqual({ a: placement })
    // A save without cadence that edits line b keeps a's placement.
    const v3 = await crew.as.owner.post(`/api/drafts/${draftId}/versions`, { baseVersionId: v2.body.id, lines: [lines[0], line('b', 2, 'window fogged with our names')] })
    expect((await crew.as.listener.get(`/api/versions/${v3.body.id}`)).body.cadence).toEqual({ a: placement })
    // Editing line a drops its placement: the syllables it placed are gone.
    const v4 = await crew.as.writer.post(`/api/drafts/${draftId}/versions`, { baseVersionId: v3.body.id, lines: [line('a', 1, 'late bus home again'), lines[1]] })
    expect((await crew.as.listener.get(`/api/versions/${v4.body.id}`)).body.cadence).toEqual({})
    // Older versions keep theirs.
    expect((await crew.as.listener.get(`/api/versions/${v2.body.id}`)).body.cadence).toEqual({ a: placement })
  })

  it('clears a placement with null, and a restore brings back the restored version\'s cadence', async () => {
    const { draftId, v1 } = await draftWithVersion()
    const held = { sub: '8t', slots: [0, 3, -1], holds: [2, 0, 0], breaths: [5] }
    const v2 = await crew.as.writer.post(`/api/drafts/${draftId}/versions`, { baseVersionId: v1, lines, cadence: { a: held, b: placement } })
    const v3 = await crew.as.writer.post(`/api/drafts/${draftId}/versions`, { baseVersionId: v2.body.id, lines, cadence: { a: null } })
    expect((await crew.as.writer.get(`/api/versions/${v3.body.id}`)).body.cadence).toEqual({ b: placement })
    const restored = await crew.as.writer.post(`/api/versions/${v2.body.id}/restore`)
    expect(restored.status).toBe(201)
    expect((await crew.as.writer.get(`/api/versions/${restored.body.id}`)).body.cadence).toEqual({ a: held, b: placement })
  })

  it('answers 409 on a stale head and keeps the head as it was', async () => {
    const { draftId, v1 } = await draftWithVersion()
    await crew.as.writer.post(`/api/drafts/${draftId}/versions`, { baseVersionId: v1, lines, cadence: { a: placement } })
    const stale = await crew.as.owner.post(`/api/drafts/${draftId}/versions`, { baseVersionId: v1, lines, cadence: { b: placement } })
    expect(stale.status).toBe(409)
    expect(stale.body.data.head.number).toBe(2)
    const [row] = await sql(`SELECT cadence FROM versions v JOIN drafts d ON d.head_version_id = v.id WHERE d.id = $1`, [draftId])
    expect(row.cadence).toEqual({ a: placement })
  })

  it('refuses malformed placements with a 400 naming the field, and saves nothing', async () => {
    const { draftId, v1 } = await draftWithVersion()
    const bad = [
      [{ a: { sub: '32', slots: [0] } }, /subdivision/],
      [{ a: { sub: '16', slots: [4, 2] } }, /order/],
      [{ a: { sub: '16', slots: [0, 1], holds: [1] } }, /one hold per syllable/],
      [{ a: { sub: '16', slots: [-2] } }, /-1/],
      [{ zz: placement }, /not in this save: zz/],
      ['every slot', /cadence/i],
    ] as const
    for (const [cadence, message] of bad) {
      const res = await crew.as.writer.post(`/api/drafts/${draftId}/versions`, { baseVersionId: v1, lines, cadence })
      expect(res.status, JSON.stringify(cadence)).toBe(400)
      expect(res.body.message + JSON.stringify(res.body.data ?? {})).toMatch(message)
    }
    expect((await sql('SELECT count(*)::int AS n FROM versions WHERE draft_id = $1', [draftId]))[0].n).toBe(1)
  })

  it('lets writers and owners save a cadence; producers, co-writers and listeners only read it', async () => {
    const { draftId, v1 } = await draftWithVersion()
    for (const role of ['producer', 'cowriter', 'listener'] as const) {
      const res = await crew.as[role].post(`/api/drafts/${draftId}/versions`, { baseVersionId: v1, lines, cadence: { a: placement } })
      expect(res.status, role).toBe(403)
      expect((await crew.as[role].get(`/api/versions/${v1}`)).status).toBe(200)
    }
    expect((await crew.as.outsider.get(`/api/versions/${v1}`)).status).toBe(404)
  })

  it('prints the chosen bars\' cadence as a row of slots under the line on the sheet, the text and the PDF', async () => {
    const { draftId, v1 } = await draftWithVersion()
    // "night bus home": three one-syllable words (CMU Pronouncing Dictionary: N AY1 T, B AH1 S, HH OW1 M).
    const v2 = await crew.as.writer.post(`/api/drafts/${draftId}/versions`, { baseVersionId: v1, lines, cadence: { a: { sub: '16', slots: [0, 2, 8], holds: [1, 0, 3], breaths: [14] } } })
    const model = (await crew.as.listener.get(`/api/versions/${v2.body.id}/sheet?cadence=1`)).body
    const printed = model.sections.flatMap((s: any) => s.lines)
    expect(printed.find((l: any) => l.id === 'a').cadence).toBe('X-X.|....|X---|..v.')
    expect(printed.find((l: any) => l.id === 'b').cadence).toBeUndefined()
    const txt = (await crew.as.listener.get(`/api/versions/${v2.body.id}/sheet.txt?cadence=1-2`)).text
    expect(txt).toContain('X-X.|....|X---|..v.')
    // Line b has no stored placement: the automatic one; "window fogged with my name" has 6 syllables (CMU Pronouncing Dictionary).
    const rowB = txt.split('\n').find(r => /^\s+[xX.|v-]+$/.test(r) && !r.includes('X-X.'))!
    expect(rowB.trim().replace(/[^xX]/g, '')).toHaveLength(6)
    expect((await crew.as.listener.get(`/api/versions/${v2.body.id}/sheet.txt`)).text).not.toContain('X-X.')
    const pdf = await crew.as.listener.get(`/api/versions/${v2.body.id}/sheet.pdf?cadence=1-2`)
    expect(pdf.status).toBe(200)
    expect(pdf.headers.get('content-type')).toBe('application/pdf')
    for (const bad of ['x', '3-1', '0']) {
      const res = await crew.as.listener.get(`/api/versions/${v2.body.id}/sheet?cadence=${bad}`)
      expect(res.status, bad).toBe(400)
      expect(res.body.message).toMatch(/cadence/)
    }
  })

  it('taking an alt keeps the line\'s placement when the alt sings as many syllables, else goes back to automatic', async () => {
    const { draftId, v1 } = await draftWithVersion()
    const v2 = await crew.as.writer.post(`/api/drafts/${draftId}/versions`, { baseVersionId: v1, lines, cadence: { a: placement } })
    // "late bus home" and "night bus home": three syllables each; "night bus going home" has four (CMU Pronouncing Dictionary).
    const same = await crew.as.cowriter.post(`/api/drafts/${draftId}/alts`, { lineId: 'a', text: 'late bus home' })
    const took = await crew.as.writer.post(`/api/alts/${same.body.id}/take`)
    expect(took.status).toBe(201)
    const afterSame = (await crew.as.listener.get(`/api/versions/${took.body.version.id}`)).body
    expect(afterSame.lines[0].text).toBe('late bus home')
    expect(afterSame.cadence).toEqual({ a: placement })
    const longer = await crew.as.cowriter.post(`/api/drafts/${draftId}/alts`, { lineId: 'a', text: 'night bus going home' })
    const took2 = await crew.as.writer.post(`/api/alts/${longer.body.id}/take`)
    expect((await crew.as.listener.get(`/api/versions/${took2.body.version.id}`)).body.cadence).toEqual({})
    expect((await crew.as.listener.get(`/api/versions/${v2.body.id}`)).body.cadence).toEqual({ a: placement })
  })
})

import { beforeAll, describe, expect, it } from 'vitest'
import { sameLine } from '../../shared/utils/line-diff'
import { sql } from '../support/db'
import { makeCrew, type TestCrew } from '../support/people'
import { referenceCommon } from '../support/reference-diff'

let crew: TestCrew
let songId: string

beforeAll(async () => {
  crew = await makeCrew()
  songId = (await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'History song' })).body.id
})

type Line = { id: string, bar: number, text: string, out?: boolean }
const L = (id: string, bar: number, text: string): Line => ({ id, bar, text })

async function draftWith(...versions: Line[][]) {
  const draft = (await crew.as.writer.post(`/api/songs/${songId}/drafts`, { name: `History ${versions.length}` })).body
  const ids: string[] = []
  for (const lines of versions) {
    const res = await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: ids.at(-1) ?? null, lines })
    expect(res.status).toBe(201)
    ids.push(res.body.id)
  }
  return { draftId: draft.id as string, ids }
}

const v1 = [L('a', 1, 'Lamps on the avenue blinking in code'), L('b', 2, 'I read every window along the road'), L('c', 3, 'Pocket full of lint and a borrowed coat'), L('d', 4, 'Night bus home and the engine is slow'), L('e', 5, 'Driver nods once like he already knows'), L('f', 6, 'Fare in my palm like a coin for a wish')]
const v2 = [L('a', 1, 'Lamps on the avenue blinking in code'), L('b', 2, 'I count every window along the road'), L('c', 3, 'Pocket full of lint and a borrowed coat'), L('x', 4, '(yeah, yeah)'), L('d', 5, 'Night bus home and the engine is slow'), L('f', 6, 'Fare in my palm like a coin for a wish'), L('g', 7, 'Stop by the bakery, the windows still lit')]

describe('history: diff of two versions', () => {
  it('matches what a general-purpose diff library (diff-sequences, Myers) reports for the same lines', async () => {
    const { ids } = await draftWith(v1, v2)
    const res = await crew.as.listener.get(`/api/versions/${ids[1]}/diff?against=${ids[0]}`)
    expect(res.status).toBe(200)
    expect(res.body.from).toMatchObject({ id: ids[0], number: 1 })
    expect(res.body.to).toMatchObject({ id: ids[1], number: 2 })
    const rows = res.body.rows as Array<{ kind: string, from?: Line, to?: Line }>

    // The reference: Jest's diff-sequences over the same two line lists.
    const common = referenceCommon(v1, v2, sameLine)
    const keptFrom = new Set(common.map(([i]) => i))
    const keptTo = new Set(common.map(([, j]) => j))
    expect(rows.filter(r => r.kind === 'same').map(r => r.from)).toEqual(common.map(([i]) => v1[i]))
    const gone = rows.flatMap(r => (r.kind === 'removed' || r.kind === 'changed' ? [r.from!] : []))
    const came = rows.flatMap(r => (r.kind === 'added' || r.kind === 'changed' ? [r.to!] : []))
    expect(new Set(gone)).toEqual(new Set(v1.filter((_, i) => !keptFrom.has(i))))
    expect(new Set(came)).toEqual(new Set(v2.filter((_, j) => !keptTo.has(j))))
    // Bars are shown: every row carries its lines with their bars.
    expect(rows.find(r => r.kind === 'changed' && r.from!.id === 'd')).toMatchObject({ from: { bar: 4 }, to: { bar: 5 } })
    expect(res.body.stats).toEqual({ same: 3, changed: 2, added: 2, removed: 1 })
  })

  it('compares with the parent by default, across drafts of the song, and refuses bad input', async () => {
    const { ids } = await draftWith(v1, v2)
    const parent = await crew.as.listener.get(`/api/versions/${ids[1]}/diff`)
    expect(parent.body.from.id).toBe(ids[0])
    const first = await crew.as.listener.get(`/api/versions/${ids[0]}/diff`)
    expect(first.body.from).toBeNull()
    expect(first.body.stats).toEqual({ same: 0, changed: 0, added: v1.length, removed: 0 })

    const otherDraft = await draftWith([L('a', 1, 'Lamps on the avenue blinking in code')])
    const across = await crew.as.listener.get(`/api/versions/${ids[1]}/diff?against=${otherDraft.ids[0]}`)
    expect(across.status).toBe(200)
    expect(across.body.from.draftId).toBe(otherDraft.draftId)

    expect((await crew.as.listener.get(`/api/versions/${ids[1]}/diff?against=nope`)).status).toBe(400)
    const otherSong = (await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'Elsewhere' })).body.id
    const foreignDraft = (await crew.as.writer.post(`/api/songs/${otherSong}/drafts`, { name: 'x' })).body.id
    const foreign = (await crew.as.writer.post(`/api/drafts/${foreignDraft}/versions`, { baseVersionId: null, lines: [] })).body.id
    expect((await crew.as.listener.get(`/api/versions/${ids[1]}/diff?against=${foreign}`)).status).toBe(404)
    expect((await crew.as.outsider.get(`/api/versions/${ids[1]}/diff?against=${ids[0]}`)).status).toBe(404)
  })
})

describe('merging a kept-aside save', () => {
  it('saves the merge as a new version (kind merge) on the head and resolves the kept-aside save', async () => {
    const { draftId, ids } = await draftWith(v1)
    const theirs = await crew.as.owner.post(`/api/drafts/${draftId}/versions`, { baseVersionId: ids[0], lines: v2 })
    const stale = await crew.as.writer.post(`/api/drafts/${draftId}/versions`, { baseVersionId: ids[0], lines: [...v1, L('h', 8, 'mine, late')] })
    expect(stale.status).toBe(409)
    const { sideSaveId, head } = stale.body.data
    expect(head.id).toBe(theirs.body.id)

    const merged = [...v2, L('h', 8, 'mine, late')]
    expect((await crew.as.owner.post(`/api/side-saves/${sideSaveId}/merge`, { baseVersionId: head.id, lines: merged })).status).toBe(403)
    expect((await crew.as.writer.post(`/api/side-saves/${sideSaveId}/merge`, { baseVersionId: head.id, lines: 'nope' })).status).toBe(400)
    const res = await crew.as.writer.post(`/api/side-saves/${sideSaveId}/merge`, { baseVersionId: head.id, lines: merged, note: 'Kept both' })
    expect(res.status).toBe(201)
    expect(res.body.number).toBe(3)
    const version = (await crew.as.writer.get(`/api/versions/${res.body.id}`)).body
    expect(version).toMatchObject({ kind: 'merge', note: 'Kept both', lines: merged, parentId: head.id })
    const [side] = await sql('SELECT resolved_at, resolved_version_id FROM side_saves WHERE id = $1', [sideSaveId])
    expect(side.resolved_version_id).toBe(res.body.id)
    expect((await crew.as.writer.get(`/api/drafts/${draftId}/side-saves`)).body).toEqual([])
    expect((await crew.as.writer.post(`/api/side-saves/${sideSaveId}/merge`, { baseVersionId: res.body.id, lines: merged })).status).toBe(409)
  })

  it('a merge made on a head that moved again is itself kept aside (409), the original stays open', async () => {
    const { draftId, ids } = await draftWith(v1)
    const theirs = await crew.as.owner.post(`/api/drafts/${draftId}/versions`, { baseVersionId: ids[0], lines: v2 })
    const stale = await crew.as.writer.post(`/api/drafts/${draftId}/versions`, { baseVersionId: ids[0], lines: [L('z', 1, 'my take')] })
    await crew.as.owner.post(`/api/drafts/${draftId}/versions`, { baseVersionId: theirs.body.id, lines: v1 })
    const late = await crew.as.writer.post(`/api/side-saves/${stale.body.data.sideSaveId}/merge`, { baseVersionId: theirs.body.id, lines: [L('z', 1, 'my merged take')] })
    expect(late.status).toBe(409)
    expect(late.body.data.head.number).toBe(3)
    const open = (await crew.as.writer.get(`/api/drafts/${draftId}/side-saves`)).body.map((s: any) => s.lines[0].text).sort()
    expect(open).toEqual(['my merged take', 'my take'])
  })
})

describe('drafts', () => {
  it('rename, archive (listed only on request), unarchive, make main', async () => {
    const a = (await crew.as.writer.post(`/api/songs/${songId}/drafts`, { name: 'Draft A' })).body
    const renamed = await crew.as.writer.patch(`/api/drafts/${a.id}`, { name: 'Draft A, renamed' })
    expect(renamed.body.name).toBe('Draft A, renamed')
    expect((await crew.as.writer.patch(`/api/drafts/${a.id}`, { archived: true })).status).toBe(200)
    expect((await crew.as.listener.get(`/api/songs/${songId}/drafts`)).body.some((d: any) => d.id === a.id)).toBe(false)
    const all = (await crew.as.listener.get(`/api/songs/${songId}/drafts?archived=1`)).body
    expect(all.find((d: any) => d.id === a.id)).toMatchObject({ archivedAt: expect.any(String) })
    const saving = await crew.as.writer.post(`/api/drafts/${a.id}/versions`, { baseVersionId: null, lines: [] })
    expect(saving.status).toBe(409)
    expect((await crew.as.writer.patch(`/api/drafts/${a.id}`, { archived: false })).body.archivedAt).toBeNull()
    const main = await crew.as.writer.patch(`/api/drafts/${a.id}`, { isMain: true })
    expect(main.body.isMain).toBe(true)
    const list = (await crew.as.listener.get(`/api/songs/${songId}/drafts`)).body
    expect(list[0].id).toBe(a.id)
    expect(list.filter((d: any) => d.isMain)).toHaveLength(1)
    expect((await crew.as.writer.patch(`/api/drafts/${a.id}`, { archived: true })).status).toBe(409)
    expect((await crew.as.writer.patch(`/api/drafts/${a.id}`, { name: '' })).status).toBe(400)
  })
})

describe('drafts made at once', () => {
  it('the first drafts of a song, created concurrently, all succeed and exactly one is main', async () => {
    const song = (await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'Rush' })).body.id
    const made = await Promise.all(Array.from({ length: 8 }, (_, i) => (i % 2 ? crew.as.writer : crew.as.owner).post(`/api/songs/${song}/drafts`, { name: `Rush ${i}` })))
    expect(made.map(r => r.status)).toEqual(Array(8).fill(201))
    expect(made.filter(r => r.body.isMain)).toHaveLength(1)
  })
})

// The vocal map route against the built server and PostgreSQL: the demo song, one draft or
// two compared, lines marked out from the map, and bad input.
import { beforeAll, describe, expect, it } from 'vitest'
import { asDemo, type ApiClient } from '../support/http'
import { makeCrew, type TestCrew } from '../support/people'

let crew: TestCrew

beforeAll(async () => {
  crew = await makeCrew()
})

async function demoSong(client: ApiClient, title: string) {
  const [c] = (await client.get('/api/crews')).body
  const songs = (await client.get(`/api/crews/${c.id}/songs`)).body
  return songs.find((s: any) => s.title === title).id as string
}

describe('vocal map', () => {
  it('maps the demo song: open intro, hook bars with vocals, per-section totals and the beat\'s length', async () => {
    const listener = await asDemo('listener')
    const songId = await demoSong(listener, 'Night Bus Home')
    const res = await listener.get(`/api/songs/${songId}/vocal-map`)
    expect(res.status).toBe(200)
    const map = res.body
    expect(map.draft).toMatchObject({ name: 'Main', isMain: true })
    expect(map.rows.slice(0, 4).map((r: any) => [r.title, r.startBar, r.endBar])).toEqual([['Intro', 1, 4], ['Hook', 5, 12], ['Verse 1', 13, 28], ['Outro', 29, 32]])
    // The beat's tail after bar 32 shows as bars outside every section, up to where the audio ends.
    expect(map.rows.slice(4).every((r: any) => r.sectionId === null)).toBe(true)
    expect(map.bars.length).toBe(map.beatBars)
    const states = (from: number, to: number) => map.bars.filter((b: any) => b.bar >= from && b.bar <= to).map((b: any) => b.state)
    expect(states(1, 4)).toEqual(['open', 'open', 'open', 'open'])
    expect(states(5, 12)).toEqual(Array(8).fill('vocals'))
    expect(map.beatBars).toBeGreaterThanOrEqual(32)
    const hook = map.rows.find((r: any) => r.title === 'Hook').totals
    expect(hook).toMatchObject({ bars: 8, barsWithVocals: 8, lines: 8, outLines: 0 })
    // "Last bus humming, window fogged with my name": last 1, bus 1, humming 2, window 2, fogged 1, with 1, my 1, name 1 (CMU Pronouncing Dictionary).
    expect(map.bars.find((b: any) => b.bar === 5).syllables).toBe(10)
    expect(hook.rhymeDensity).toEqual(expect.any(Number))
    // The demo's open alt sits on verse line 6, bar 18.
    expect(map.bars.find((b: any) => b.bar === 18)).toMatchObject({ state: 'vocals', openAlts: 1 })
    expect(map.densityScale.map((d: any) => d.grade)).toEqual([0, 1, 2, 3, 4])
  })

  it('shows the finished song\'s out line apart and leaves it out of the counts', async () => {
    const listener = await asDemo('listener')
    const songId = await demoSong(listener, 'Kell Street Lanterns')
    const map = (await listener.get(`/api/songs/${songId}/vocal-map`)).body
    const bar21 = map.bars.find((b: any) => b.bar === 21)
    expect(bar21.lines.map((l: any) => [l.id, l.out])).toEqual([['kell-v1-alt', true], ['kell-v1-9', false]])
    expect(bar21.outLines).toBe(1)
    expect(map.bars.slice(0, 4).map((b: any) => b.state)).toEqual(['adlibs', 'open', 'adlibs', 'open'])
    const verse = map.rows.find((r: any) => r.title === 'Verse 1').totals
    expect(verse).toMatchObject({ bars: 16, barsWithVocals: 16, lines: 16, outLines: 1 })
  })

  it('compares two drafts bar by bar, and updates when a line is marked out from the map', async () => {
    const songId = (await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'Two takes' })).body.id
    const a = (await crew.as.writer.post(`/api/songs/${songId}/drafts`, { name: 'Take A' })).body
    const b = (await crew.as.writer.post(`/api/songs/${songId}/drafts`, { name: 'Take B' })).body
    const lines = [
      { id: 'l1', bar: 1, text: 'cold rain on the late train' },
      { id: 'l2', bar: 2, text: 'we ride the last bus home tonight', bars: 2 },
    ]
    const va = (await crew.as.writer.post(`/api/drafts/${a.id}/versions`, { baseVersionId: null, lines })).body
    await crew.as.writer.post(`/api/drafts/${b.id}/versions`, { baseVersionId: null, lines: [lines[0], { ...lines[1], text: 'we ride the night bus home tonight' }, { id: 'l3', bar: 5, text: '(yeah)' }] })

    const cmp = (await crew.as.producer.get(`/api/songs/${songId}/vocal-map?draftId=${a.id}&compare=${b.id}`)).body
    expect(cmp.draft.name).toBe('Take A')
    expect(cmp.compare.draft.name).toBe('Take B')
    expect(cmp.compare.differingBars).toEqual([2, 3, 5])
    expect(cmp.bars.map((x: any) => x.state)).toEqual(['vocals', 'vocals', 'vocals', 'open', 'open'])
    expect(cmp.compare.bars.find((x: any) => x.bar === 5)).toMatchObject({ state: 'adlibs', texts: ['(yeah)'] })

    // The producer marks bar 1's line out (the desk's out-marks route); the map follows.
    const marked = await crew.as.producer.post(`/api/drafts/${a.id}/out-marks`, { baseVersionId: va.id, lines: [{ ...lines[0], out: true }, lines[1]] })
    expect(marked.status).toBe(201)
    const after = (await crew.as.producer.get(`/api/songs/${songId}/vocal-map?draftId=${a.id}`)).body
    expect(after.draft.versionNumber).toBe(2)
    expect(after.bars[0]).toMatchObject({ state: 'open', outLines: 1, syllables: 0 })
    expect(after.totals).toMatchObject({ lines: 1, outLines: 1, barsWithVocals: 2 })
  })

  it('answers an empty song, and 400 / 404 for bad draft ids', async () => {
    const songId = (await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'Nothing yet' })).body.id
    const empty = await crew.as.listener.get(`/api/songs/${songId}/vocal-map`)
    expect(empty.status).toBe(200)
    expect(empty.body).toMatchObject({ draft: null, bars: [], rows: [], beatBars: null, compare: null })
    const bad = await crew.as.listener.get(`/api/songs/${songId}/vocal-map?draftId=nope`)
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/draftId/)
    const elsewhere = (await crew.as.writer.post(`/api/songs/${(await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'Other' })).body.id}/drafts`, { name: 'Other draft' })).body
    const missing = await crew.as.listener.get(`/api/songs/${songId}/vocal-map?draftId=${elsewhere.id}`)
    expect(missing.status).toBe(404)
    expect(missing.body.message).toMatch(/Draft/)
  })
})

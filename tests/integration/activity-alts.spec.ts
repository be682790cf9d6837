// The song's timeline shows alts taken and passed, next to versions and sign-off steps.
import { beforeAll, describe, expect, it } from 'vitest'
import { makeCrew, type TestCrew } from '../support/people'

let crew: TestCrew

beforeAll(async () => {
  crew = await makeCrew()
})

describe('activity: alts', () => {
  it('records a taken alt (once, in place of its version) and a passed one, with who decided and the alt\'s words', async () => {
    const songId = (await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'Timeline of alts' })).body.id
    const draft = (await crew.as.writer.post(`/api/songs/${songId}/drafts`, { name: 'Main' })).body
    const lines = [
      { id: 't1', bar: 1, text: 'Chalk on the stairwell spelling my name' },
      { id: 't2', bar: 2, text: 'Rain on the railing keeping the same' },
    ]
    expect((await crew.as.writer.post(`/api/drafts/${draft.id}/versions`, { baseVersionId: null, lines })).status).toBe(201)
    const takeMe = (await crew.as.cowriter.post(`/api/drafts/${draft.id}/alts`, { lineId: 't2', text: 'Rain on the railing playing the game' })).body
    const passMe = (await crew.as.cowriter.post(`/api/drafts/${draft.id}/alts`, { lineId: 't1', text: 'Chalk on the stairwell, nobody to blame' })).body
    const taken = await crew.as.writer.post(`/api/alts/${takeMe.id}/take`)
    expect(taken.status).toBe(201)
    expect((await crew.as.owner.post(`/api/alts/${passMe.id}/pass`)).status).toBe(200)

    const activity = (await crew.as.listener.get(`/api/songs/${songId}/activity`)).body
    expect(activity.map((a: any) => a.kind)).toEqual(['alt.passed', 'alt.taken', 'version'])
    const [passed, took, first] = activity
    expect(took).toMatchObject({
      kind: 'alt.taken', by: crew.users.writer.name, detail: 'Rain on the railing playing the game', versionId: taken.body.version.id, draftId: draft.id,
    })
    expect(took.summary).toBe(`${crew.users.writer.name} took ${crew.users.cowriter.name}'s alt for "Rain on the railing keeping the same" into version 2 of "Main"`)
    expect(passed).toMatchObject({ kind: 'alt.passed', by: crew.users.owner.name, detail: 'Chalk on the stairwell, nobody to blame' })
    expect(passed.summary).toContain('passed on')
    // The version the alt made is not listed a second time.
    expect(first).toMatchObject({ kind: 'version', detail: null })
    expect(first.summary).toContain('version 1')
  })
})

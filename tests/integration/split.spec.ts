// The split sheet: per cent with two decimals, kept in basis points, totalling exactly 100.00.
import { beforeAll, describe, expect, it } from 'vitest'
import { makeCrew, type TestCrew } from '../support/people'

let crew: TestCrew
let songId: string
beforeAll(async () => {
  crew = await makeCrew()
  songId = (await crew.as.writer.post(`/api/crews/${crew.crewId}/songs`, { title: 'Split song' })).body.id
})

const put = (lines: unknown, client = crew.as.writer) => client.put(`/api/songs/${songId}/split`, { lines })

describe('split sheet', () => {
  it('accepts 33.33 + 33.33 + 33.34 and refuses 33.33 × 3 with the total named', async () => {
    // DOMAIN.md §7: 33.33 + 33.33 + 33.34 = 10 000 basis points [A].
    const ok = await put([
      { userId: crew.users.writer.id, name: 'Test writer', role: 'lyrics', share: '33.33' },
      { userId: crew.users.cowriter.id, name: 'Test cowriter', role: 'lyrics', share: 33.33 },
      { name: 'Rae Outside', role: 'music', share: '33.34' },
    ])
    expect(ok.status, ok.text).toBe(200)
    expect(ok.body.totalBp).toBe(10_000)
    expect(ok.body.lines.map((l: any) => l.shareBp)).toEqual([3333, 3333, 3334])
    expect(ok.body.caution).toMatch(/Not legal advice.*country.*society.*qualified professional/)

    const bad = await put([
      { name: 'A', share: '33.33' }, { name: 'B', share: '33.33' }, { name: 'C', share: '33.33' },
    ])
    expect(bad.status).toBe(400)
    expect(bad.body.message).toBe('The shares total 99.99 %; they must total exactly 100.00 % (0.01 short).')
    expect(bad.body.data.fields.lines).toContain('99.99')
    // The refused sheet changed nothing.
    expect((await crew.as.listener.get(`/api/songs/${songId}/split`)).body.lines).toHaveLength(3)
  })

  it('lets each listed member confirm their own line only, and keeps a confirmation while that line is unchanged', async () => {
    await put([
      { userId: crew.users.writer.id, name: 'Test writer', share: 50 },
      { userId: crew.users.producer.id, name: 'Test producer', role: 'production', share: 50 },
    ])
    expect((await crew.as.cowriter.post(`/api/songs/${songId}/split/confirm`, {})).status).toBe(404)
    expect((await crew.as.listener.post(`/api/songs/${songId}/split/confirm`, {})).status).toBe(403)
    const mine = await crew.as.producer.post(`/api/songs/${songId}/split/confirm`, { confirm: true })
    expect(mine.status).toBe(200)
    expect(mine.body.lines.find((l: any) => l.mine)).toMatchObject({ userId: crew.users.producer.id, confirmedAt: expect.any(String) })
    expect(mine.body.ready).toBe(false)
    expect(mine.body.problem).toMatch(/still to confirm: Test writer/)
    await crew.as.writer.post(`/api/songs/${songId}/split/confirm`, {})
    expect((await crew.as.listener.get(`/api/songs/${songId}/split`)).body.ready).toBe(true)

    const changed = await put([
      { userId: crew.users.writer.id, name: 'Test writer', share: 60 },
      { userId: crew.users.producer.id, name: 'Test producer', role: 'production', share: 40 },
    ])
    expect(changed.body.lines.map((l: any) => !!l.confirmedAt)).toEqual([false, false])
    await crew.as.producer.post(`/api/songs/${songId}/split/confirm`, {})
    const shared = await put([
      { userId: crew.users.writer.id, name: 'Test writer', share: 50 },
      { userId: crew.users.producer.id, name: 'Test producer', role: 'production', share: 40 },
      { name: 'Rae Outside', share: 10 },
    ])
    expect(shared.body.lines.map((l: any) => !!l.confirmedAt)).toEqual([false, true, false])
    const renamed = await put([
      { userId: crew.users.writer.id, name: 'Test writer', share: 50 },
      { userId: crew.users.producer.id, name: 'Producer, credited name', role: 'production', share: 40 },
      { name: 'Rae Outside', share: 10 },
    ])
    expect(renamed.body.lines.map((l: any) => !!l.confirmedAt)).toEqual([false, false, false])
  })

  it('lets writers and owners edit it, nobody else', async () => {
    for (const role of ['producer', 'cowriter', 'listener'] as const) {
      expect((await put([{ name: 'X', share: 100 }], crew.as[role])).status, role).toBe(403)
    }
    expect((await put([{ name: 'X', share: 100 }], crew.as.owner)).status).toBe(200)
  })

  it('answers bad input with 400 and field messages', async () => {
    const cases: Array<[unknown, string]> = [
      [[{ name: 'A', share: '33.333' }], 'lines.0.share'],
      [[{ name: 'A', share: '100.01' }], 'lines.0.share'],
      [[{ name: 'A', share: 0 }], 'lines.0.share'],
      [[{ name: 'A', share: -5 }], 'lines.0.share'],
      [[{ name: '', share: 100 }], 'lines.0.name'],
      [[{ name: 'A', share: 100, userId: 'someone' }], 'lines.0.userId'],
      [[], 'lines'],
      ['all of it', 'lines'],
      [[{ userId: crew.users.writer.id, name: 'A', share: 50 }, { userId: crew.users.writer.id, name: 'B', share: 50 }], 'lines.1.userId'],
      [[{ userId: crew.users.outsider.id, name: 'Not ours', share: 100 }], 'lines.0.userId'],
      [[{ userId: crew.users.listener.id, name: 'Listener', share: 100 }], 'lines.0.userId'],
    ]
    for (const [lines, field] of cases) {
      const res = await put(lines)
      expect(res.status, JSON.stringify(lines)).toBe(400)
      expect(typeof res.body.data.fields[field], `${field} in ${JSON.stringify(res.body.data.fields)}`).toBe('string')
    }
    expect((await crew.as.writer.post(`/api/songs/${songId}/split/confirm`, { confirm: 'yes' })).status).toBe(400)
  })
})

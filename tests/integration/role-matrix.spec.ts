// Every route under server/api × every role, signed-out and a member of another crew: the
// status each gets is exactly what the permission table (shared/utils/permissions.ts) says.
import { createHash, randomUUID } from 'node:crypto'
import { beforeAll, describe, expect, it } from 'vitest'
import { can, type Action } from '../../shared/utils/permissions'
import { sql } from '../support/db'
import { ApiClient } from '../support/http'
import { makeCrew, makeUser, PRINCIPALS, signedIn, type Principal, type TestCrew } from '../support/people'
import { discoverRoutes, fillRoute } from '../support/routes'
import { MATRIX, type MatrixContext } from './role-matrix.table'

let crew: TestCrew
let ctx: MatrixContext

beforeAll(async () => {
  crew = await makeCrew()
  ctx = {
    crew,
    async song() {
      const res = await crew.as.owner.post(`/api/crews/${crew.crewId}/songs`, { title: `Song ${randomUUID().slice(0, 6)}` })
      return res.body.id as string
    },
    async member(role = 'writer') {
      const u = await makeUser('extra')
      await sql('INSERT INTO memberships (crew_id, user_id, role) VALUES ($1, $2, $3)', [crew.crewId, u.id, role])
      return u.id
    },
    async invite(email = `invitee-${randomUUID().slice(0, 8)}@barsmith.test`) {
      const res = await crew.as.owner.post(`/api/crews/${crew.crewId}/invites`, { email, role: 'listener' })
      return res.body.id as string
    },
    async inviteToken(email: string) {
      const token = randomUUID().replace(/-/g, '') + randomUUID().replace(/-/g, '')
      // A crew of its own, so accepting never makes the outsider a member of the matrix crew.
      const [other] = await sql(`INSERT INTO crews (name) VALUES ('Invite crew') RETURNING id`)
      await sql(`INSERT INTO invites (crew_id, email, role, token_hash, expires_at) VALUES ($1, $2, 'listener', $3, now() + interval '1 day')`,
        [other.id, email, createHash('sha256').update(token).digest('hex')])
      return token
    },
    async crewWithSpareOwner() {
      const other = await makeCrew()
      const spare = await makeUser('spare-owner')
      await sql(`INSERT INTO memberships (crew_id, user_id, role) VALUES ($1, $2, 'owner')`, [other.crewId, spare.id])
      return other
    },
    async draft() {
      const songId = await this.song()
      const draftId = (await crew.as.owner.post(`/api/songs/${songId}/drafts`, { name: 'Matrix' })).body.id
      const versionId = (await crew.as.owner.post(`/api/drafts/${draftId}/versions`, { baseVersionId: null, lines: [{ id: 'm1', bar: 1, text: 'v1' }] })).body.id
      return { songId, draftId, versionId }
    },
    async sideSave(p: Principal) {
      const { draftId } = await this.draft()
      const author = p !== 'anonymous' && p !== 'outsider' && can(p, 'version.save') ? crew.as[p] : crew.as.writer
      const res = await author.post(`/api/drafts/${draftId}/versions`, { baseVersionId: null, lines: [{ id: 's', bar: 1, text: 'late' }] })
      return res.body.data.sideSaveId as string
    },
    freshClient: async (p: Principal) => (p === 'anonymous' ? new ApiClient() : signedIn(crew.users[p])),
    async lexiconEntry() {
      const word = `zq${randomUUID().replace(/[^a-f]/g, '').slice(0, 8)}`
      const res = await crew.as.owner.post(`/api/crews/${crew.crewId}/lexicon`, { word, phones: 'Z IY1 K W AH0' })
      return res.body.id as string
    },
  }
})

function expected(access: 'public' | 'user' | Action, ok: number, principal: Principal): number {
  if (access === 'public') return ok
  if (principal === 'anonymous') return 401
  if (access === 'user') return ok
  if (principal === 'outsider') return 404
  return can(principal, access) ? ok : 403
}

describe('role matrix', () => {
  it('has an entry for every route in server/api, and no entry without a route', () => {
    const discovered = discoverRoutes().sort()
    const listed = MATRIX.map(c => `${c.method} ${c.route}`).sort()
    expect(listed).toEqual(discovered)
  })

  for (const c of MATRIX) {
    it(`${c.method} ${c.route} (${c.access})`, async () => {
      const seen: Record<string, number> = {}
      const want: Record<string, number> = {}
      for (const principal of PRINCIPALS) {
        const prepared = await (c.prepare?.(ctx, principal) ?? {})
        const client = prepared.client ?? crew.as[principal]
        const path = fillRoute(c.route, { crewId: crew.crewId, ...prepared.params }) + (prepared.query ? `?${new URLSearchParams(prepared.query)}` : '')
        const body = c.method === 'GET' || c.method === 'DELETE' ? undefined : (prepared.body ?? {})
        const res = await client.request(c.method, path, body)
        seen[principal] = res.status
        want[principal] = expected(c.access, c.ok, principal)
        if (res.status >= 400) {
          expect(res.body, `${principal}: error body`).toMatchObject({ statusCode: res.status, message: expect.any(String) })
        }
      }
      expect(seen).toEqual(want)
    })
  }
})

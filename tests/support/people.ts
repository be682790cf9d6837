import { randomUUID } from 'node:crypto'
import type { Role } from '../../shared/utils/permissions'
import { ROLES } from '../../shared/utils/permissions'
import { sql } from './db'
import { ApiClient, DEMO_PASSWORD } from './http'

/**
 * A verified account made directly in the test database, sharing the demo accounts' password
 * hash (so it signs in with the demo password without another scrypt round).
 */
export async function makeUser(label = 'user'): Promise<{ id: string, email: string, name: string }> {
  const email = `${label}-${randomUUID().slice(0, 8)}@barsmith.test`
  const name = `Test ${label}`
  const [row] = await sql(
    `INSERT INTO users (email, name, password_hash, email_verified_at)
     SELECT $1, $2, password_hash, now() FROM users WHERE email = 'owner@barsmith.test' RETURNING id`,
    [email, name],
  )
  return { id: row.id, email, name }
}

export async function signedIn(user: { email: string }): Promise<ApiClient> {
  return new ApiClient().signIn(user.email, DEMO_PASSWORD)
}

export type Principal = Role | 'outsider' | 'anonymous'
export const PRINCIPALS: Principal[] = [...ROLES, 'outsider', 'anonymous']

export interface TestCrew {
  crewId: string
  users: Record<Role | 'outsider', { id: string, email: string }>
  as: Record<Principal, ApiClient>
}

/**
 * A new crew with one signed-in member per role, plus an outsider (owner of another crew)
 * and an anonymous client.
 */
export async function makeCrew(): Promise<TestCrew> {
  const users = {} as TestCrew['users']
  const as = {} as TestCrew['as']
  for (const r of [...ROLES, 'outsider'] as const) {
    users[r] = await makeUser(r)
    as[r] = await signedIn(users[r])
  }
  as.anonymous = new ApiClient()
  const created = await as.owner.post('/api/crews', { name: `Crew ${randomUUID().slice(0, 6)}` })
  const crewId = created.body.id as string
  for (const r of ROLES) {
    if (r === 'owner') continue
    await sql('INSERT INTO memberships (crew_id, user_id, role) VALUES ($1, $2, $3)', [crewId, users[r].id, r])
  }
  await as.outsider.post('/api/crews', { name: 'Another crew' })
  return { crewId, users, as }
}

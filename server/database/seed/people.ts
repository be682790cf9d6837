import type { Role } from '../../../shared/utils/permissions'
import type { DbOrTx } from '../../utils/db'
import { crews, memberships, users } from '../schema'

/** The invented demo crew: one member per role, addresses under the reserved .test domain. */
export const DEMO_PEOPLE: Array<{ role: Role, email: string, name: string }> = [
  { role: 'owner', email: 'owner@barsmith.test', name: 'Dana Okoro' },
  { role: 'producer', email: 'producer@barsmith.test', name: 'Milo Brandt' },
  { role: 'writer', email: 'writer@barsmith.test', name: 'Ivy Sato' },
  { role: 'cowriter', email: 'cowriter@barsmith.test', name: 'Theo Ruiz' },
  { role: 'listener', email: 'listener@barsmith.test', name: 'Noor Haddad' },
]

export const DEMO_CREW_NAME = 'Lamplight Collective'

export type DemoPeople = { crewId: string } & Record<Role, { id: string, name: string }>

export async function seedPeople(tx: DbOrTx, password: string): Promise<DemoPeople> {
  const passwordHash = await hashPassword(password)
  const rows = await tx.insert(users).values(DEMO_PEOPLE.map(p => ({
    email: p.email, name: p.name, passwordHash, emailVerifiedAt: new Date(),
  }))).returning({ id: users.id, email: users.email, name: users.name })
  const [crew] = await tx.insert(crews).values({ name: DEMO_CREW_NAME, createdBy: rows[0]!.id }).returning()
  const people = { crewId: crew!.id } as DemoPeople
  for (const p of DEMO_PEOPLE) {
    const row = rows.find(r => r.email === p.email)!
    people[p.role] = { id: row.id, name: row.name }
    await tx.insert(memberships).values({ crewId: crew!.id, userId: row.id, role: p.role })
  }
  return people
}

import { and, eq, ne } from 'drizzle-orm'
import type { Role } from '../../shared/utils/permissions'
import { memberships } from '../database/schema'
import type { DbOrTx } from './db'

/**
 * Refuses (409) a change that would leave the crew without an owner: `userId` is about to
 * get `newRole`, or to leave when `newRole` is null. Locks the crew's owner rows meanwhile.
 */
export async function assertKeepsAnOwner(db: DbOrTx, crewId: string, userId: string, newRole: Role | null) {
  if (newRole === 'owner') return
  const [target] = await db.select({ role: memberships.role }).from(memberships)
    .where(and(eq(memberships.crewId, crewId), eq(memberships.userId, userId)))
  if (!target || target.role !== 'owner') return
  const others = await db.select({ id: memberships.id }).from(memberships)
    .where(and(eq(memberships.crewId, crewId), eq(memberships.role, 'owner'), ne(memberships.userId, userId)))
    .for('update')
  if (others.length === 0) {
    throw createError({ statusCode: 409, message: 'A crew needs at least one owner. Make someone else owner first.' })
  }
}

import { eq, sql } from 'drizzle-orm'
import { users, type User } from '../database/schema'
import type { DbOrTx } from './db'

export async function findUserByEmail(db: DbOrTx, email: string): Promise<User | undefined> {
  const [user] = await db.select().from(users).where(eq(sql`lower(${users.email})`, email.toLowerCase()))
  return user
}

let dummyHash: Promise<string> | undefined

/**
 * Checks a password, spending the same scrypt work whether or not the account exists, so
 * response time does not tell which e-mail addresses have accounts.
 */
export async function checkPassword(user: User | undefined, password: string): Promise<boolean> {
  dummyHash ??= hashPassword('not-the-password-of-anyone')
  if (!user) {
    await verifyPassword(await dummyHash, password)
    return false
  }
  return verifyPassword(user.passwordHash, password)
}

export function publicUser(user: Pick<User, 'id' | 'email' | 'name'>) {
  return { id: user.id, email: user.email, name: user.name }
}

export async function startSession(event: Parameters<typeof setUserSession>[0], user: User) {
  await setUserSession(event, { user: publicUser(user), sv: user.sessionVersion, loggedInAt: Date.now() })
}

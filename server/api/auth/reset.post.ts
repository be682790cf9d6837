import { eq, sql } from 'drizzle-orm'
import { ResetSchema } from '../../../shared/schemas/auth'
import { users } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const { token, password } = await validBody(event, ResetSchema)
  const address = clientAddress(event)
  await assertNotThrottled(event, 'resetLink', address, 'password reset attempts from this address')
  const passwordHash = await hashPassword(password)
  const db = useDb()
  const email = await db.transaction(async (tx) => {
    const userId = await consumeEmailToken(tx, token, 'reset').catch(async (error) => {
      await countFailure('resetLink', address)
      throw error
    })
    // A new session version signs out every session made with the old password.
    const [user] = await tx.update(users).set({
      passwordHash,
      sessionVersion: sql`${users.sessionVersion} + 1`,
      emailVerifiedAt: sql`coalesce(${users.emailVerifiedAt}, now())`,
    }).where(eq(users.id, userId)).returning({ email: users.email })
    return user!.email
  })
  await clearThrottle('loginEmail', email.toLowerCase())
  await clearUserSession(event)
  return { ok: true, message: 'Your password is changed. Sign in with the new one.' }
})

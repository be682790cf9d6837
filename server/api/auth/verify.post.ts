import { eq } from 'drizzle-orm'
import { TokenSchema } from '../../../shared/schemas/auth'
import { users } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const { token } = await validBody(event, TokenSchema)
  const db = useDb()
  await db.transaction(async (tx) => {
    const userId = await consumeEmailToken(tx, token, 'verify')
    await tx.update(users).set({ emailVerifiedAt: new Date() }).where(eq(users.id, userId))
  })
  return { ok: true, message: 'Your e-mail is confirmed. Sign in to start.' }
})

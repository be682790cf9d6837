import { and, eq, gt, isNull } from 'drizzle-orm'
import { emailTokens } from '../database/schema'
import type { DbOrTx } from './db'

export const TOKEN_TTL_MS = { verify: 24 * 60 * 60 * 1000, reset: 60 * 60 * 1000 } as const

/** Makes a single-use link token of `kind` for the user and returns the raw token. */
export async function issueEmailToken(db: DbOrTx, userId: string, kind: 'verify' | 'reset'): Promise<string> {
  const { token, hash } = newToken()
  await db.insert(emailTokens).values({ userId, kind, tokenHash: hash, expiresAt: new Date(Date.now() + TOKEN_TTL_MS[kind]) })
  return token
}

/**
 * Uses a token once: returns its user id, or throws 400 when it is unknown, used or expired.
 * Every other open token of the same kind for that user is used up too.
 */
export async function consumeEmailToken(db: DbOrTx, token: string, kind: 'verify' | 'reset'): Promise<string> {
  const [row] = await db.update(emailTokens)
    .set({ usedAt: new Date() })
    .where(and(eq(emailTokens.tokenHash, hashToken(token)), eq(emailTokens.kind, kind), isNull(emailTokens.usedAt), gt(emailTokens.expiresAt, new Date())))
    .returning({ userId: emailTokens.userId })
  if (!row) {
    throw createError({
      statusCode: 400,
      message: kind === 'reset'
        ? 'This reset link has expired or was already used. Ask for a new one.'
        : 'This confirmation link has expired or was already used. Ask for a new one.',
      data: { fields: { token: 'expired or used' } },
    })
  }
  await db.update(emailTokens).set({ usedAt: new Date() })
    .where(and(eq(emailTokens.userId, row.userId), eq(emailTokens.kind, kind), isNull(emailTokens.usedAt)))
  return row.userId
}

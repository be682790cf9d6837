import { relations, sql } from 'drizzle-orm'
import { bigint, index, integer, pgEnum, pgTable, text, timestamp, uniqueIndex, uuid, varchar } from 'drizzle-orm/pg-core'
import { createdAt, timestamps } from './common'
import { memberships } from './crews'

export const users = pgTable('users', {
  id: uuid('id').primaryKey().defaultRandom(),
  email: text('email').notNull(),
  name: text('name').notNull(),
  passwordHash: text('password_hash').notNull(),
  emailVerifiedAt: timestamp('email_verified_at', { withTimezone: true, mode: 'date' }),
  // Bumped on password reset: sessions carrying an older value are refused.
  sessionVersion: integer('session_version').notNull().default(1),
  ...timestamps,
}, t => [
  uniqueIndex('users_email_lower_key').on(sql`lower(${t.email})`),
])

export const tokenKind = pgEnum('token_kind', ['verify', 'reset'])

/** Single-use, expiring e-mail links. Only a SHA-256 of the token is stored. */
export const emailTokens = pgTable('email_tokens', {
  id: uuid('id').primaryKey().defaultRandom(),
  userId: uuid('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  kind: tokenKind('kind').notNull(),
  tokenHash: text('token_hash').notNull(),
  expiresAt: timestamp('expires_at', { withTimezone: true, mode: 'date' }).notNull(),
  usedAt: timestamp('used_at', { withTimezone: true, mode: 'date' }),
  createdAt,
}, t => [
  uniqueIndex('email_tokens_hash_key').on(t.tokenHash),
  index('email_tokens_user_idx').on(t.userId, t.kind),
])

/** The table rate-limiter-flexible keeps its counters in (its own column layout). */
export const rateLimits = pgTable('rate_limits', {
  key: varchar('key', { length: 255 }).primaryKey(),
  points: integer('points').notNull().default(0),
  expire: bigint('expire', { mode: 'number' }),
})

export const usersRelations = relations(users, ({ many }) => ({
  memberships: many(memberships),
  tokens: many(emailTokens),
}))

export const emailTokensRelations = relations(emailTokens, ({ one }) => ({
  user: one(users, { fields: [emailTokens.userId], references: [users.id] }),
}))

export type User = typeof users.$inferSelect
export type NewUser = typeof users.$inferInsert

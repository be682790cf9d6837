import { relations } from 'drizzle-orm'
import { index, pgEnum, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core'
import { ROLES } from '../../../shared/utils/permissions'
import { createdAt, timestamps } from './common'
import { users } from './auth'

export const crewRole = pgEnum('crew_role', ROLES)

export const crews = pgTable('crews', {
  id: uuid('id').primaryKey().defaultRandom(),
  name: text('name').notNull(),
  createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
})

export const memberships = pgTable('memberships', {
  id: uuid('id').primaryKey().defaultRandom(),
  crewId: uuid('crew_id').notNull().references(() => crews.id, { onDelete: 'cascade' }),
  userId: uuid('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  role: crewRole('role').notNull(),
  ...timestamps,
}, t => [
  uniqueIndex('memberships_crew_user_key').on(t.crewId, t.userId),
  index('memberships_user_idx').on(t.userId),
])

export const invites = pgTable('invites', {
  id: uuid('id').primaryKey().defaultRandom(),
  crewId: uuid('crew_id').notNull().references(() => crews.id, { onDelete: 'cascade' }),
  email: text('email').notNull(),
  role: crewRole('role').notNull(),
  tokenHash: text('token_hash').notNull(),
  invitedBy: uuid('invited_by').references(() => users.id, { onDelete: 'set null' }),
  expiresAt: timestamp('expires_at', { withTimezone: true, mode: 'date' }).notNull(),
  acceptedAt: timestamp('accepted_at', { withTimezone: true, mode: 'date' }),
  acceptedBy: uuid('accepted_by').references(() => users.id, { onDelete: 'set null' }),
  revokedAt: timestamp('revoked_at', { withTimezone: true, mode: 'date' }),
  createdAt,
}, t => [
  uniqueIndex('invites_token_hash_key').on(t.tokenHash),
  index('invites_crew_idx').on(t.crewId),
])

export const crewsRelations = relations(crews, ({ many }) => ({
  memberships: many(memberships),
  invites: many(invites),
}))

export const membershipsRelations = relations(memberships, ({ one }) => ({
  crew: one(crews, { fields: [memberships.crewId], references: [crews.id] }),
  user: one(users, { fields: [memberships.userId], references: [users.id] }),
}))

export const invitesRelations = relations(invites, ({ one }) => ({
  crew: one(crews, { fields: [invites.crewId], references: [crews.id] }),
}))

export type Crew = typeof crews.$inferSelect
export type Membership = typeof memberships.$inferSelect
export type Invite = typeof invites.$inferSelect

import { relations, sql } from 'drizzle-orm'
import { check, index, pgEnum, pgTable, smallint, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core'
import { createdAt, timestamps } from './common'
import { users } from './auth'
import { drafts, versions } from './drafts'

export const altStatus = pgEnum('alt_status', ['open', 'taken', 'passed'])

/**
 * An alternate line proposed for one exact line (by its stable id) of a draft. The line's
 * text when proposed is kept, so the alt still reads right after the line changes.
 */
export const alts = pgTable('alts', {
  id: uuid('id').primaryKey().defaultRandom(),
  draftId: uuid('draft_id').notNull().references(() => drafts.id, { onDelete: 'cascade' }),
  lineId: text('line_id').notNull(),
  lineText: text('line_text').notNull(),
  /** The head the alt was proposed on. */
  baseVersionId: uuid('base_version_id').references(() => versions.id, { onDelete: 'set null' }),
  text: text('text').notNull(),
  authorId: uuid('author_id').references(() => users.id, { onDelete: 'set null' }),
  status: altStatus('status').notNull().default('open'),
  decidedBy: uuid('decided_by').references(() => users.id, { onDelete: 'set null' }),
  decidedAt: timestamp('decided_at', { withTimezone: true, mode: 'date' }),
  /** The version that took the alt in, when taken. */
  takenVersionId: uuid('taken_version_id').references(() => versions.id, { onDelete: 'set null' }),
  ...timestamps,
}, t => [
  index('alts_draft_line_idx').on(t.draftId, t.lineId),
  index('alts_draft_status_idx').on(t.draftId, t.status),
])

/** One vote per member per alt, +1 or −1; a member may change it. */
export const altVotes = pgTable('alt_votes', {
  id: uuid('id').primaryKey().defaultRandom(),
  altId: uuid('alt_id').notNull().references(() => alts.id, { onDelete: 'cascade' }),
  userId: uuid('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  value: smallint('value').notNull(),
  ...timestamps,
}, t => [
  uniqueIndex('alt_votes_alt_user_key').on(t.altId, t.userId),
  check('alt_votes_value_check', sql`${t.value} IN (-1, 1)`),
])

export const altComments = pgTable('alt_comments', {
  id: uuid('id').primaryKey().defaultRandom(),
  altId: uuid('alt_id').notNull().references(() => alts.id, { onDelete: 'cascade' }),
  authorId: uuid('author_id').references(() => users.id, { onDelete: 'set null' }),
  body: text('body').notNull(),
  createdAt,
}, t => [
  index('alt_comments_alt_idx').on(t.altId, t.createdAt),
])

export const altsRelations = relations(alts, ({ one, many }) => ({
  draft: one(drafts, { fields: [alts.draftId], references: [drafts.id] }),
  author: one(users, { fields: [alts.authorId], references: [users.id] }),
  votes: many(altVotes),
  comments: many(altComments),
}))

export const altVotesRelations = relations(altVotes, ({ one }) => ({
  alt: one(alts, { fields: [altVotes.altId], references: [alts.id] }),
}))

export const altCommentsRelations = relations(altComments, ({ one }) => ({
  alt: one(alts, { fields: [altComments.altId], references: [alts.id] }),
  author: one(users, { fields: [altComments.authorId], references: [users.id] }),
}))

export type Alt = typeof alts.$inferSelect
export type AltVote = typeof altVotes.$inferSelect
export type AltComment = typeof altComments.$inferSelect

import { relations, sql } from 'drizzle-orm'
import { check, index, integer, jsonb, pgEnum, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core'
import { createdAt, timestamps } from './common'
import { users } from './auth'
import { songs } from './songs'
import { drafts, versions } from './drafts'

export const signoffStatus = pgEnum('signoff_status', ['open', 'sealed', 'cancelled', 'declined', 'withdrawn'])
export const signoffDecision = pgEnum('signoff_decision', ['approve', 'decline'])

/** A request to make one version final; closed when sealed, declined, withdrawn or cancelled by a newer version. */
export const signoffRequests = pgTable('signoff_requests', {
  id: uuid('id').primaryKey().defaultRandom(),
  songId: uuid('song_id').notNull().references(() => songs.id, { onDelete: 'cascade' }),
  draftId: uuid('draft_id').notNull().references(() => drafts.id, { onDelete: 'cascade' }),
  versionId: uuid('version_id').notNull().references(() => versions.id, { onDelete: 'cascade' }),
  requestedBy: uuid('requested_by').references(() => users.id, { onDelete: 'set null' }),
  note: text('note'),
  status: signoffStatus('status').notNull().default('open'),
  /** Why it closed, in words ("Version 4 was saved", "Declined by Milo Brandt"). */
  closedReason: text('closed_reason'),
  closedAt: timestamp('closed_at', { withTimezone: true, mode: 'date' }),
  closedBy: uuid('closed_by').references(() => users.id, { onDelete: 'set null' }),
  createdAt,
}, t => [
  // One open sign-off per draft at a time.
  uniqueIndex('signoff_requests_one_open_per_draft').on(t.draftId).where(sql`${t.status} = 'open'`),
  index('signoff_requests_song_idx').on(t.songId, t.createdAt),
])

export const signoffSigners = pgTable('signoff_signers', {
  id: uuid('id').primaryKey().defaultRandom(),
  requestId: uuid('request_id').notNull().references(() => signoffRequests.id, { onDelete: 'cascade' }),
  userId: uuid('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  decision: signoffDecision('decision'),
  comment: text('comment'),
  decidedAt: timestamp('decided_at', { withTimezone: true, mode: 'date' }),
  ...timestamps,
}, t => [
  uniqueIndex('signoff_signers_request_user_key').on(t.requestId, t.userId),
  index('signoff_signers_user_idx').on(t.userId),
])

export interface SealSigner { userId: string, name: string, role: string, comment: string | null, decidedAt: string }
export interface SealSplitLine { userId: string | null, name: string, role: string | null, shareBp: number, confirmedAt: string | null }

/**
 * A sealed version: the final sheet. Never updated; deleted only by a cascade after it was
 * lifted (see server/database/sql/seals.sql). It keeps the signers and the split sheet as
 * they were at sealing; a CHECK refuses a split that does not total 10 000 basis points.
 */
export const seals = pgTable('seals', {
  id: uuid('id').primaryKey().defaultRandom(),
  songId: uuid('song_id').notNull().references(() => songs.id, { onDelete: 'cascade' }),
  versionId: uuid('version_id').notNull().references(() => versions.id, { onDelete: 'cascade' }),
  requestId: uuid('request_id').references(() => signoffRequests.id, { onDelete: 'cascade' }),
  sealedAt: timestamp('sealed_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  signers: jsonb('signers').$type<SealSigner[]>().notNull(),
  split: jsonb('split').$type<SealSplitLine[]>().notNull(),
  /** Storage key of the PDF mailed to the crew at sealing. */
  pdfKey: text('pdf_key'),
}, t => [
  index('seals_song_idx').on(t.songId),
  index('seals_version_idx').on(t.versionId),
])

/** The owner's unsealing of a seal, with the reason; the seal row stays as history. */
export const sealLifts = pgTable('seal_lifts', {
  id: uuid('id').primaryKey().defaultRandom(),
  sealId: uuid('seal_id').notNull().references(() => seals.id, { onDelete: 'cascade' }),
  liftedBy: uuid('lifted_by').references(() => users.id, { onDelete: 'set null' }),
  liftedByName: text('lifted_by_name').notNull(),
  reason: text('reason').notNull(),
  /** The draft started from the sealed version. */
  newDraftId: uuid('new_draft_id').references(() => drafts.id, { onDelete: 'set null' }),
  createdAt,
}, t => [
  uniqueIndex('seal_lifts_seal_key').on(t.sealId),
  check('seal_lifts_reason_given', sql`length(btrim(${t.reason})) >= 5`),
])

/** The song's working split sheet: members or named outside contributors and their shares. */
export const splitLines = pgTable('split_lines', {
  id: uuid('id').primaryKey().defaultRandom(),
  songId: uuid('song_id').notNull().references(() => songs.id, { onDelete: 'cascade' }),
  userId: uuid('user_id').references(() => users.id, { onDelete: 'set null' }),
  name: text('name').notNull(),
  role: text('role'),
  position: integer('position').notNull(),
  shareBp: integer('share_bp').notNull(),
  confirmedAt: timestamp('confirmed_at', { withTimezone: true, mode: 'date' }),
  ...timestamps,
}, t => [
  index('split_lines_song_idx').on(t.songId, t.position),
  uniqueIndex('split_lines_song_user_key').on(t.songId, t.userId).where(sql`${t.userId} IS NOT NULL`),
  check('split_lines_share_range', sql`${t.shareBp} > 0 AND ${t.shareBp} <= 10000`),
])

export const signoffRequestsRelations = relations(signoffRequests, ({ one, many }) => ({
  song: one(songs, { fields: [signoffRequests.songId], references: [songs.id] }),
  version: one(versions, { fields: [signoffRequests.versionId], references: [versions.id] }),
  signers: many(signoffSigners),
}))

export const signoffSignersRelations = relations(signoffSigners, ({ one }) => ({
  request: one(signoffRequests, { fields: [signoffSigners.requestId], references: [signoffRequests.id] }),
  user: one(users, { fields: [signoffSigners.userId], references: [users.id] }),
}))

export const sealsRelations = relations(seals, ({ one }) => ({
  song: one(songs, { fields: [seals.songId], references: [songs.id] }),
  version: one(versions, { fields: [seals.versionId], references: [versions.id] }),
  request: one(signoffRequests, { fields: [seals.requestId], references: [signoffRequests.id] }),
  lift: one(sealLifts, { fields: [seals.id], references: [sealLifts.sealId] }),
}))

export const sealLiftsRelations = relations(sealLifts, ({ one }) => ({
  seal: one(seals, { fields: [sealLifts.sealId], references: [seals.id] }),
}))

export const splitLinesRelations = relations(splitLines, ({ one }) => ({
  song: one(songs, { fields: [splitLines.songId], references: [songs.id] }),
}))

export type SignoffRequest = typeof signoffRequests.$inferSelect
export type SignoffSigner = typeof signoffSigners.$inferSelect
export type Seal = typeof seals.$inferSelect
export type SealLift = typeof sealLifts.$inferSelect
export type SplitLine = typeof splitLines.$inferSelect

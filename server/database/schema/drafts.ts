import { relations, sql } from 'drizzle-orm'
import { boolean, index, integer, jsonb, pgEnum, pgTable, text, timestamp, uniqueIndex, uuid, type AnyPgColumn } from 'drizzle-orm/pg-core'
import type { LyricDoc, LyricLine } from '../../../shared/utils/lyric-doc'
import type { StoredCadence } from '../../../shared/schemas/cadence'
import { createdAt, timestamps } from './common'
import { users } from './auth'
import { songs } from './songs'

/** A whole lyric for a song; a song holds several ("Hook ideas", "Verse 2 alt take"). */
export const drafts = pgTable('drafts', {
  id: uuid('id').primaryKey().defaultRandom(),
  songId: uuid('song_id').notNull().references(() => songs.id, { onDelete: 'cascade' }),
  name: text('name').notNull(),
  isMain: boolean('is_main').notNull().default(false),
  headVersionId: uuid('head_version_id').references((): AnyPgColumn => versions.id, { onDelete: 'set null' }),
  createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
  archivedAt: timestamp('archived_at', { withTimezone: true, mode: 'date' }),
  ...timestamps,
}, t => [
  index('drafts_song_idx').on(t.songId),
  uniqueIndex('drafts_one_main_per_song').on(t.songId).where(sql`${t.isMain}`),
])

export const versionKind = pgEnum('version_kind', ['save', 'autosave', 'restore', 'alt', 'merge', 'copy'])

/**
 * One save of a draft: numbered, immutable (a trigger refuses UPDATE and direct DELETE),
 * holding the TipTap document and the lines derived from it.
 */
export const versions = pgTable('versions', {
  id: uuid('id').primaryKey().defaultRandom(),
  draftId: uuid('draft_id').notNull().references(() => drafts.id, { onDelete: 'cascade' }),
  number: integer('number').notNull(),
  // Cascade, not set null: a version row is never updated, even by a foreign key action.
  parentId: uuid('parent_id').references((): AnyPgColumn => versions.id, { onDelete: 'cascade' }),
  authorId: uuid('author_id').references(() => users.id, { onDelete: 'set null' }),
  kind: versionKind('kind').notNull().default('save'),
  note: text('note'),
  doc: jsonb('doc').$type<LyricDoc>().notNull(),
  lines: jsonb('lines').$type<LyricLine[]>().notNull(),
  /** Cadence placements keyed by line id; a line missing here uses the automatic placement. */
  cadence: jsonb('cadence').$type<StoredCadence>().notNull().default({}),
  createdAt,
}, t => [
  uniqueIndex('versions_draft_number_key').on(t.draftId, t.number),
  index('versions_draft_created_idx').on(t.draftId, t.createdAt),
])

/**
 * A save refused because its base was no longer the head: the text is kept here, whole,
 * until its author resolves it (take mine / take theirs / keep both) or discards it.
 */
export const sideSaves = pgTable('side_saves', {
  id: uuid('id').primaryKey().defaultRandom(),
  draftId: uuid('draft_id').notNull().references(() => drafts.id, { onDelete: 'cascade' }),
  baseVersionId: uuid('base_version_id').references(() => versions.id, { onDelete: 'set null' }),
  headVersionId: uuid('head_version_id').references(() => versions.id, { onDelete: 'set null' }),
  authorId: uuid('author_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  note: text('note'),
  doc: jsonb('doc').$type<LyricDoc>().notNull(),
  lines: jsonb('lines').$type<LyricLine[]>().notNull(),
  resolvedAt: timestamp('resolved_at', { withTimezone: true, mode: 'date' }),
  resolvedVersionId: uuid('resolved_version_id').references(() => versions.id, { onDelete: 'set null' }),
  createdAt,
}, t => [
  index('side_saves_draft_open_idx').on(t.draftId).where(sql`${t.resolvedAt} IS NULL`),
])

export const draftsRelations = relations(drafts, ({ one, many }) => ({
  song: one(songs, { fields: [drafts.songId], references: [songs.id] }),
  versions: many(versions),
}))

export const versionsRelations = relations(versions, ({ one }) => ({
  draft: one(drafts, { fields: [versions.draftId], references: [drafts.id] }),
  author: one(users, { fields: [versions.authorId], references: [users.id] }),
}))

export const sideSavesRelations = relations(sideSaves, ({ one }) => ({
  draft: one(drafts, { fields: [sideSaves.draftId], references: [drafts.id] }),
}))

export type Draft = typeof drafts.$inferSelect
export type Version = typeof versions.$inferSelect
export type SideSave = typeof sideSaves.$inferSelect

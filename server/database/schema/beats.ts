import { relations, sql } from 'drizzle-orm'
import { bigint, check, index, integer, jsonb, numeric, pgEnum, pgTable, real, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core'
import { timestamps } from './common'
import { users } from './auth'
import { songs } from './songs'

export const beatStatus = pgEnum('beat_status', ['queued', 'analysing', 'ready', 'failed'])
export const beatFormat = pgEnum('beat_format', ['wav', 'mp3', 'flac', 'ogg'])

/**
 * An uploaded beat. Every upload to a song is kept as a numbered bounce (1, 2, …); the grid
 * stays on the song, so a new bounce inherits it. Storage keys are made from ids only.
 */
export const beats = pgTable('beats', {
  id: uuid('id').primaryKey().defaultRandom(),
  songId: uuid('song_id').notNull().references(() => songs.id, { onDelete: 'cascade' }),
  bounce: integer('bounce').notNull(),
  uploadedBy: uuid('uploaded_by').references(() => users.id, { onDelete: 'set null' }),
  /** The name the file had on the uploader's machine: shown, never used as a key. */
  originalName: text('original_name').notNull(),
  format: beatFormat('format').notNull(),
  sizeBytes: bigint('size_bytes', { mode: 'number' }).notNull(),
  storageKey: text('storage_key').notNull(),
  status: beatStatus('status').notNull().default('queued'),
  progress: integer('progress').notNull().default(0),
  failureReason: text('failure_reason'),
  jobId: text('job_id'),
  durationMs: numeric('duration_ms', { precision: 12, scale: 3, mode: 'number' }),
  sampleRate: integer('sample_rate'),
  channels: integer('channels'),
  bpm: numeric('bpm', { precision: 7, scale: 3, mode: 'number' }),
  bpmConfidence: real('bpm_confidence'),
  bpmAlternatives: jsonb('bpm_alternatives').$type<number[]>(),
  offsetMs: numeric('offset_ms', { precision: 10, scale: 3, mode: 'number' }),
  peaksKey: text('peaks_key'),
  analysedAt: timestamp('analysed_at', { withTimezone: true, mode: 'date' }),
  ...timestamps,
}, t => [
  uniqueIndex('beats_song_bounce_key').on(t.songId, t.bounce),
  index('beats_status_idx').on(t.status),
  check('beats_progress_range', sql`${t.progress} BETWEEN 0 AND 100`),
])

export const sectionKind = pgEnum('section_kind', ['intro', 'verse', 'hook', 'pre-hook', 'bridge', 'break', 'outro', 'other'])

/**
 * A named run of project bars [startBar, endBar]. Sections of a song never overlap: the
 * handlers check it, and an exclusion constraint (drizzle/…_sections_no_overlap.sql, kept in
 * server/database/sql/sections-no-overlap.sql) makes the database refuse it too.
 */
export const sections = pgTable('sections', {
  id: uuid('id').primaryKey().defaultRandom(),
  songId: uuid('song_id').notNull().references(() => songs.id, { onDelete: 'cascade' }),
  kind: sectionKind('kind').notNull(),
  label: text('label').notNull().default(''),
  startBar: integer('start_bar').notNull(),
  endBar: integer('end_bar').notNull(),
  /** Order in the arrangement (0, 1, …), kept equal to the order by start bar. */
  position: integer('position').notNull().default(0),
  createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
}, t => [
  index('sections_song_idx').on(t.songId, t.startBar),
  check('sections_bars_valid', sql`${t.startBar} >= 1 AND ${t.endBar} >= ${t.startBar}`),
])

export const beatsRelations = relations(beats, ({ one }) => ({
  song: one(songs, { fields: [beats.songId], references: [songs.id] }),
}))

export const sectionsRelations = relations(sections, ({ one }) => ({
  song: one(songs, { fields: [sections.songId], references: [songs.id] }),
}))

export type Beat = typeof beats.$inferSelect
export type NewBeat = typeof beats.$inferInsert
export type Section = typeof sections.$inferSelect
export type NewSection = typeof sections.$inferInsert

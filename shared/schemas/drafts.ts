import { z } from 'zod'
import { LINE_ID_PATTERN } from '../utils/lyric-doc'
import { CadenceMapSchema } from './cadence'

export const LIMITS = {
  linesPerVersion: 2000,
  charsPerLine: 400,
  bar: 9999,
  noteChars: 500,
  docBytes: 2_000_000,
} as const

export const draftNameField = z.string({ error: 'Name the draft.' })
  .trim()
  .min(1, 'Name the draft.')
  .max(80, 'Use at most 80 characters.')

export const LineSchema = z.object({
  id: z.string({ error: 'Each line needs an id.' }).regex(LINE_ID_PATTERN, 'A line id is 1–64 letters, digits, - or _.'),
  bar: z.number({ error: 'Each line needs a bar number.' }).int('Bars are whole numbers.').min(1, 'Bars start at 1.').max(LIMITS.bar, `Bars stop at ${LIMITS.bar}.`),
  text: z.string({ error: 'Each line needs its text (it may be empty).' }).max(LIMITS.charsPerLine, `A line holds at most ${LIMITS.charsPerLine} characters.`),
  bars: z.number().int().min(1).max(8, 'A line holds at most 8 bars.').optional(),
  out: z.boolean().optional(),
})

export const LinesSchema = z.array(LineSchema, { error: 'Send the lines as a list.' })
  .max(LIMITS.linesPerVersion, `A draft holds at most ${LIMITS.linesPerVersion} lines.`)
  .superRefine((lines, ctx) => {
    const seen = new Set<string>()
    lines.forEach((l, i) => {
      if (seen.has(l.id)) ctx.addIssue({ code: 'custom', path: [i, 'id'], message: `Line id ${l.id} appears twice.` })
      seen.add(l.id)
    })
  })

export const DraftCreateSchema = z.object({
  name: draftNameField,
  /** Start from this version's lines (a copy), else empty. */
  fromVersionId: z.uuid({ error: 'That version id is not valid.' }).optional(),
})

export const VersionSaveSchema = z.object({
  baseVersionId: z.uuid({ error: 'baseVersionId must be a version id, or null for the first version.' }).nullable(),
  lines: LinesSchema,
  doc: z.record(z.string(), z.unknown()).optional(),
  note: z.string().trim().max(LIMITS.noteChars, `A note holds at most ${LIMITS.noteChars} characters.`).optional(),
  autosave: z.boolean().optional(),
  /** Per-line cadence placements (see shared/schemas/cadence.ts); lines not named keep their base's. */
  cadence: CadenceMapSchema.optional(),
})

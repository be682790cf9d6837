import { z } from 'zod'
import { LINE_ID_PATTERN } from '../utils/lyric-doc'
import { SUBDIVISIONS, slotsPerBar, type Placement, type Subdivision } from '../utils/cadence'

/** As many lines as a version holds (drafts.ts LIMITS.linesPerVersion; not imported, drafts.ts imports this file). */
const CADENCE_LINES = 2000

/** The most slots a line can have: 8 bars of 16th triplets in 32/4 (the grid's maximum). */
export const MAX_CADENCE_SLOTS = 8 * slotsPerBar('16t', 32)
const slotIndex = z.number({ error: 'Slots are whole numbers.' }).int('Slots are whole numbers.')

/** One line's stored placement: its subdivision, each syllable's slot (-1 off the grid), holds and breaths. */
export const PlacementSchema = z.object({
  sub: z.enum(Object.keys(SUBDIVISIONS) as [Subdivision, ...Subdivision[]], { error: 'The subdivision is 8, 8t, 16 or 16t.' }),
  slots: z.array(slotIndex.min(-1, 'A slot is -1 (off the grid) or from 0.').max(MAX_CADENCE_SLOTS - 1, 'That slot is past the end of the line.'))
    .max(MAX_CADENCE_SLOTS, `A line holds at most ${MAX_CADENCE_SLOTS} syllables.`),
  holds: z.array(slotIndex.min(0, 'A hold is 0 or more slots.').max(MAX_CADENCE_SLOTS, 'That hold is longer than the line.')).max(MAX_CADENCE_SLOTS).optional(),
  breaths: z.array(slotIndex.min(0, 'A breath sits on a slot from 0.').max(MAX_CADENCE_SLOTS - 1, 'That breath is past the end of the line.')).max(MAX_CADENCE_SLOTS).optional(),
}).superRefine((p, ctx) => {
  let last = -1
  p.slots.forEach((s, i) => {
    if (s < 0) return
    if (s <= last) ctx.addIssue({ code: 'custom', path: ['slots', i], message: 'Syllables keep their order: each placed syllable sits after the one before it.' })
    last = s
  })
  if (p.holds && p.holds.length !== p.slots.length) ctx.addIssue({ code: 'custom', path: ['holds'], message: 'Give one hold per syllable (0 for none).' })
}) satisfies z.ZodType<Placement>

/**
 * The cadence sent with a save, keyed by line id: a placement sets it, null clears it (the
 * line goes back to the automatic placement). Lines not named keep the base version's
 * placement when their text is unchanged.
 */
export const CadenceMapSchema = z.record(z.string().regex(LINE_ID_PATTERN, 'A line id is 1–64 letters, digits, - or _.'), PlacementSchema.nullable(), { error: 'Send the cadence as { lineId: placement }.' })
  .refine(m => Object.keys(m).length <= CADENCE_LINES, `A draft holds at most ${CADENCE_LINES} lines.`)

export type CadenceMapInput = z.infer<typeof CadenceMapSchema>
/** As stored on a version: only placements, only for lines of that version. */
export type StoredCadence = Record<string, Placement>

/** `?cadence=5-12` (or `?cadence=7`): the lyric bars whose cadence the sheet prints under their lines. */
export const SheetCadenceQuerySchema = z.object({
  cadence: z.string().trim().regex(/^\d{1,5}(-\d{1,5})?$/, 'cadence is a bar or a range of bars, e.g. ?cadence=5-12.')
    .transform((s) => {
      const [from, to = from] = s.split('-').map(Number) as [number, number?]
      return { from: from!, to: to! }
    })
    .refine(r => r.from >= 1 && r.to >= r.from, 'cadence is a range from bar 1 up, first bar first (e.g. 5-12).')
    .optional(),
})

import { z } from 'zod'
import { FEELS, MAX_BPM, METERS, MIN_BPM } from '../utils/grid'

export const SECTION_KINDS = ['intro', 'verse', 'hook', 'pre-hook', 'bridge', 'break', 'outro', 'other'] as const
export type SectionKind = typeof SECTION_KINDS[number]

export const SECTION_KIND_LABELS: Record<SectionKind, string> = {
  'intro': 'Intro',
  'verse': 'Verse',
  'hook': 'Hook',
  'pre-hook': 'Pre-hook',
  'bridge': 'Bridge',
  'break': 'Break',
  'outro': 'Outro',
  'other': 'Other',
}

/** Longest song the grid handles, in bars (20 minutes at 300 BPM in 2/4 is 1 500). */
export const MAX_BAR = 2000

const decimals = (places: number) => (v: number) => Math.abs(Math.round(v * 10 ** places) - v * 10 ** places) < 1e-6

export const bpmField = z.number({ error: 'Type the tempo as a number.' })
  .min(MIN_BPM, `Use a tempo between ${MIN_BPM} and ${MAX_BPM} BPM.`)
  .max(MAX_BPM, `Use a tempo between ${MIN_BPM} and ${MAX_BPM} BPM.`)
  .refine(decimals(3), 'Use at most three decimals.')

export const GridPatchSchema = z.object({
  bpm: bpmField.optional(),
  beatsPerBar: z.number({ error: 'Pick the beats per bar.' }).int().refine(v => (METERS as readonly number[]).includes(v), `Beats per bar is one of ${METERS.join(', ')}.`).optional(),
  offsetMs: z.number({ error: 'Type the offset in milliseconds.' }).min(0, 'Bar 1 cannot start before the audio does.').max(600_000, 'Bar 1 must start within the first ten minutes.').refine(decimals(3), 'Use at most three decimals.').optional(),
  feel: z.enum(FEELS, { error: 'The feel is normal or half.' }).optional(),
}).refine(v => Object.values(v).some(x => x !== undefined), 'Change at least one of bpm, beatsPerBar, offsetMs or feel.')

const barField = (name: string) => z.number({ error: `Give the ${name} as a bar number.` }).int(`The ${name} is a whole bar number.`).min(1, 'Bars are numbered from 1.').max(MAX_BAR, `Bars go up to ${MAX_BAR}.`)

const sectionFields = {
  kind: z.enum(SECTION_KINDS, { error: `The kind is one of ${SECTION_KINDS.join(', ')}.` }),
  label: z.string({ error: 'The label is text.' }).trim().max(60, 'Use at most 60 characters.').default(''),
  startBar: barField('first bar'),
  endBar: barField('last bar'),
}

const barsInOrder = (v: { startBar?: number, endBar?: number }) => v.startBar === undefined || v.endBar === undefined || v.endBar >= v.startBar
const orderMessage = { message: 'The last bar comes on or after the first bar.', path: ['endBar'] }

export const SectionCreateSchema = z.object(sectionFields).refine(barsInOrder, orderMessage)
export const SectionPatchSchema = z.object({
  kind: sectionFields.kind.optional(),
  label: z.string({ error: 'The label is text.' }).trim().max(60, 'Use at most 60 characters.').optional(),
  startBar: sectionFields.startBar.optional(),
  endBar: sectionFields.endBar.optional(),
}).refine(barsInOrder, orderMessage)
export const SectionOrderSchema = z.object({
  ids: z.array(z.uuid({ error: 'Each entry is a section id.' }), { error: 'Send the section ids in their new order.' }).max(500),
})

import { z } from 'zod'

/** Limits of one analysis request; the route answers 413 past the size ones, 400 past the rest. */
export const ANALYSIS_LIMITS = {
  lines: 400,
  charsPerLine: 300,
  bodyBytes: 256 * 1024,
  sections: 64,
  bar: 10_000,
} as const

/**
 * How much each word carries in an analysis: `words` (the default) what the desk shows, `full`
 * adds every alternate pronunciation, the normalised spelling and the lookup path.
 */
export const ANALYSIS_DETAILS = ['words', 'full'] as const
export type AnalysisDetail = typeof ANALYSIS_DETAILS[number]

/** `?detail=full` does the same as `detail: "full"` in the body. */
export const AnalysisQuerySchema = z.object({
  detail: z.enum(ANALYSIS_DETAILS, { error: 'detail is "words" (the default) or "full".' }).optional(),
})

export const RHYME_LIMITS = { queryChars: 60, queryWords: 4, maxLimit: 200 } as const

const id = z.string({ error: 'Give each line an id.' }).trim().min(1, 'Give each line an id.').max(100, 'Keep ids under 100 characters.')
const bar = z.number({ error: 'Bars are whole numbers from 1.' }).int('Bars are whole numbers from 1.').min(1, 'Bars are numbered from 1.').max(ANALYSIS_LIMITS.bar, `Bars go up to ${ANALYSIS_LIMITS.bar}.`)

export const AnalysisLineSchema = z.object({
  id,
  bar,
  text: z.string({ error: 'Each line needs its text (it may be empty).' }).max(ANALYSIS_LIMITS.charsPerLine, `Keep a line under ${ANALYSIS_LIMITS.charsPerLine} characters; split long lines at the bar.`),
})

export const AnalysisBodySchema = z.object({
  lines: z.array(AnalysisLineSchema, { error: 'Send the lines as a list: [{ id, bar, text }].' }),
  grid: z.object({
    bpm: z.number({ error: 'BPM must be a number.' }).min(20, 'BPM goes from 20.').max(400, 'BPM goes up to 400.'),
    beatsPerBar: z.number({ error: 'Beats per bar must be a number.' }).int('Beats per bar is a whole number.').min(1, 'At least one beat per bar.').max(32, 'At most 32 beats per bar.'),
    feel: z.enum(['normal', 'half'], { error: 'Feel is normal or half.' }).optional(),
  }).optional(),
  crewId: z.uuid({ error: 'That crew id is not valid.' }).optional(),
  detail: z.enum(ANALYSIS_DETAILS, { error: 'detail is "words" (the default) or "full" (every pronunciation and how each was found).' }).optional(),
  sections: z.array(z.object({
    id,
    startBar: bar,
    endBar: bar,
    kind: z.string().max(40).optional(),
    label: z.string().max(80).optional(),
  }).refine(s => s.endBar >= s.startBar, { message: 'A section ends on or after its first bar.', path: ['endBar'] })).max(ANALYSIS_LIMITS.sections, `At most ${ANALYSIS_LIMITS.sections} sections.`).optional(),
})
export type AnalysisBody = z.infer<typeof AnalysisBodySchema>

export const RhymesQuerySchema = z.object({
  q: z.string({ error: 'Type a word or a short phrase to rhyme (?q=…).' }).trim()
    .min(1, 'Type a word or a short phrase to rhyme (?q=…).')
    .max(RHYME_LIMITS.queryChars, `Keep the phrase under ${RHYME_LIMITS.queryChars} characters.`)
    .refine(q => q.split(/\s+/).length <= RHYME_LIMITS.queryWords, `Use at most ${RHYME_LIMITS.queryWords} words.`),
  crewId: z.uuid({ error: 'That crew id is not valid.' }).optional(),
  limit: z.coerce.number({ error: 'limit is a number.' }).int('limit is a whole number.').min(1, 'limit is at least 1.').max(RHYME_LIMITS.maxLimit, `limit is at most ${RHYME_LIMITS.maxLimit}.`).optional(),
})

/** A word the crew teaches: letters with apostrophes, as written in lyrics. */
export const lexiconWordField = z.string({ error: 'Type the word as you write it.' }).trim()
  .transform(w => w.toLowerCase().replace(/[\u2018\u2019`]/g, '\''))
  .pipe(z.string().min(1, 'Type the word as you write it.').max(40, 'Use at most 40 characters.')
    .regex(/^'?[a-z]+(?:'[a-z]+)*'?$/, 'Use letters (and apostrophes) only, one word: numbers are read out by Barsmith already.'))

/** Teach by ARPAbet (`phones`) or by a respelling in dictionary words (`soundsLike`), one of the two. */
export const LexiconEntrySchema = z.object({
  word: lexiconWordField,
  phones: z.string().trim().max(200, 'Use at most 40 phones.').optional(),
  soundsLike: z.string().trim().max(80, 'Keep the respelling under 80 characters.').optional(),
}).refine(e => !!e.phones !== !!e.soundsLike, { message: 'Give either the ARPAbet phones or a "sounds like" respelling.', path: ['phones'] })

export const LexiconPatchSchema = z.object({
  word: lexiconWordField.optional(),
  phones: z.string().trim().max(200, 'Use at most 40 phones.').optional(),
  soundsLike: z.string().trim().max(80, 'Keep the respelling under 80 characters.').optional(),
}).refine(e => !(e.phones && e.soundsLike), { message: 'Give either the ARPAbet phones or a "sounds like" respelling, not both.', path: ['phones'] })

import { z } from 'zod'
import { LINE_ID_PATTERN } from '../utils/lyric-doc'

const TextNodeSchema = z.object({
  type: z.literal('text'),
  text: z.string().max(400),
  marks: z.array(z.object({ type: z.string().max(40), attrs: z.record(z.string(), z.unknown()).optional() })).max(10).optional(),
}).strict()

const LineNodeSchema = z.object({
  type: z.literal('line'),
  attrs: z.object({
    lineId: z.string().regex(LINE_ID_PATTERN),
    bar: z.number().int().min(1).max(9999),
    bars: z.number().int().min(1).max(8).default(1),
    out: z.boolean().default(false),
  }),
  content: z.array(TextNodeSchema).max(200).optional(),
})

const BlockNodeSchema = z.object({
  type: z.literal('block'),
  attrs: z.object({
    sectionId: z.string().max(64).nullable().default(null),
    kind: z.string().max(40).nullable().default(null),
    label: z.string().max(80).nullable().default(null),
  }),
  content: z.array(LineNodeSchema).max(2000).optional(),
})

/** The stored shape of a lyric document (see shared/utils/lyric-doc.ts); nothing else is kept. */
export const LyricDocSchema = z.object({
  type: z.literal('doc'),
  content: z.array(BlockNodeSchema).max(500),
}, { error: 'The document must be a lyric document (doc → block → line → text).' })

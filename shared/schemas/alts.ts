import { z } from 'zod'
import { LINE_ID_PATTERN } from '../utils/lyric-doc'
import { LIMITS } from './drafts'

export const ALT_LIMITS = { commentChars: 1000 } as const

export const AltProposeSchema = z.object({
  lineId: z.string({ error: 'Say which line the alt is for (lineId).' }).regex(LINE_ID_PATTERN, 'That is not a line id.'),
  text: z.string({ error: 'Write the alt line.' }).trim().min(1, 'Write the alt line.').max(LIMITS.charsPerLine, `A line holds at most ${LIMITS.charsPerLine} characters.`),
})

export const AltVoteSchema = z.object({
  value: z.union([z.literal(1), z.literal(-1), z.literal(0)], { error: 'Vote 1 (up), -1 (down) or 0 (take the vote back).' }),
})

export const AltCommentSchema = z.object({
  body: z.string({ error: 'Write a comment.' }).trim().min(1, 'Write a comment.').max(ALT_LIMITS.commentChars, `A comment holds at most ${ALT_LIMITS.commentChars} characters.`),
})

export const AltListQuerySchema = z.object({
  lineId: z.string().regex(LINE_ID_PATTERN, 'That is not a line id.').optional(),
  status: z.enum(['open', 'taken', 'passed'], { error: 'status is open, taken or passed.' }).optional(),
})

export type AltStatus = 'open' | 'taken' | 'passed'

/** An alt as the API lists it. */
export interface AltView {
  id: string
  draftId: string
  lineId: string
  lineText: string
  text: string
  status: AltStatus
  authorId: string | null
  authorName: string | null
  createdAt: string
  decidedBy: string | null
  decidedByName: string | null
  decidedAt: string | null
  takenVersionId: string | null
  up: number
  down: number
  myVote: -1 | 1 | null
  commentCount: number
  /** From the prosody engine, for open alts: the alt's syllables and whether it keeps the line's family. */
  figures?: AltFigures | null
  /** The same figures for the line as the head has it. */
  lineFigures?: AltFigures | null
}

export interface AltCommentView {
  id: string
  altId: string
  authorId: string | null
  authorName: string | null
  body: string
  createdAt: string
}

/**
 * Figures the prosody engine gives for a line or an alt (POST /api/analysis: syllables,
 * families); the alts panel shows them when its caller passes them in.
 */
export interface AltFigures {
  syllables?: number | string
  /** Whether the alt's end word stays in the line's rhyme family. */
  keepsFamily?: boolean | null
  family?: string
}

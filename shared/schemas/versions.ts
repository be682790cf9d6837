import { z } from 'zod'
import { LIMITS, LinesSchema } from './drafts'

/** Without `against`, a version is compared with its parent (the first one with nothing). */
export const DiffQuerySchema = z.object({
  against: z.uuid({ error: 'against must be a version id (?against=<version id>).' }).optional(),
})

/** The merged text of a kept-aside save, saved on the head it was merged with. */
export const MergeSaveSchema = z.object({
  baseVersionId: z.uuid({ error: 'baseVersionId must be the id of the version you merged with.' }).nullable(),
  lines: LinesSchema,
  doc: z.record(z.string(), z.unknown()).optional(),
  note: z.string().trim().max(LIMITS.noteChars, `A note holds at most ${LIMITS.noteChars} characters.`).optional(),
})

/** A version as GET /api/drafts/:draftId/versions lists it. */
export interface VersionListItem {
  id: string
  number: number
  authorId: string | null
  authorName: string | null
  kind: string
  note: string | null
  createdAt: string
  parentId: string | null
}

/** A draft as GET /api/songs/:songId/drafts lists it. */
export interface DraftListItem {
  id: string
  name: string
  headVersionId: string | null
  headNumber: number | null
  isMain: boolean
  archivedAt: string | null
  updatedAt: string
}

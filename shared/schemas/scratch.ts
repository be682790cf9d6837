import { z } from 'zod'

export const SCRATCH_LIMITS = { nameChars: 80, maxDurationMs: 15 * 60_000, bar: 9999 } as const

const name = z.string({ error: 'Name the take.' }).trim().min(1, 'Name the take.').max(SCRATCH_LIMITS.nameChars, `A take's name holds at most ${SCRATCH_LIMITS.nameChars} characters.`)

/** POST /api/songs/:songId/takes?bar=&durationMs=&name= — checked before a byte of the audio is read. */
export const ScratchUploadQuerySchema = z.object({
  bar: z.coerce.number({ error: 'Say which bar the take starts on (?bar=5).' }).int('Bars are whole numbers.').min(1, 'Bars start at 1.').max(SCRATCH_LIMITS.bar, `Bars stop at ${SCRATCH_LIMITS.bar}.`),
  durationMs: z.coerce.number({ error: 'Say how long the take is (?durationMs=…).' }).int('The duration is whole milliseconds.').min(1, 'The take is empty.').max(SCRATCH_LIMITS.maxDurationMs, `A scratch take lasts at most ${SCRATCH_LIMITS.maxDurationMs / 60_000} minutes.`),
  name: name.optional(),
})

export const ScratchRenameSchema = z.object({ name })

/** A take as the API lists it. */
export interface ScratchTakeView {
  id: string
  songId: string
  bar: number
  name: string
  durationMs: number
  format: string
  mimeType: string
  sizeBytes: number
  authorId: string | null
  authorName: string | null
  createdAt: string
  audioUrl: string
}

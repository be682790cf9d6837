import { z } from 'zod'

export const songTitleField = z.string({ error: 'Give the song a title.' })
  .trim()
  .min(1, 'Give the song a title.')
  .max(120, 'Use at most 120 characters.')

export const SongCreateSchema = z.object({ title: songTitleField })
export const SongRenameSchema = z.object({ title: songTitleField })

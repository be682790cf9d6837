import { and, asc, eq } from 'drizzle-orm'
import type { H3Event } from 'h3'
import type { ScratchTakeView } from '../../shared/schemas/scratch'
import type { Action } from '../../shared/utils/permissions'
import { scratchTakes, users, type ScratchTake } from '../database/schema'
import { SCRATCH_FORMATS, type ScratchFormat } from './audio/formats'
import type { DbOrTx } from './db'

/** Storage keys are built from row ids only, never from a user's file name. */
export const scratchKey = (songId: string, takeId: string, format: ScratchFormat) => `scratch/${songId}/${takeId}/take.${SCRATCH_FORMATS[format].ext}`

/** What the API shows of a take. */
export function takeView(take: ScratchTake, authorName: string | null): ScratchTakeView {
  return {
    id: take.id,
    songId: take.songId,
    bar: take.bar,
    name: take.name,
    durationMs: take.durationMs,
    format: take.format,
    mimeType: SCRATCH_FORMATS[take.format].mime,
    sizeBytes: take.sizeBytes,
    authorId: take.authorId,
    authorName,
    createdAt: take.createdAt.toISOString(),
    audioUrl: `/api/songs/${take.songId}/takes/${take.id}/audio`,
  }
}

/** A song's takes in bar order, then oldest first. */
export async function listTakes(db: DbOrTx, songId: string): Promise<ScratchTakeView[]> {
  const rows = await db.select({ take: scratchTakes, name: users.name }).from(scratchTakes)
    .leftJoin(users, eq(users.id, scratchTakes.authorId))
    .where(eq(scratchTakes.songId, songId)).orderBy(asc(scratchTakes.bar), asc(scratchTakes.createdAt), asc(scratchTakes.id))
  return rows.map(r => takeView(r.take, r.name))
}

/**
 * The take behind the `takeId` parameter of the song in `songId`, with `action` checked in
 * its crew. With `own`, only the member who recorded it passes (403 for anyone else).
 */
export async function requireTakeAccess(event: H3Event, action: Action, own = false) {
  const access = await requireSongAccess(event, action)
  const takeId = idParam(event, 'takeId', 'Take')
  const [take] = await useDb().select().from(scratchTakes).where(and(eq(scratchTakes.id, takeId), eq(scratchTakes.songId, access.song.id)))
  if (!take) throw notFound('Take')
  if (own && take.authorId !== access.user.id) {
    throw createError({ statusCode: 403, message: 'Only the member who recorded this take can rename or delete it.' })
  }
  return { ...access, take }
}

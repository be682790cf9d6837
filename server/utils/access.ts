import { and, eq } from 'drizzle-orm'
import type { H3Event } from 'h3'
import { z } from 'zod'
import { can, type Action, type Role } from '../../shared/utils/permissions'
import { memberships, songs, users, type Song, type User } from '../database/schema'

export type SignedInUser = Pick<User, 'id' | 'email' | 'name' | 'emailVerifiedAt'>

/**
 * The signed-in user, re-read from the database so a deleted account or a session from
 * before a password reset is refused (401).
 */
export async function requireUser(event: H3Event): Promise<SignedInUser> {
  if (event.context.barsmithUser) return event.context.barsmithUser as SignedInUser
  reuseUnsealedSession(event)
  const session = await requireUserSession(event, { message: 'Sign in to continue.' })
  rememberUnsealedSession(event)
  const [row] = await useDb()
    .select({ id: users.id, email: users.email, name: users.name, emailVerifiedAt: users.emailVerifiedAt, sessionVersion: users.sessionVersion })
    .from(users)
    .where(eq(users.id, session.user.id))
  if (!row || (session.sv ?? 1) !== row.sessionVersion) {
    await clearUserSession(event)
    throw createError({ statusCode: 401, message: 'Your session has ended. Sign in again.' })
  }
  const { sessionVersion: _, ...user } = row
  event.context.barsmithUser = user
  return user
}

const uuid = z.uuid()

/** A route parameter that must be a row id; anything else is a 404 for `label`. */
export function idParam(event: H3Event, name: string, label: string): string {
  const value = getRouterParam(event, name)
  if (!uuid.safeParse(value).success) throw notFound(label)
  return value!
}

export function notFound(label: string) {
  return createError({ statusCode: 404, message: `${label} not found. It may have been removed, or you are not a member of its crew.` })
}

export interface CrewAccess {
  user: SignedInUser
  crewId: string
  role: Role
}

/**
 * Signed in, a member of `crewId` (else 404, so other crews' rows stay invisible) and of a
 * role the permission table allows for `action` (else 403).
 */
export async function requireCrewAccess(event: H3Event, crewId: string, action: Action, label = 'Crew'): Promise<CrewAccess> {
  const user = await requireUser(event)
  const [membership] = await useDb()
    .select({ role: memberships.role })
    .from(memberships)
    .where(and(eq(memberships.crewId, crewId), eq(memberships.userId, user.id)))
  if (!membership) throw notFound(label)
  if (!can(membership.role, action)) {
    throw createError({ statusCode: 403, message: `Your role in this crew (${membership.role}) cannot do this (${action}).` })
  }
  return { user, crewId, role: membership.role }
}

/** Loads a song by the `songId` route parameter and checks `action` in its crew. */
export async function requireSongAccess(event: H3Event, action: Action, param = 'songId'): Promise<CrewAccess & { song: Song }> {
  await requireUser(event)
  const songId = idParam(event, param, 'Song')
  const [song] = await useDb().select().from(songs).where(eq(songs.id, songId))
  if (!song) throw notFound('Song')
  const access = await requireCrewAccess(event, song.crewId, action, 'Song')
  return { ...access, song }
}

import { and, eq, sql } from 'drizzle-orm'
import type { H3Event } from 'h3'
import { z } from 'zod'
import { can, type Action, type Role } from '../../shared/utils/permissions'
import { memberships, songs, users, type Song, type User } from '../database/schema'

export type SignedInUser = Pick<User, 'id' | 'email' | 'name' | 'emailVerifiedAt'>

/**
 * The signed-in user, re-read from the database so a deleted account or a session from
 * before a password reset is refused (401). With `crewId`, the same query also reads the
 * user's role in that crew (null when not a member).
 */
async function loadSessionUser(event: H3Event, crewId?: string): Promise<{ user: SignedInUser, role: Role | null }> {
  reuseUnsealedSession(event)
  const session = await requireUserSession(event, { message: 'Sign in to continue.' })
  rememberUnsealedSession(event)
  const [row] = await useDb()
    .select({
      id: users.id, email: users.email, name: users.name, emailVerifiedAt: users.emailVerifiedAt, sessionVersion: users.sessionVersion,
      role: crewId ? memberships.role : sql<null>`null`,
    })
    .from(users)
    .leftJoin(memberships, crewId ? and(eq(memberships.userId, users.id), eq(memberships.crewId, crewId)) : sql`false`)
    .where(eq(users.id, session.user.id))
  if (!row || (session.sv ?? 1) !== row.sessionVersion) {
    await clearUserSession(event)
    throw createError({ statusCode: 401, message: 'Your session has ended. Sign in again.' })
  }
  const { sessionVersion: _, role, ...user } = row
  event.context.barsmithUser = user
  return { user, role: role ?? null }
}

/** The signed-in user (401 otherwise), checked against the database once per request. */
export async function requireUser(event: H3Event): Promise<SignedInUser> {
  if (event.context.barsmithUser) return event.context.barsmithUser as SignedInUser
  return (await loadSessionUser(event)).user
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
  let user = event.context.barsmithUser as SignedInUser | undefined
  let role: Role | null
  if (user) {
    const [membership] = await useDb()
      .select({ role: memberships.role })
      .from(memberships)
      .where(and(eq(memberships.crewId, crewId), eq(memberships.userId, user.id)))
    role = membership?.role ?? null
  }
  else {
    ({ user, role } = await loadSessionUser(event, crewId))
  }
  if (!role) throw notFound(label)
  if (!can(role, action)) {
    throw createError({ statusCode: 403, message: `Your role in this crew (${role}) cannot do this (${action}).` })
  }
  return { user, crewId, role }
}

/** Signed in (401 otherwise), from the session cookie alone: the database check comes with the access check. */
async function requireSession(event: H3Event) {
  if (event.context.barsmithUser) return
  reuseUnsealedSession(event)
  await requireUserSession(event, { message: 'Sign in to continue.' })
  rememberUnsealedSession(event)
}

/**
 * Loads the row behind the route parameter `param` with `load` (which joins its song) and
 * checks `action` in that song's crew: signed out → 401; a malformed id, no such row or a
 * row of another crew → 404 for `label`; a role the table does not allow → 403.
 */
export async function requireRowAccess<T extends { song: Song }>(
  event: H3Event, action: Action, param: string, label: string, load: (id: string) => Promise<T | undefined>,
): Promise<CrewAccess & T> {
  await requireSession(event)
  const row = await load(idParam(event, param, label))
  if (!row) throw notFound(label)
  const access = await requireCrewAccess(event, row.song.crewId, action, label)
  return { ...row, ...access }
}

/** Loads a song by the `songId` route parameter and checks `action` in its crew. */
export function requireSongAccess(event: H3Event, action: Action, param = 'songId') {
  return requireRowAccess(event, action, param, 'Song', async (id) => {
    const [song] = await useDb().select().from(songs).where(eq(songs.id, id))
    return song && { song }
  })
}

import { eq } from 'drizzle-orm'
import type { H3Event } from 'h3'
import { tokenField } from '../../shared/schemas/auth'
import { crews, invites, users, type Invite } from '../database/schema'

export const INVITE_TTL_MS = 7 * 24 * 60 * 60 * 1000

export type InviteStatus = 'open' | 'accepted' | 'revoked' | 'expired'

export function inviteStatus(invite: Invite): InviteStatus {
  if (invite.acceptedAt) return 'accepted'
  if (invite.revokedAt) return 'revoked'
  if (invite.expiresAt.getTime() <= Date.now()) return 'expired'
  return 'open'
}

/** The invite behind the `token` route parameter, with its crew's name; 404 when unknown. */
export async function inviteByToken(event: H3Event) {
  const parsed = tokenField.safeParse(getRouterParam(event, 'token'))
  if (!parsed.success) throw notFound('Invite')
  const [row] = await useDb()
    .select({ invite: invites, crewName: crews.name, inviterName: users.name })
    .from(invites)
    .innerJoin(crews, eq(crews.id, invites.crewId))
    .leftJoin(users, eq(users.id, invites.invitedBy))
    .where(eq(invites.tokenHash, hashToken(parsed.data)))
  if (!row) throw notFound('Invite')
  return row
}

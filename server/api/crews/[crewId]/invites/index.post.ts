import { and, eq, isNull, sql } from 'drizzle-orm'
import { InviteSchema } from '../../../../../shared/schemas/crews'
import { ROLE_LABELS } from '../../../../../shared/utils/permissions'
import { crews, invites, memberships, users } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const crewId = idParam(event, 'crewId', 'Crew')
  const { user } = await requireCrewAccess(event, crewId, 'member.invite')
  const { email, role } = await validBody(event, InviteSchema)
  await throttle(event, 'invite', user.id, 'invites sent')
  const db = useDb()
  const [already] = await db.select({ id: memberships.id }).from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.crewId, crewId), eq(sql`lower(${users.email})`, email)))
  if (already) throw createError({ statusCode: 409, message: `${email} is already in this crew.`, data: { fields: { email: 'Already a member' } } })

  const { token, hash } = newToken()
  const invite = await db.transaction(async (tx) => {
    // A fresh invite replaces any open one for the same address.
    await tx.update(invites).set({ revokedAt: new Date() })
      .where(and(eq(invites.crewId, crewId), eq(sql`lower(${invites.email})`, email), isNull(invites.acceptedAt), isNull(invites.revokedAt)))
    const [row] = await tx.insert(invites).values({
      crewId, email, role, tokenHash: hash, invitedBy: user.id, expiresAt: new Date(Date.now() + INVITE_TTL_MS),
    }).returning({ id: invites.id, email: invites.email, role: invites.role, expiresAt: invites.expiresAt })
    const [crew] = await tx.select({ name: crews.name }).from(crews).where(eq(crews.id, crewId))
    await queueMail(tx, inviteMail(email, crew!.name, user.name, ROLE_LABELS[role], appLink(`/invites/${token}`)))
    return row!
  })
  setResponseStatus(event, 201)
  return invite
})

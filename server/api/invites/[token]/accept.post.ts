import { and, eq } from 'drizzle-orm'
import { invites, memberships } from '../../../database/schema'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { invite } = await inviteByToken(event)
  const status = inviteStatus(invite)
  if (status !== 'open') {
    throw createError({ statusCode: 410, message: `This invite is ${status}. Ask the crew owner for a new one.` })
  }
  if (invite.email.toLowerCase() !== user.email.toLowerCase()) {
    throw createError({ statusCode: 403, message: `This invite is for ${invite.email}, but you are signed in as ${user.email}. Sign in with the invited address.` })
  }
  await useDb().transaction(async (tx) => {
    const [existing] = await tx.select({ id: memberships.id }).from(memberships)
      .where(and(eq(memberships.crewId, invite.crewId), eq(memberships.userId, user.id)))
    if (!existing) await tx.insert(memberships).values({ crewId: invite.crewId, userId: user.id, role: invite.role })
    await tx.update(invites).set({ acceptedAt: new Date(), acceptedBy: user.id }).where(eq(invites.id, invite.id))
  })
  return { crewId: invite.crewId, role: invite.role }
})

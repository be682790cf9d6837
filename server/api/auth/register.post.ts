import { and, eq, gt, isNull } from 'drizzle-orm'
import { RegisterSchema } from '../../../shared/schemas/auth'
import { invites, memberships, users } from '../../database/schema'

const SAME_ANSWER = { ok: true, signedIn: false, message: 'Check your e-mail: we sent a link to confirm the address.' }

export default defineEventHandler(async (event) => {
  const startedAt = performance.now()
  const body = await validBody(event, RegisterSchema)
  await throttle(event, 'register', clientAddress(event), 'sign-ups from this address')
  const db = useDb()
  const existing = await findUserByEmail(db, body.email)
  // Hash before branching so both paths cost the same time.
  const passwordHash = await hashPassword(body.password)

  if (body.inviteToken) {
    const [invite] = await db.select().from(invites).where(and(
      eq(invites.tokenHash, hashToken(body.inviteToken)), isNull(invites.acceptedAt), isNull(invites.revokedAt), gt(invites.expiresAt, new Date()),
    ))
    if (!invite) throw createError({ statusCode: 400, message: 'This invite has expired or was already used. Ask the crew owner for a new one.' })
    if (invite.email.toLowerCase() !== body.email) {
      throw createError({ statusCode: 400, message: `This invite is for ${invite.email}. Sign up with that address.`, data: { fields: { email: `Use ${invite.email}` } } })
    }
    if (existing) throw createError({ statusCode: 409, message: 'You already have an account. Sign in to accept the invite.' })
    // The invite link proved the address, so the account starts verified and joins the crew.
    const user = await db.transaction(async (tx) => {
      const [created] = await tx.insert(users).values({ email: body.email, name: body.name, passwordHash, emailVerifiedAt: new Date() }).returning()
      await tx.insert(memberships).values({ crewId: invite.crewId, userId: created!.id, role: invite.role })
      await tx.update(invites).set({ acceptedAt: new Date(), acceptedBy: created!.id }).where(eq(invites.id, invite.id))
      return created!
    })
    await startSession(event, user)
    setResponseStatus(event, 201)
    return { ok: true, signedIn: true, crewId: invite.crewId, message: 'Welcome to the crew.' }
  }

  if (existing) {
    // Same answer as a new sign-up, so the form does not reveal who has an account; the
    // owner of the address hears about it instead.
    await queueMail(db, linkMail(existing.email, 'Someone tried to sign up with your e-mail',
      'Someone tried to create a Barsmith account with this address, which already has one.',
      'Sign in or reset your password', appLink('/signin'),
      'If it was not you, you can ignore this message.'))
    await answerNoSoonerThan(startedAt, SIGN_UP_FLOOR_MS)
    setResponseStatus(event, 201)
    return SAME_ANSWER
  }

  await db.transaction(async (tx) => {
    const [user] = await tx.insert(users).values({ email: body.email, name: body.name, passwordHash }).returning()
    const token = await issueEmailToken(tx, user!.id, 'verify')
    await queueMail(tx, verifyMail(user!.email, user!.name, appLink(`/verify?token=${token}`)))
  })
  await answerNoSoonerThan(startedAt, SIGN_UP_FLOOR_MS)
  setResponseStatus(event, 201)
  return SAME_ANSWER
})

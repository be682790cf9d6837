import { EmailOnlySchema } from '../../../shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const startedAt = performance.now()
  const { email } = await validBody(event, EmailOnlySchema)
  await throttle(event, 'mailLink', `${clientAddress(event)}|${email}`, 'e-mail links requested')
  const db = useDb()
  const user = await findUserByEmail(db, email)
  if (user && !user.emailVerifiedAt) {
    await db.transaction(async (tx) => {
      const token = await issueEmailToken(tx, user.id, 'verify')
      await queueMail(tx, verifyMail(user.email, user.name, appLink(`/verify?token=${token}`)))
    })
  }
  await answerNoSoonerThan(startedAt, MAIL_LINK_FLOOR_MS)
  return { ok: true, message: 'If that address has an account waiting for confirmation, a new link is on its way.' }
})

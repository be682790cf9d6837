import { EmailOnlySchema } from '../../../shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const startedAt = performance.now()
  const { email } = await validBody(event, EmailOnlySchema)
  await throttle(event, 'mailLink', `${clientAddress(event)}|${email}`, 'e-mail links requested')
  const db = useDb()
  const user = await findUserByEmail(db, email)
  if (user) {
    await db.transaction(async (tx) => {
      const token = await issueEmailToken(tx, user.id, 'reset')
      await queueMail(tx, resetMail(user.email, appLink(`/reset?token=${token}`)))
    })
  }
  await answerNoSoonerThan(startedAt, MAIL_LINK_FLOOR_MS)
  // Same answer either way: the form must not reveal which addresses have accounts.
  return { ok: true, message: 'If that address has an account, a reset link is on its way. It works once, for one hour.' }
})

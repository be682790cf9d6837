import { LoginSchema } from '../../../shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const body = await validBody(event, LoginSchema)
  const address = clientAddress(event)
  await assertNotThrottled(event, 'loginAddress', address, 'sign-in attempts from this address')
  await assertNotThrottled(event, 'loginEmail', body.email, 'sign-in attempts for this account')

  const user = await findUserByEmail(useDb(), body.email)
  if (!(await checkPassword(user, body.password))) {
    await Promise.all([countFailure('loginAddress', address), countFailure('loginEmail', body.email)])
    // This message is intentionally vague to prevent user enumeration.
    throw createError({ statusCode: 401, message: 'That e-mail and password do not match an account.' })
  }
  if (!user!.emailVerifiedAt) {
    throw createError({
      statusCode: 403,
      message: 'Confirm your e-mail address first: open the link we sent you, or ask for a new one.',
      data: { reason: 'unverified' },
    })
  }
  await clearThrottle('loginEmail', body.email)
  await startSession(event, user!)
  return { user: publicUser(user!) }
})

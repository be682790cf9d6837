import { z } from 'zod'

export const PASSWORD_MIN = 10

export const emailField = z.string({ error: 'Enter your e-mail address.' })
  .trim()
  .max(254, 'That e-mail address is too long.')
  .pipe(z.email({ error: 'Enter a valid e-mail address, like name@example.com.' }))
  .transform(v => v.toLowerCase())

export const passwordField = z.string({ error: 'Enter a password.' })
  .min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters.`)
  .max(200, 'Use at most 200 characters.')

export const nameField = z.string({ error: 'Enter your name.' })
  .trim()
  .min(1, 'Enter your name.')
  .max(80, 'Use at most 80 characters.')

export const tokenField = z.string({ error: 'The link is incomplete.' })
  .regex(/^[\w-]{20,100}$/, 'This link is not valid. Open the newest link from your e-mail.')

export const LoginSchema = z.object({
  email: emailField,
  password: z.string({ error: 'Enter your password.' }).min(1, 'Enter your password.').max(200, 'Use at most 200 characters.'),
})

export const RegisterSchema = z.object({
  name: nameField,
  email: emailField,
  password: passwordField,
  inviteToken: tokenField.optional(),
})

export const EmailOnlySchema = z.object({ email: emailField })

export const TokenSchema = z.object({ token: tokenField })

export const ResetSchema = z.object({ token: tokenField, password: passwordField })

export type LoginInput = z.input<typeof LoginSchema>
export type RegisterInput = z.input<typeof RegisterSchema>

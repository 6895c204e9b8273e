// Zod schemas shared by the sign-in pages and the auth routes: one rule, both sides.
import { z } from 'zod'
import { schoolAddressSchema } from './address'
import { emailAddress } from './email'
import { singleLine } from './text'

const email = emailAddress('your e-mail address')

export const passwordRule = z
  .string({ error: 'Enter a password.' })
  .min(10, 'Use at least 10 characters.')
  .max(200, 'Use at most 200 characters.')

const text = (label: string, max: number) =>
  singleLine(
    z
      .string({ error: `Enter ${label}.` })
      .trim()
      .min(1, `Enter ${label}.`)
      .max(max, `Keep ${label} to ${max} characters or fewer.`),
  )
const optionalText = (label: string, max: number) =>
  singleLine(z.string().trim().max(max, `Keep ${label} to ${max} characters or fewer.`))
    .optional()
    .transform(v => v || undefined)

export const schoolSchema = z.object({
  name: text('the school name', 160),
  district: optionalText('the district', 160),
  // Tiltwright ships to US schools: the state decides the sales tax (shared/utils/tax.ts).
  ...schoolAddressSchema.shape,
})

export const registerSchema = z.object({
  name: text('your name', 120),
  email,
  password: passwordRule,
  school: schoolSchema,
})

/** Teachers and staff sign in with their e-mail address, builders with their username (a page
 *  with one field sends `username` when what was typed has no @). */
export const loginSchema = z.object({
  email: email.optional(),
  username: z
    .string({ error: 'Enter your username.' })
    .trim()
    .toLowerCase()
    .min(1, 'Enter your username.')
    .max(40, 'That username is too long.')
    .optional(),
  password: z
    .string({ error: 'Enter your password.' })
    .min(1, 'Enter your password.')
    .max(200, 'That password is too long.'),
}).superRefine((v, ctx) => {
  if (!v.email && !v.username)
    ctx.addIssue({ code: 'custom', path: ['email'], message: 'Enter your e-mail or username.' })
})

export const forgotPasswordSchema = z.object({ email })

export const tokenSchema = z
  .string({ error: 'The link is incomplete.' })
  .regex(/^[A-Za-z0-9_-]{20,100}$/, 'The link is incomplete or has been altered.')

export const verifyEmailSchema = z.object({ token: tokenSchema })

export const resetPasswordSchema = z.object({ token: tokenSchema, password: passwordRule })

export const changePasswordSchema = z
  .object({
    currentPassword: z
      .string({ error: 'Enter your current password.' })
      .min(1, 'Enter your current password.')
      .max(200, 'That password is too long.'),
    newPassword: passwordRule,
  })
  .refine(v => v.currentPassword !== v.newPassword, {
    path: ['newPassword'],
    message: 'Choose a password different from the current one.',
  })

export const accountSchema = z.object({ name: text('your name', 120) })

export type RegisterInput = z.input<typeof registerSchema>
export type LoginInput = z.input<typeof loginSchema>

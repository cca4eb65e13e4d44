import { z } from './zod'
import { ROLES } from '../auth/roles'

export const emailSchema = z.string().trim().toLowerCase().email('Enter an e-mail address such as name@newsroom.org').max(254)
export const passwordSchema = z.string().min(10, 'Use at least 10 characters').max(200)
export const nameSchema = z.string().trim().min(1, 'Enter a name').max(120)
export const roleSchema = z.enum(ROLES)

const currentPasswordSchema = z.string().min(1, 'Enter your password').max(200)
/** A 6-digit authenticator code or a recovery code (xxxxx-xxxxx). */
export const secondFactorCodeSchema = z.string().trim().min(6, 'Enter the 6-digit code').max(40)

export const loginSchema = z.object({
  email: emailSchema,
  password: currentPasswordSchema,
  /** Only for an account with two-factor sign-in. */
  code: secondFactorCodeSchema.optional(),
})

export const passwordChangeSchema = z.object({
  currentPassword: currentPasswordSchema,
  newPassword: passwordSchema,
})

export const passwordResetRequestSchema = z.object({ email: emailSchema })
export const passwordResetSchema = z.object({ password: passwordSchema })
export const passwordConfirmSchema = z.object({ password: currentPasswordSchema })
export const codeSchema = z.object({ code: secondFactorCodeSchema })

export const invitationCreateSchema = z.object({
  email: emailSchema,
  role: roleSchema,
})

export const invitationAcceptSchema = z.object({
  name: nameSchema,
  password: passwordSchema,
})

/** The newsroom settings an admin changes; each is optional, at least one is sent. */
export const newsroomSettingsSchema = z.object({
  fourEyes: z.boolean().optional(),
  requireTwoFactor: z.boolean().optional(),
}).refine(settings => settings.fourEyes !== undefined || settings.requireTwoFactor !== undefined, 'Name a setting to change')
export const roleChangeSchema = z.object({ role: roleSchema })

export const idParamsSchema = z.object({ id: z.string().uuid() })
export const tokenParamsSchema = z.object({ token: z.string().min(20).max(200) })

import { z } from './zod'
import { ROLES } from '../auth/roles'

export const emailSchema = z.string().trim().toLowerCase().email('Enter an e-mail address such as name@newsroom.org').max(254)
export const passwordSchema = z.string().min(10, 'Use at least 10 characters').max(200)
export const nameSchema = z.string().trim().min(1, 'Enter a name').max(120)
export const roleSchema = z.enum(ROLES)

export const loginSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, 'Enter your password').max(200),
})

export const invitationCreateSchema = z.object({
  email: emailSchema,
  role: roleSchema,
})

export const invitationAcceptSchema = z.object({
  name: nameSchema,
  password: passwordSchema,
})

export const newsroomSettingsSchema = z.object({ fourEyes: z.boolean() })
export const roleChangeSchema = z.object({ role: roleSchema })

export const idParamsSchema = z.object({ id: z.string().uuid() })
export const tokenParamsSchema = z.object({ token: z.string().min(20).max(200) })

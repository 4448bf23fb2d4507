import { z } from 'zod'
import { ROLES } from '../utils/roles'

export const PASSWORD_MIN_LENGTH = 12

export const emailSchema = z.string().trim().toLowerCase().email('Enter a valid e-mail address.').max(254)
export const newPasswordSchema = z.string()
  .min(PASSWORD_MIN_LENGTH, `Use at least ${PASSWORD_MIN_LENGTH} characters.`)
  .max(256, 'Use at most 256 characters.')

export const signInSchema = z.object({ email: emailSchema, password: z.string().min(1, 'Enter your password.').max(256) })
export const setPasswordSchema = z.object({ token: z.string().min(20).max(200), password: newPasswordSchema })
export const changePasswordSchema = z.object({ currentPassword: z.string().min(1).max(256), newPassword: newPasswordSchema })

export const createUserSchema = z.object({
  email: emailSchema,
  displayName: z.string().trim().min(1, 'Enter a name.').max(120),
  role: z.enum(ROLES),
})
export const updateUserSchema = z.object({
  displayName: z.string().trim().min(1).max(120).optional(),
  role: z.enum(ROLES).optional(),
  active: z.boolean().optional(),
}).refine((v) => Object.keys(v).length > 0, 'Nothing to change.')

export const idParamSchema = z.object({ id: z.coerce.number().int().positive() })

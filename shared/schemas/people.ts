import { z } from 'zod'
import { ROLES } from '../types/roles'

export const MIN_PASSWORD_LENGTH = 12

/** E-mail addresses are compared case-insensitively: stored trimmed and lower-cased. */
export const Email = z.string().trim().toLowerCase().pipe(z.email('must be an e-mail address').max(254, 'must be at most 254 characters'))

export const NewPassword = z.string()
  .min(MIN_PASSWORD_LENGTH, `must be at least ${MIN_PASSWORD_LENGTH} characters`)
  .max(200, 'must be at most 200 characters')

export const SignInBody = z.strictObject({
  email: z.string().trim().toLowerCase().min(1, 'is required').max(254, 'must be at most 254 characters'),
  password: z.string().min(1, 'is required').max(200, 'must be at most 200 characters'),
})

export const ChangePasswordBody = z.strictObject({
  currentPassword: z.string().min(1, 'is required').max(200, 'must be at most 200 characters'),
  newPassword: NewPassword,
})

export const PersonName = z.string().trim().min(1, 'is required').max(120, 'must be at most 120 characters')

export const CreateUserBody = z.strictObject({
  email: Email,
  name: PersonName,
  role: z.enum(ROLES, 'must be admin, rater or reviewer'),
  password: NewPassword,
  jurisdictionId: z.number().int().positive().nullable().optional(),
})

export const ChangeRoleBody = z.strictObject({
  role: z.enum(ROLES, 'must be admin, rater or reviewer'),
  jurisdictionId: z.number().int().positive().nullable().optional(),
})

export const IdParams = z.object({
  id: z.coerce.number('must be a number').int('must be a whole number').positive('must be positive'),
})

export type CreateUserInput = z.infer<typeof CreateUserBody>

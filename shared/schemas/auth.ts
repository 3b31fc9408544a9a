import { z } from 'zod'
import { ROLES } from '../auth/roles'

export const Role = z.enum(ROLES)
export const UnitSystem = z.enum(['us', 'si'])
export type UnitSystem = z.infer<typeof UnitSystem>

export const Email = z
  .string()
  .trim()
  .toLowerCase()
  .pipe(z.email({ message: 'Enter a valid e-mail address.' }).max(254))

/** Passwords: long rather than clever. 10 to 200 characters. */
export const NewPassword = z
  .string()
  .min(10, { message: 'Use at least 10 characters.' })
  .max(200, { message: 'Use at most 200 characters.' })

export const User = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: Role,
  active: z.boolean(),
  units: UnitSystem,
})
export type User = z.infer<typeof User>

export const CsrfResponse = z.object({ token: z.string() })

export const SignInBody = z.object({
  email: Email,
  password: z.string().min(1, { message: 'Enter your password.' }).max(200),
})
export type SignInBody = z.infer<typeof SignInBody>

export const UpdatePreferencesBody = z
  .object({ units: UnitSystem.optional(), name: z.string().trim().min(1).max(120).optional() })
  .strict()
export type UpdatePreferencesBody = z.infer<typeof UpdatePreferencesBody>

export const ForgotPasswordBody = z.object({ email: Email })
export type ForgotPasswordBody = z.infer<typeof ForgotPasswordBody>

export const TokenParam = z.string().regex(/^[A-Za-z0-9_-]{20,100}$/, { message: 'This link is not valid.' })

export const TokenInfo = z.object({ kind: z.enum(['invite', 'reset']), email: z.string(), name: z.string() })
export type TokenInfo = z.infer<typeof TokenInfo>

export const SetPasswordBody = z.object({ token: TokenParam, password: NewPassword })
export type SetPasswordBody = z.infer<typeof SetPasswordBody>

export const MessageResponse = z.object({ message: z.string() })

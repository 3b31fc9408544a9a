import { z } from 'zod'
import { Email, Role, User } from './auth'

export const UserId = z.coerce.number().int().positive()

export const AdminUser = User.extend({
  createdAt: z.string(),
  lastSignInAt: z.string().nullable(),
  /** True while the user has not yet set a password from their invitation. */
  pendingInvite: z.boolean(),
})
export type AdminUser = z.infer<typeof AdminUser>

export const UserListResponse = z.object({ items: z.array(AdminUser) })
export type UserListResponse = z.infer<typeof UserListResponse>

export const InviteUserBody = z.object({
  email: Email,
  name: z.string().trim().min(1, { message: 'Enter a name.' }).max(120),
  role: Role,
})
export type InviteUserBody = z.infer<typeof InviteUserBody>

export const UpdateUserBody = z
  .object({ role: Role.optional(), active: z.boolean().optional() })
  .strict()
  .refine(b => b.role !== undefined || b.active !== undefined, { message: 'Change the role or the active flag.' })
export type UpdateUserBody = z.infer<typeof UpdateUserBody>

export const MailSummary = z.object({
  id: z.string(),
  to: z.array(z.string()),
  from: z.string(),
  subject: z.string(),
  receivedAt: z.string(),
})
export type MailSummary = z.infer<typeof MailSummary>

export const MailMessage = MailSummary.extend({ text: z.string() })
export type MailMessage = z.infer<typeof MailMessage>

export const MailboxResponse = z.object({ enabled: z.boolean(), items: z.array(MailSummary) })
export type MailboxResponse = z.infer<typeof MailboxResponse>

/** `analytics`: whether the calibration columns are loaded ('warming' until the first load ends); never changes the status code. */
export const HealthResponse = z.object({ status: z.enum(['ok', 'degraded']), database: z.enum(['up', 'down']), analytics: z.enum(['warming', 'ready']), version: z.string() })
export type HealthResponse = z.infer<typeof HealthResponse>

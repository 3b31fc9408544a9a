import { z } from 'zod'
import { AdminUser, InviteUserBody, MailboxResponse, MailMessage, UpdateUserBody, UserListResponse } from '@shared/schemas/users'
import { request } from './client'

const InviteResponse = z.object({ user: AdminUser, mailDelivered: z.boolean() })

export const listUsers = () => request('/api/users', { response: UserListResponse })

export const inviteUser = (body: InviteUserBody) =>
  request('/api/users/invitations', { method: 'POST', body: InviteUserBody.parse(body), response: InviteResponse })

export const resendInvite = (userId: number) =>
  request(`/api/users/${userId}/invitation`, { method: 'POST', body: {}, response: InviteResponse })

export const updateUser = (userId: number, body: UpdateUserBody) =>
  request(`/api/users/${userId}`, { method: 'PATCH', body: UpdateUserBody.parse(body), response: AdminUser })

export const listMail = () => request('/api/mailbox', { response: MailboxResponse })

export const getMail = (id: string) => request(`/api/mailbox/${encodeURIComponent(id)}`, { response: MailMessage })

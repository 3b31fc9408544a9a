import { z } from 'zod'
import {
  ForgotPasswordBody,
  MessageResponse,
  SetPasswordBody,
  SignInBody,
  TokenInfo,
  UpdatePreferencesBody,
  User,
} from '@shared/schemas/auth'
import { request, resetCsrf } from './client'

export const getMe = () => request('/api/auth/me', { response: User, quiet401: true })

export const signIn = (body: SignInBody) =>
  request('/api/auth/sign-in', { method: 'POST', body: SignInBody.parse(body), response: User, quiet401: true })

export async function signOut() {
  await request('/api/auth/sign-out', { method: 'POST', response: z.undefined() })
  resetCsrf()
}

export const updatePreferences = (body: UpdatePreferencesBody) =>
  request('/api/auth/me', { method: 'PATCH', body: UpdatePreferencesBody.parse(body), response: User })

export const forgotPassword = (body: ForgotPasswordBody) =>
  request('/api/auth/forgot-password', { method: 'POST', body: ForgotPasswordBody.parse(body), response: MessageResponse })

export const getTokenInfo = (token: string) =>
  request(`/api/auth/tokens/${encodeURIComponent(token)}`, { response: TokenInfo, quiet401: true })

export const setPassword = (body: SetPasswordBody) =>
  request('/api/auth/set-password', { method: 'POST', body: SetPasswordBody.parse(body), response: MessageResponse })

import type { z } from 'zod'
import { ApiErrorBody, type ErrorCode } from '@shared/schemas/api-error'
import { CsrfResponse } from '@shared/schemas/auth'
import { noteFreshness } from './freshness'

/** Codes that exist only on the client: the server was unreachable, or answered off-contract. */
export type ClientErrorCode = ErrorCode | 'NETWORK' | 'BAD_RESPONSE'

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: ClientErrorCode,
    message: string,
    readonly fields: Record<string, string> = {},
  ) {
    super(message)
    this.name = 'ApiError'
  }
}

// The promise, not the token: concurrent first calls share one fetch (two would race for the session cookie).
let csrfToken: Promise<string> | undefined
let onUnauthenticated: (() => void) | undefined

/** Called on any 401 (except sign-in itself); the router sends the user to sign in. */
export function setUnauthenticatedHandler(fn: () => void) {
  onUnauthenticated = fn
}

/** Forget the CSRF token (after sign-out the session, and its token, are gone). */
export function resetCsrf() {
  csrfToken = undefined
}

/** The session's CSRF token, for the few calls made outside request() (file uploads). */
export function getCsrfToken(): Promise<string> {
  return getCsrf()
}

function getCsrf(): Promise<string> {
  csrfToken ??= request('/api/auth/csrf', { response: CsrfResponse }).then(
    r => r.token,
    err => {
      csrfToken = undefined
      throw err
    },
  )
  return csrfToken
}

interface RequestOptions<S extends z.ZodType> {
  method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE'
  body?: unknown
  response: S
  /** Do not trigger the sign-in redirect on 401 (the sign-in call itself). */
  quiet401?: boolean
}

/**
 * The one way the dashboard talks to the API: adds the CSRF header to state-changing calls,
 * turns every failure into an ApiError, and checks the response against its shared schema.
 */
export async function request<S extends z.ZodType>(url: string, options: RequestOptions<S>): Promise<z.infer<S>> {
  const method = options.method ?? 'GET'
  const headers: Record<string, string> = { accept: 'application/json' }
  if (options.body !== undefined) headers['content-type'] = 'application/json'
  if (method !== 'GET') headers['x-csrf-token'] = await getCsrf()
  let res: Response
  try {
    res = await fetch(url, {
      method,
      headers,
      credentials: 'same-origin',
      body: options.body === undefined ? undefined : JSON.stringify(options.body),
    })
  } catch {
    throw new ApiError(0, 'NETWORK', 'The server could not be reached.')
  }
  noteFreshness(res)
  const text = await res.text()
  const json: unknown = text ? safeJson(text) : undefined
  if (!res.ok) throw apiErrorFrom(res.status, json, options.quiet401)
  if (res.status === 204) return options.response.parse(undefined)
  const parsed = options.response.safeParse(json)
  if (!parsed.success) {
    console.error('Response did not match its contract', url, parsed.error.issues)
    throw new ApiError(res.status, 'BAD_RESPONSE', 'The server answered in an unexpected way.')
  }
  return parsed.data
}

/**
 * The ApiError for a failed response (its parsed JSON body, if any). Forgets a stale CSRF token and,
 * unless `quiet401`, sends the user to sign in on 401. Also used by calls made outside request().
 */
export function apiErrorFrom(status: number, json: unknown, quiet401 = false): ApiError {
  const parsed = ApiErrorBody.safeParse(json)
  const err = parsed.success
    ? new ApiError(status, parsed.data.error.code, parsed.data.error.message, parsed.data.error.fields)
    : new ApiError(status, status >= 500 ? 'INTERNAL' : 'BAD_RESPONSE', `The server answered ${status}.`)
  if (err.code === 'CSRF_INVALID') resetCsrf()
  if (status === 401 && !quiet401) onUnauthenticated?.()
  return err
}

export function safeJson(text: string): unknown {
  try {
    return JSON.parse(text)
  } catch {
    return undefined
  }
}

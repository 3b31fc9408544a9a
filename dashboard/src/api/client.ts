import type { z } from 'zod'
import { ApiErrorBody, type ErrorCode } from '@shared/schemas/api-error'
import { CsrfResponse } from '@shared/schemas/auth'

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
  const text = await res.text()
  const json: unknown = text ? safeJson(text) : undefined
  if (!res.ok) {
    const parsed = ApiErrorBody.safeParse(json)
    const err = parsed.success
      ? new ApiError(res.status, parsed.data.error.code, parsed.data.error.message, parsed.data.error.fields)
      : new ApiError(res.status, res.status >= 500 ? 'INTERNAL' : 'BAD_RESPONSE', `The server answered ${res.status}.`)
    if (err.code === 'CSRF_INVALID') resetCsrf()
    if (res.status === 401 && !options.quiet401) onUnauthenticated?.()
    throw err
  }
  if (res.status === 204) return options.response.parse(undefined)
  const parsed = options.response.safeParse(json)
  if (!parsed.success) {
    console.error('Response did not match its contract', url, parsed.error.issues)
    throw new ApiError(res.status, 'BAD_RESPONSE', 'The server answered in an unexpected way.')
  }
  return parsed.data
}

function safeJson(text: string): unknown {
  try {
    return JSON.parse(text)
  } catch {
    return undefined
  }
}

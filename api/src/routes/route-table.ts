import type { RequestHandler } from 'express'
import type { Role } from '@shared/auth/roles'
import { forbidden, unauthenticated } from '../errors'

/**
 * Who may call a route: anyone, any signed-in user, or a list of roles.
 * Every route declares this; `tests/api/role-matrix.test.ts` walks the table.
 */
export type Access = 'public' | 'signed-in' | readonly Role[]

export interface RouteSpec {
  method: 'get' | 'post' | 'patch' | 'put' | 'delete'
  /** Full path under the app, e.g. `/api/users/:userId`. */
  path: string
  access: Access
  /**
   * Served before the session is loaded (public GETs only): answers even when the session store —
   * PostgreSQL — is down. `/api/health` needs this to report the database.
   */
  sessionless?: true
  /** Extra middleware run after the access check (rate limits, uploads). */
  before?: RequestHandler[]
  handler: RequestHandler
}

/** True when `role` (undefined: anonymous) may call a route with `access`. */
export function isAllowed(access: Access, role: Role | undefined): boolean {
  if (access === 'public') return true
  if (role === undefined) return false
  return access === 'signed-in' || access.includes(role)
}

/** The guard mounted in front of every route: 401 for anonymous, 403 for a role not listed. */
export function requireAccess(access: Access): RequestHandler {
  return (req, _res, next) => {
    if (access === 'public') return next()
    if (!req.isAuthenticated()) return next(unauthenticated())
    next(isAllowed(access, req.user.role) ? undefined : forbidden())
  }
}

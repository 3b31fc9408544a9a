import { and, eq, gte, sql } from 'drizzle-orm'
import type { Request } from 'express'
import type { SessionData, Store } from 'express-session'
import type { Db } from './db'
import { session, users } from './db/schema'
import type { UserRow } from './services/users'

/** Sessions whose last touch is remembered (the oldest are forgotten first; a forgotten one is touched again). */
const REMEMBERED = 10_000

/**
 * Touches of a session (the rolling expiry written back to the store after every request that did
 * not change it) at most once per `intervalMs` per session. A signed-in browser makes many requests
 * a minute; writing its expiry back on each costs an UPDATE per request for a 12-hour window that
 * moves by seconds. The stored expiry lags the cookie's by at most `intervalMs`. A destroyed
 * session is forgotten, so a new session under the same id is touched at once.
 *
 * The response does not wait for the UPDATE (express-session holds it back until the touch calls
 * back): the touch is reported done at once and written meanwhile. A touch that fails is passed to
 * `onError` and forgotten, so the session's next request tries again; at worst the stored expiry
 * lags by one more interval, well inside the 12 hours.
 */
export function throttleTouch<S extends Store>(store: S, intervalMs: number, onError: (err: unknown) => void = () => {}): S {
  const touch = store.touch?.bind(store)
  if (!touch) return store
  const last = new Map<string, number>()
  store.touch = (sid, session, callback) => {
    const now = Date.now()
    const at = last.get(sid)
    if (at !== undefined && now - at < intervalMs) {
      callback?.()
      return
    }
    last.delete(sid)
    last.set(sid, now)
    if (last.size > REMEMBERED) last.delete(last.keys().next().value!)
    // Stores call back with the error, though express-session's type says no argument.
    const done = (err?: unknown) => {
      if (!err) return
      if (last.get(sid) === now) last.delete(sid)
      onError(err)
    }
    touch(sid, session, done as () => void)
    callback?.()
  }
  const destroy = store.destroy.bind(store)
  store.destroy = (sid, callback) => {
    last.delete(sid)
    destroy(sid, callback)
  }
  return store
}

/** The signed-in user's row, read with the session (undefined: none was read, null: no such user). */
const USER_ROW = Symbol('backsight.sessionUserRow')
const rowsOfRequests = new WeakMap<Request, UserRow | null>()

/**
 * Reads a session and its user's row in one query: every request of a signed-in browser needs both,
 * and each round trip to the database waits for a turn of a busy event loop on its way back.
 * `get` carries the row beside the session data (a symbol, so express-session neither copies nor
 * saves it); `createSession` moves it onto the request, where `userRowOfRequest` takes it for
 * Passport's deserializeUser. Nothing outlives the request, so a role change or a deactivation
 * takes effect on the next request exactly as with a query of its own. Expiry, as connect-pg-simple
 * reads it: a session whose `expire` is past is not found.
 */
export function readUserWithSession<S extends Store>(store: S, db: Db): S {
  store.get = (sid, callback) => {
    const userId = sql`case when (${session.sess} -> 'passport' ->> 'user') ~ '^[0-9]{1,9}$' then (${session.sess} -> 'passport' ->> 'user')::int end`
    db.select({ sess: session.sess, user: users })
      .from(session)
      .leftJoin(users, eq(users.id, userId))
      .where(and(eq(session.sid, sid), gte(session.expire, sql`to_timestamp(${Date.now() / 1000})`)))
      .then(([row]) => {
        if (!row) return callback(null, null)
        const sess = (typeof row.sess === 'string' ? JSON.parse(row.sess) : row.sess) as SessionData & { [USER_ROW]?: UserRow | null }
        const signedIn = (sess as { passport?: { user?: unknown } }).passport?.user !== undefined
        if (signedIn) Object.defineProperty(sess, USER_ROW, { value: row.user, enumerable: false })
        callback(null, sess)
      })
      .catch((err: unknown) => callback(err))
  }
  const createSession = store.createSession.bind(store)
  store.createSession = (req, sess) => {
    const row = (sess as { [USER_ROW]?: UserRow | null })[USER_ROW]
    const made = createSession(req, sess)
    if (row !== undefined) rowsOfRequests.set(req as Request, row)
    return made
  }
  return store
}

/**
 * The row of user `id` read with this request's session (taken: a second call reads nothing), or
 * undefined when none was, so the caller queries it itself (a session made during this request).
 */
export function userRowOfRequest(req: Request, id: number): UserRow | null | undefined {
  if (!rowsOfRequests.has(req)) return undefined
  const row = rowsOfRequests.get(req)!
  rowsOfRequests.delete(req)
  if (row && row.id !== id) return undefined
  return row
}

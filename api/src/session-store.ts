import type { Store } from 'express-session'

/** Sessions whose last touch is remembered (the oldest are forgotten first; a forgotten one is touched again). */
const REMEMBERED = 10_000

/**
 * Touches of a session (the rolling expiry written back to the store after every request that did
 * not change it) at most once per `intervalMs` per session. A signed-in browser makes many requests
 * a minute; writing its expiry back on each costs an UPDATE per request for a 12-hour window that
 * moves by seconds. The stored expiry lags the cookie's by at most `intervalMs`. A destroyed
 * session is forgotten, so a new session under the same id is touched at once.
 */
export function throttleTouch<S extends Store>(store: S, intervalMs: number): S {
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
    touch(sid, session, callback)
  }
  const destroy = store.destroy.bind(store)
  store.destroy = (sid, callback) => {
    last.delete(sid)
    destroy(sid, callback)
  }
  return store
}

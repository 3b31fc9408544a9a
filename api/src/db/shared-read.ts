/**
 * Concurrent callers of the same read share queries, without ever getting an answer older than
 * their call: a caller gets the result of a query sent after it called (never one already on its
 * way, which could predate a change the caller has seen committed). At most one query per key is
 * out at a time; the callers that arrive meanwhile share the next one. Used for the small reads
 * every request makes (the analytics data version, the firm's settings).
 */
interface Reads<T> {
  /** The query on its way to the server. */
  inFlight?: Promise<T>
  /** The one query every caller that arrived while `inFlight` was out will share. */
  next?: Promise<T>
}

export function sharedRead<K extends object, T>(read: (key: K) => Promise<T>): (key: K) => Promise<T> {
  const states = new WeakMap<K, Reads<T>>()
  return key => {
    let state = states.get(key)
    if (!state) states.set(key, (state = {}))
    const s = state
    const send = () => {
      const p = read(key)
      s.inFlight = p
      const clear = () => {
        if (s.inFlight === p) s.inFlight = undefined
      }
      p.then(clear, clear)
      return p
    }
    if (!s.inFlight) return send()
    if (!s.next) {
      const after = s.inFlight
      s.next = after
        .catch(() => undefined)
        .then(() => {
          s.next = undefined
          // A query sent after `after` settled was sent after every caller of `next` arrived.
          return s.inFlight && s.inFlight !== after ? s.inFlight : send()
        })
    }
    return s.next
  }
}

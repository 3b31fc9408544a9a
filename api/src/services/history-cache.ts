import { calibrationVersion } from '../db/calibration'
import type { Db } from '../db'
import { NotKept, answersMayLag, freshOrRecent, inBackground, noteStale, versionScope } from './answer-freshness'

interface Entry<T> {
  version: number
  value: Promise<T>
  /** Starts the computation if it has not started (it may wait its turn in the background). */
  start: () => Promise<T>
  started: () => boolean
  done: boolean
  failed: boolean
  /** The last settled value of an earlier version: the fallback while this one is built. */
  previous?: { version: number; value: Promise<T> }
}

/**
 * One value computed from the whole history (the past frames laid out for ranking, the benchmark
 * project list), kept per database until the history changes. It is keyed by the history's data
 * version (`calibration_state.version`, bumped by every import, review resolution, draft save and
 * project edit), so a value is never older than the data — except as the documented fallback of a
 * request while the next version's value is built (see answer-freshness.ts): the previous value is
 * kept for that until the new one has settled.
 */
export function historyCache<T>() {
  const entries = new WeakMap<Db, Entry<T>>()
  let jobs = 0
  const markSettled = (e: Entry<T>, failed: boolean) => {
    e.done = !failed
    e.failed = failed
    // Settled: the previous value has served its turn (a computation for the previous version that
    // still wants it finds it gone, see NotKept, and waits for the new one instead).
    if (!failed) e.previous = undefined
  }
  return async function cached(db: Db, compute: () => Promise<T>): Promise<T> {
    const scope = versionScope()
    const known = entries.get(db)
    if (scope && known) {
      // A computation waits for what it needs, so it starts it rather than wait for its turn.
      if (known.version === scope.version && !known.failed) return known.start()
      if (known.previous?.version === scope.version) return known.previous.value
    }
    if (scope?.fallback) throw new NotKept('A history value')
    const v = await calibrationVersion(db)
    let e = entries.get(db)
    if (!e || e.version !== v || e.failed) {
      const before = e
      const previous = before?.done ? { version: before.version, value: before.value } : before?.previous
      let started: Promise<T> | undefined
      let settle!: (p: Promise<T>) => void
      const value = new Promise<T>(resolve => {
        settle = resolve
      })
      const next: Entry<T> = {
        version: v,
        value,
        start: () => {
          if (!started) {
            started = compute()
            settle(started)
          }
          return value
        },
        started: () => started !== undefined,
        done: false,
        failed: false,
        previous,
      }
      value.then(
        () => markSettled(next, false),
        () => markSettled(next, true),
      )
      entries.set(db, next)
      // With a previous value to answer from meanwhile, the new one is computed in the background,
      // in turn with the other catching-up work (see answer-freshness.ts); otherwise now.
      if (previous && !scope && answersMayLag(db)) inBackground(db, `history|${++jobs}`, 'build', () => true, next.start)
      else void next.start()
      e = next
    }
    if (scope) return e.start()
    if (e.done || !e.previous) return e.value
    const previous = e.previous
    // Still waiting its turn: no point in waiting the grace for it.
    if (!e.started()) {
      noteStale(previous.version, e.version)
      return previous.value
    }
    return freshOrRecent(db, e.value, () => previous.value, previous.version, e.version)
  }
}

/**
 * `read` chained per database: each call starts from the latest read before it (at whatever
 * version; undefined when there is none or it failed), the base a delta read merges into.
 */
export function fromLastRead<T>(read: (db: Db, base: T | undefined) => Promise<T>): (db: Db) => Promise<T> {
  const last = new WeakMap<Db, Promise<T>>()
  return db => {
    const prev = last.get(db)
    const load = (async () => read(db, prev ? await prev.catch(() => undefined) : undefined))()
    last.set(db, load)
    return load
  }
}

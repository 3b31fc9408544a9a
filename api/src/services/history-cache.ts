import { calibrationVersion } from '../db/calibration'
import type { Db } from '../db'

/**
 * Answers computed from the whole history, kept until the history changes. The key is the
 * history's data version (`calibration_state.version`, bumped by every import, review resolution,
 * draft save and project edit), so a cached answer is never older than the data.
 */
export function historyCache<T>(maxEntries = 64) {
  let version = -1
  const entries = new Map<string, Promise<T>>()
  return async function cached(db: Db, key: string, compute: () => Promise<T>): Promise<T> {
    const v = await calibrationVersion(db)
    if (v !== version) {
      version = v
      entries.clear()
    }
    let hit = entries.get(key)
    if (!hit) {
      if (entries.size >= maxEntries) entries.delete(entries.keys().next().value!)
      hit = compute()
      entries.set(key, hit)
      // A failed computation is not kept.
      hit.catch(() => entries.delete(key))
    }
    return hit
  }
}

import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { refreshCalibrationPairs } from '../../api/src/db/calibration'
import { CACHE_BUDGET, cached, cacheStats, phaseData } from '../../api/src/services/calibration/store'
import { createTestDb, type TestDb } from '../helpers/db'

// The analytics answer cache: one computation per (data version, key) even when the first
// requests arrive together, a fresh one after the data changes, and never more than its budget.

let t: TestDb
beforeAll(async () => {
  t = await createTestDb()
})
afterAll(() => t.drop())

describe('analytics answer cache', () => {
  it('shares one computation between concurrent first requests, and recomputes after a version bump', async () => {
    let runs = 0
    const compute = async (version: number) => {
      runs++
      await new Promise(r => setTimeout(r, 20))
      return { version, run: runs }
    }
    const answers = await Promise.all(Array.from({ length: 8 }, () => cached(t.db, 'shared', compute)))
    expect(runs).toBe(1)
    expect(new Set(answers).size).toBe(1)
    const v1 = answers[0]!.version
    // Cached: no new computation.
    expect(await cached(t.db, 'shared', compute)).toBe(answers[0])
    expect(runs).toBe(1)
    // The data changes: the next request computes again, at the new version.
    const v2 = await refreshCalibrationPairs(t.db)
    expect(v2).toBe(v1 + 1)
    const after = await Promise.all([cached(t.db, 'shared', compute), cached(t.db, 'shared', compute)])
    expect(runs).toBe(2)
    expect(after[0]).toEqual({ version: v2, run: 2 })
    expect(after[1]).toBe(after[0])
  })

  it('loads a phase once for concurrent first requests, again after a version bump', async () => {
    const [a, b, c] = await Promise.all([phaseData(t.db, 'sd'), phaseData(t.db, 'sd'), phaseData(t.db, 'sd')])
    expect(b).toBe(a)
    expect(c).toBe(a)
    await refreshCalibrationPairs(t.db)
    const d = await phaseData(t.db, 'sd')
    expect(d).not.toBe(a)
    expect(d.version).toBe(a.version + 1)
  })

  it('does not keep a failed computation', async () => {
    let runs = 0
    const failing = async () => {
      runs++
      throw new Error('boom')
    }
    await expect(cached(t.db, 'failing', failing)).rejects.toThrow('boom')
    await expect(cached(t.db, 'failing', failing)).rejects.toThrow('boom')
    expect(runs).toBe(2)
  })

  it('stays within its byte budget, least recently used first out', async () => {
    const eighth = CACHE_BUDGET / 8
    const size = () => eighth
    for (let i = 0; i < 20; i++) await cached(t.db, `big-${i}`, async () => i, size)
    const stats = cacheStats(t.db)!
    expect(stats.bytes).toBeLessThanOrEqual(CACHE_BUDGET)
    // 8 entries of an eighth fill the budget exactly; the small ones from the tests above were the oldest.
    expect(stats.entries).toBe(8)
    let runs = 0
    // The newest is kept; the first big one left.
    expect(await cached(t.db, 'big-19', async () => (runs++, -1), size)).toBe(19)
    expect(await cached(t.db, 'big-0', async () => (runs++, -1), size)).toBe(-1)
    expect(runs).toBe(1)
    // An answer larger than a quarter of the budget is served but not kept.
    await cached(t.db, 'huge', async () => 'x', () => CACHE_BUDGET / 2)
    expect(await cached(t.db, 'huge', async () => 'again', () => CACHE_BUDGET / 2)).toBe('again')
  })
})

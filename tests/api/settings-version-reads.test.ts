import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { CalibrationFilters } from '@shared/schemas/calibration'
import { calibrationMisses, calibrationOptions, calibrationSummary, startingFactors } from '../../api/src/services/calibration/answers'
import { calibrationVersion, refreshCalibrationPairs } from '../../api/src/db/calibration'
import { cached, cachedWith } from '../../api/src/services/calibration/store'
import { StartingFactorsQuery } from '@shared/schemas/calibration'
import { createTestApp, type TestApp } from '../helpers/app'
import { handProject, loadHandProjects } from '../helpers/hand-history'

// An analytics answer whose key depends on a firm setting reads that setting and the data version
// at the same time (cachedWith): one database round trip for the request to wait for, not two one
// after the other. Both reads are sent after the request's call, so an answer never predates a
// change committed before it was asked for.

let t: TestApp
beforeAll(async () => {
  t = await createTestApp()
  await loadHandProjects(t.db.db, [handProject('READS-1', { name: 'Reads one' }), handProject('READS-2', { name: 'Reads two', stories: 3 })])
  await refreshCalibrationPairs(t.db.db)
}, 60_000)
afterAll(async () => t.close())

interface Sent {
  text: string
  sentAt: number
  doneAt?: number
}

/** Every query the pool is asked while `fn` runs, with the order it was sent and answered in. */
async function queriesDuring(fn: () => Promise<unknown>): Promise<Sent[]> {
  const pool = t.db.pool as unknown as { query: (...a: unknown[]) => unknown }
  const query = pool.query
  const seen: Sent[] = []
  let clock = 0
  pool.query = function (this: unknown, ...a: unknown[]) {
    const q = a[0] as string | { text: string }
    const s: Sent = { text: typeof q === 'string' ? q : q.text, sentAt: clock++ }
    seen.push(s)
    const out = query.apply(this, a) as Promise<unknown>
    void out.then(
      () => (s.doneAt = clock++),
      () => (s.doneAt = clock++),
    )
    return out
  }
  try {
    await fn()
  } finally {
    pool.query = query
  }
  return seen
}

const filters = CalibrationFilters.parse({})
const cases: [string, () => Promise<unknown>][] = [
  ['summary', () => calibrationSummary(t.db.db, filters, 'beta', 'supplier')],
  ['misses', () => calibrationMisses(t.db.db, filters, 'beta', { sort: 'ratio', dir: 'asc', limit: 25 })],
  ['starting factors', () => startingFactors(t.db.db, StartingFactorsQuery.parse({}))],
  ['options', () => calibrationOptions(t.db.db)],
]

describe('settings and data version read together', () => {
  for (const [name, ask] of cases) {
    it(`${name}: the version query goes out before the settings query is answered`, async () => {
      await ask() // computed and cached; the second asking only reads what the key depends on
      const qs = await queriesDuring(ask)
      const version = qs.filter(q => /from calibration_state/.test(q.text))
      const settings = qs.filter(q => /from "firm_settings"/.test(q.text))
      expect(version).toHaveLength(1)
      expect(settings.length).toBeGreaterThanOrEqual(1)
      for (const s of settings) expect(version[0]!.sentAt).toBeLessThan(s.doneAt!)
      // Nothing else: the answer came from the cache.
      expect(qs).toHaveLength(version.length + settings.length)
    })
  }
})

describe('cachedWith when the data changes during the settings read', () => {
  it('answers at the newer version (the store it read first was superseded meanwhile)', async () => {
    const before = await calibrationVersion(t.db.db)
    let release!: (v: string) => void
    const first = new Promise<string>(ok => (release = ok))
    const answer = cachedWith(t.db.db, first, a => `probe|${a}`, async (_a, version) => version, () => 8)
    // Let its version read come back, then change the data and have another request see it.
    for (let i = 0; i < 20; i++) await new Promise(r => setTimeout(r, 5))
    await t.db.pool.query('update calibration_state set version = version + 1 where id = 1')
    expect(await cached(t.db.db, 'probe|other', async version => version, () => 8)).toBe(before + 1)
    release('settings')
    expect(await answer).toBe(before + 1)
  })
})

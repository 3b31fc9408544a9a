import { gunzipSync } from 'node:zlib'
import { tableFromIPC } from 'apache-arrow'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { refreshCalibrationPairs } from '../../api/src/db/calibration'
import { loadBenchmarkProjects } from '../../api/src/services/benchmarks'
import { analyticsReady, cacheStats, phaseData } from '../../api/src/services/calibration/store'
import { selection } from '../../api/src/services/calibration/derived'
import { dropStartingStats } from '../../api/src/services/calibration/starting-index'
import { warmCode, warmFilterShapes } from '../../api/src/services/code-warm-up'
import { calibrationSummary, pointsBody, startingFactors } from '../../api/src/services/calibration/answers'
import { benchmarks } from '../../api/src/services/benchmarks'
import { BenchmarkQuery } from '@shared/schemas/benchmarks'
import { CalibrationFilters, StartingFactorsQuery } from '@shared/schemas/calibration'
import { searchPrecedents } from '../../api/src/services/precedents'
import { warmUp } from '../../api/src/services/warm-up'
import { openDb } from '../../api/src/db'
import { createTestApp, type TestApp } from '../helpers/app'
import { handProject, loadHandProjects } from '../helpers/hand-history'
import { PrecedentSearchBody } from '@shared/schemas/precedents'
import { DEFAULT_VIEW_STATE } from '../../dashboard/src/utils/calibration-query'

// Own file: the precedent and benchmark lists are kept per data version in their modules.

let t: TestApp

beforeAll(async () => {
  t = await createTestApp()
  await loadHandProjects(t.db.db, [handProject('WARM-1', { name: 'Warm one', building_use: 'office', aisc341_edition: '341-16' }), handProject('WARM-2', { name: 'Warm two', stories: 3, building_use: 'office' })])
  await refreshCalibrationPairs(t.db.db)
}, 60_000)

afterAll(async () => {
  await t.close()
})

describe('server warm-up', () => {
  it('builds the analytics columns, the precedent list and the benchmark list before the first request', async () => {
    expect(analyticsReady(t.db.db)).toBe(false)
    const logged: string[] = []
    const times = await warmUp(t.db.db, m => logged.push(m))
    expect(logged).toEqual([])
    expect(analyticsReady(t.db.db)).toBe(true)
    for (const ms of Object.values(times)) expect(ms).toBeGreaterThanOrEqual(0)

    // A name changed behind the data version's back (no import, no bump) shows which lists were
    // built by the warm-up: the kept ones still carry the old name.
    await t.db.pool.query(`update projects set name = 'Renamed behind the version' where code = 'WARM-1'`)
    const search = await searchPrecedents(t.db.db, PrecedentSearchBody.parse({ description: { storyShear: 300, stories: 2, configuration: 'inverted_v' }, limit: 5 }))
    expect(search.candidates).toBe(2)
    expect(search.matches.map(m => m.name).sort()).toEqual(['Warm one', 'Warm two'])
    const listed = await loadBenchmarkProjects(t.db.db)
    expect(listed.map(p => p.name).sort()).toEqual(['Warm one', 'Warm two'])
  })

  it('leaves the answers the screens open with in the answer cache, and only those', async () => {
    const before = cacheStats(t.db.db)!
    // 1 options + 1 cost (+ its tonnage) + 1 starting factors + 7 quantities × (trend, misses, 5 groupings)
    // + the opening view's point set + 2 audiences × 5 groupings × 2 units
    expect(before.entries).toBe(1 + 2 + 1 + 7 * 7 + 1 + 2 * 5 * 2)
    // An opening answer is served from the cache (no entry added); a filtered one is computed.
    await calibrationSummary(t.db.db, CalibrationFilters.parse({}), 'cmax', 'supplier')
    // The braces chart as the dashboard first asks for it: its default view, Arrow, gzipped.
    const opening = DEFAULT_VIEW_STATE
    const pts = await pointsBody(t.db.db, CalibrationFilters.parse(opening.filters), opening.quantity, opening.groupBy, { arrow: true, gzip: true })
    expect(tableFromIPC(gunzipSync(pts.body)).numRows).toBeGreaterThan(0)
    await benchmarks(t.db.db, BenchmarkQuery.parse({ groupBy: 'sdc', units: 'si' }), 'bd')
    expect(cacheStats(t.db.db)!.entries).toBe(before.entries)
    await calibrationSummary(t.db.db, CalibrationFilters.parse({ supplier: 'ZZ' }), 'cmax', 'supplier')
    expect(cacheStats(t.db.db)!.entries).toBe(before.entries + 1)
  })

  it('compiles filtered answers without keeping any of them (no cached answer, no kept starting stats)', async () => {
    const d = await phaseData(t.db.db, 'sd')
    const shapes = warmFilterShapes(d)
    // Every filter of the review appears in some shape; here each shape but the all-together one selects braces.
    const fields = new Set(shapes.flatMap(f => Object.keys(f)))
    for (const field of Object.keys(CalibrationFilters.shape).filter(k => k !== 'phase')) expect(fields, field).toContain(field)
    for (const f of shapes.slice(0, -1)) expect(selection(d, f).rows.length, JSON.stringify(f)).toBeGreaterThan(0)
    dropStartingStats(d)
    const before = cacheStats(t.db.db)!
    const computed = await warmCode(t.db.db)
    // 9 shapes × (5 summaries + trend + misses + cost + points + starting factors)
    expect(computed).toBe(shapes.length * 10)
    expect(cacheStats(t.db.db)).toEqual(before)
    expect(dropStartingStats(d).entries).toBe(0)
    // The same starting-factor answer outside withoutKeptStats keeps its group's stats.
    await startingFactors(t.db.db, StartingFactorsQuery.parse({ quantile: 0.5, yearFrom: 1990 }))
    expect(dropStartingStats(d).entries).toBe(1)
  })

  it('logs a failure of each part and does not throw when the database is gone', async () => {
    const gone = openDb('postgres://postgres@127.0.0.1:1/none', { max: 1 })
    const logged: string[] = []
    await warmUp(gone.db, m => logged.push(m))
    expect(logged.map(m => m.split(':')[0])).toEqual(['analytics warm-up failed', 'precedent warm-up failed', 'benchmark warm-up failed'])
    await gone.close()
  }, 30_000)
})

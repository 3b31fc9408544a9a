import type {
  CalibrationCost,
  CalibrationFilters,
  CalibrationGrouping,
  CalibrationMiss,
  CalibrationOptions,
  CalibrationQuantity,
  CalibrationSummary,
  CalibrationTrend,
  MISS_SORTS,
  StartingFactors,
  StartingFactorsQuery,
} from '@shared/schemas/calibration'
import { STARTING_CAUTIONS, type TonnageByCategory } from '@shared/calibration'
import type { Db } from '../../db'
import { poolOf } from '../../db/calibration'
import { bodyEtag, gzipWhole } from '../body-encoding'
import { getSizingDefaults } from '../settings'
import { getCalibrationSettings } from './settings'
import { costAnswer, missesAnswer, pointRowsOf, startingAnswer, summaryAnswer, trendAnswer, type PointRows } from './derived'
import { pointsArrow, pointsJson } from './points'
import { cached, cachedWith, jsonBytes, phaseData, READS_DATABASE } from './store'

/*
 * The analytics answers: each is computed once per data version and query (the answer cache of
 * store.ts) from the phase's columns and the per-version structures of derived.ts.
 */

export type { PointRows } from './derived'

/** A point set as sent: Arrow IPC or JSON, gzipped or not, with its ETag. */
export interface PointsBody {
  body: Buffer
  etag: string
}

/**
 * GET /api/calibration/points' body, encoded once per data version, form and encoding. Point sets
 * run to megabytes: the body is kept gzipped rather than compressed on every request (the
 * compression middleware leaves an already-encoded body alone), and its ETag with it (Express would
 * otherwise hash the megabytes again for every response).
 */
export function pointsBody(db: Db, filters: CalibrationFilters, quantity: CalibrationQuantity, groupBy: CalibrationGrouping, form: { arrow: boolean; gzip: boolean }): Promise<PointsBody> {
  return cached(
    db,
    `points|${form.arrow ? 'arrow' : 'json'}|${form.gzip ? 'gzip' : 'identity'}|${JSON.stringify([filters, { quantity, groupBy }])}`,
    async () => {
      const pts = await pointRows(db, filters, quantity, groupBy)
      const raw = form.arrow ? Buffer.from(pointsArrow(pts)) : Buffer.from(JSON.stringify(pointsJson(pts)))
      // Fastest level, as the compression middleware and sendCachedJson use; off the event loop and in
      // one piece (gzipWhole), since a set of 250,000 points takes ~0.1 s to compress even so.
      const body = form.gzip ? await gzipWhole(raw) : raw
      return { body, etag: bodyEtag(body) }
    },
    b => b.body.length,
  )
}

/** The filtered rows that carry `quantity`, with their group labels. */
export async function pointRows(db: Db, filters: CalibrationFilters, quantity: CalibrationQuantity, groupBy: CalibrationGrouping): Promise<PointRows> {
  return pointRowsOf(await phaseData(db, filters.phase), filters, quantity, groupBy)
}

const key = (name: string, ...parts: unknown[]) => `${name}|${JSON.stringify(parts)}`

/** GET /api/calibration/options */
export async function calibrationOptions(db: Db): Promise<CalibrationOptions> {
  const read = Promise.all([getCalibrationSettings(db), getSizingDefaults(db)])
  return cachedWith(db, read, ([settings, sizing]) => key('options', settings, sizing.stiffnessTolerance), async ([settings, sizing]) => {
    const [row] = (
      await poolOf(db).query(`
        with p as (select distinct project_id, supplier_code, building_use, sdc, aisc341_edition, office, stories, year_designed from calibration_pairs where phase = 'sd')
        select
          coalesce((select json_agg(json_build_object('code', s.code, 'name', s.display_name) order by s.code) from suppliers s where s.code in (select supplier_code from p)), '[]') as suppliers,
          coalesce((select json_agg(distinct building_use) from p where building_use is not null), '[]') as uses,
          coalesce((select json_agg(distinct sdc) from p where sdc is not null), '[]') as sdcs,
          coalesce((select json_agg(distinct aisc341_edition) from p where aisc341_edition is not null), '[]') as editions,
          coalesce((select json_agg(distinct configuration) from calibration_pairs where phase = 'sd'), '[]') as configurations,
          coalesce((select json_agg(distinct office) from p where office is not null), '[]') as offices,
          (select min(year_designed) from p) as year_min, (select max(year_designed) from p) as year_max,
          (select min(stories) from p) as stories_min, (select max(stories) from p) as stories_max,
          (select count(*) from calibration_pairs where phase = 'sd')::int as pairs`)
    ).rows as Record<string, unknown>[]
    const r = row!
    const sorted = (v: unknown) => (v as string[]).slice().sort()
    return {
      suppliers: r.suppliers as { code: string; name: string }[],
      uses: sorted(r.uses),
      sdcs: sorted(r.sdcs),
      codeEditions: sorted(r.editions),
      configurations: sorted(r.configurations),
      offices: sorted(r.offices),
      years: r.year_min === null ? null : { min: Number(r.year_min), max: Number(r.year_max) },
      stories: r.stories_min === null ? null : { min: Number(r.stories_min), max: Number(r.stories_max) },
      pairs: Number(r.pairs),
      stiffnessTolerance: sizing.stiffnessTolerance,
      minGroupSize: settings.minGroupSize,
    }
  }, jsonBytes, READS_DATABASE)
}

/** GET /api/calibration/summary */
export async function calibrationSummary(db: Db, filters: CalibrationFilters, quantity: CalibrationQuantity, groupBy: CalibrationGrouping): Promise<CalibrationSummary> {
  return cachedWith(
    db,
    getSizingDefaults(db).then(s => s.stiffnessTolerance),
    tolerance => key('summary', filters, quantity, groupBy, tolerance),
    async tolerance => summaryAnswer(await phaseData(db, filters.phase), filters, quantity, groupBy, tolerance),
  )
}

/** GET /api/calibration/trend — by year designed and basis. */
export async function calibrationTrend(db: Db, filters: CalibrationFilters, quantity: CalibrationQuantity): Promise<CalibrationTrend> {
  return cached(db, key('trend', filters, quantity), async () => trendAnswer(await phaseData(db, filters.phase), filters, quantity))
}

/** Misses: strength-side quantities, braces whose final exceeded the assumption; the stiffness factor, braces outside the band. */
export async function calibrationMisses(db: Db, filters: CalibrationFilters, quantity: CalibrationQuantity, q: { sort: (typeof MISS_SORTS)[number]; dir: 'asc' | 'desc'; limit: number }): Promise<CalibrationMiss[]> {
  return cachedWith(
    db,
    getSizingDefaults(db).then(s => s.stiffnessTolerance),
    tolerance => key('misses', filters, quantity, q, tolerance),
    async tolerance => missesAnswer(await phaseData(db, filters.phase), filters, quantity, q, tolerance),
  )
}

/** Preliminary and final tonnage per project (cached per data version). */
export async function tonnageByProject(db: Db): Promise<Map<number, { preliminary: TonnageByCategory; final: TonnageByCategory }>> {
  return cached(db, key('tonnage'), async () => {
    const { rows } = await poolOf(db).query<{ project_id: number; stage: 'preliminary' | 'final'; category: keyof TonnageByCategory; tons: number }>(
      `select t.project_id, t.stage::text as stage, t.category::text as category, t.tons_short as tons from tonnage t where t.project_id in (select distinct project_id from calibration_pairs)`,
    )
    const m = new Map<number, { preliminary: TonnageByCategory; final: TonnageByCategory }>()
    for (const r of rows) {
      const e: { preliminary: TonnageByCategory; final: TonnageByCategory } = m.get(r.project_id) ?? m.set(r.project_id, { preliminary: {}, final: {} }).get(r.project_id)!
      e[r.stage][r.category] = r.tons
    }
    return m
  }, m => m.size * 200, READS_DATABASE)
}

/** GET /api/calibration/cost */
export async function calibrationCost(db: Db, filters: CalibrationFilters): Promise<CalibrationCost> {
  return cached(db, key('cost', filters), async () => {
    const d = await phaseData(db, filters.phase)
    return costAnswer(d, filters, await tonnageByProject(db))
  })
}

/** GET /api/starting-factors */
export async function startingFactors(db: Db, query: StartingFactorsQuery): Promise<StartingFactors> {
  return cachedWith(db, getCalibrationSettings(db), settings => key('starting', query, settings), async settings => {
    const { suggestions, backtest: backtests } = startingAnswer(await phaseData(db, 'sd'), query, settings)
    const over = suggestions.find(s => s.quantity === 'overstrength')
    const sizing = await getSizingDefaults(db)
    const fallback = sizing.capacityBasis.kind === 'yieldRange' ? sizing.capacityBasis.fyscMax : 46
    return {
      quantile: query.quantile,
      minGroupSize: settings.minGroupSize,
      habitYears: settings.habitYears,
      suggestions,
      capacityBasis: { kind: 'yieldRange' as const, fyscMax: over ? over.suggested : fallback },
      backtest: backtests,
      cautions: [...STARTING_CAUTIONS],
    }
  })
}

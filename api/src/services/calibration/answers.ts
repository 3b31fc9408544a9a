import {
  STARTING_QUANTITIES,
  type CalibrationCost,
  type CalibrationFilters,
  type CalibrationGrouping,
  type CalibrationMiss,
  type CalibrationOptions,
  type CalibrationQuantity,
  type CalibrationSummary,
  type CalibrationTrend,
  type StartingFactors,
  type StartingFactorsQuery,
  type StartingSuggestion,
  QUANTITY_INFO,
  MISS_SORTS,
} from '@shared/schemas/calibration'
import { backtest, costOfConservatism, histogramBins, quantileOfSorted, sortedCopy, suggestStarting, summarizeRatios, yearBand, STARTING_CAUTIONS, type FactorColumns, type TonnageByCategory } from '@shared/calibration'
import type { Db } from '../../db'
import { poolOf } from '../../db/calibration'
import { getSizingDefaults } from '../settings'
import { getCalibrationSettings } from './settings'
import { cached, phaseData, selectRows, type PhaseData } from './store'

/** Points of one quantity: row indices with a value, plus the group label of each. */
export interface PointRows {
  data: PhaseData
  quantity: CalibrationQuantity
  rows: Int32Array
  /** Group label code per point (into `groups`). */
  group: Int32Array
  groups: string[]
}

const NOT_STATED: Record<Exclude<CalibrationGrouping, 'none' | 'yearBand'>, string> = { supplier: 'supplier not stated', configuration: 'configuration not stated', office: 'office not stated' }

function groupLabeller(d: PhaseData, by: CalibrationGrouping): (row: number) => string {
  const p = d.projects
  switch (by) {
    case 'supplier':
      return r => p.supplier[d.project[r]!] ?? NOT_STATED.supplier
    case 'office':
      return r => p.office[d.project[r]!] ?? NOT_STATED.office
    case 'configuration':
      return r => d.configuration.values[d.configuration.codes[r]!]!
    case 'yearBand':
      return r => yearBand(p.yearDesigned[d.project[r]!] ?? null)
    case 'none':
      return () => 'all braces'
  }
}

/** The filtered rows that carry `quantity`, with their group labels. */
export async function pointRows(db: Db, filters: CalibrationFilters, quantity: CalibrationQuantity, groupBy: CalibrationGrouping): Promise<PointRows> {
  const data = await phaseData(db, filters.phase)
  const all = selectRows(data, filters)
  const basis = data.q[quantity].basis
  const rows = new Int32Array(all.length)
  const group = new Int32Array(all.length)
  const groups: string[] = []
  const index = new Map<string, number>()
  const label = groupLabeller(data, groupBy)
  let m = 0
  for (let k = 0; k < all.length; k++) {
    const r = all[k]!
    if (basis[r]! < 0) continue
    const g = label(r)
    let c = index.get(g)
    if (c === undefined) {
      c = groups.length
      groups.push(g)
      index.set(g, c)
    }
    rows[m] = r
    group[m++] = c
  }
  return { data, quantity, rows: rows.subarray(0, m), group: group.subarray(0, m), groups }
}

const key = (name: string, ...parts: unknown[]) => `${name}|${JSON.stringify(parts)}`

/** GET /api/calibration/options */
export async function calibrationOptions(db: Db): Promise<CalibrationOptions> {
  const settings = await getCalibrationSettings(db)
  const sizing = await getSizingDefaults(db)
  return cached(db, key('options', settings, sizing.stiffnessTolerance), async () => {
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
  })
}

/** GET /api/calibration/summary */
export async function calibrationSummary(db: Db, filters: CalibrationFilters, quantity: CalibrationQuantity, groupBy: CalibrationGrouping): Promise<CalibrationSummary> {
  const tolerance = (await getSizingDefaults(db)).stiffnessTolerance
  return cached(db, key('summary', filters, quantity, groupBy, tolerance), async () => {
    const pts = await pointRows(db, filters, quantity, groupBy)
    const col = pts.data.q[quantity]
    const byGroup = new Map<string, number[]>()
    const byBasis = new Map<number, number[]>()
    let min = Infinity
    let max = -Infinity
    for (let k = 0; k < pts.rows.length; k++) {
      const r = pts.rows[k]!
      const ratio = col.assumed[r]! / col.final[r]!
      const b = col.basis[r]!
      const gk = `${pts.group[k]}|${b}`
      ;(byGroup.get(gk) ?? byGroup.set(gk, []).get(gk)!).push(ratio)
      ;(byBasis.get(b) ?? byBasis.set(b, []).get(b)!).push(ratio)
      if (ratio < min) min = ratio
      if (ratio > max) max = ratio
    }
    const side = QUANTITY_INFO[quantity].side
    if (!pts.rows.length) return { quantity, side, tolerance, groups: [], overall: [] }
    const bins = histogramBins(min, max)
    const groups = [...byGroup.entries()]
      .map(([gk, ratios]) => {
        const [g, b] = gk.split('|').map(Number) as [number, number]
        return summarizeRatios(ratios, { group: pts.groups[g]!, basis: col.bases[b]!, tolerance, bins })
      })
      .sort((a, b) => a.group.localeCompare(b.group) || b.n - a.n)
    const overall = [...byBasis.entries()].map(([b, ratios]) => summarizeRatios(ratios, { group: 'all braces', basis: col.bases[b]!, tolerance, bins })).sort((a, b) => b.n - a.n)
    return { quantity, side, tolerance, groups, overall }
  })
}

/** GET /api/calibration/trend — by year designed and basis. */
export async function calibrationTrend(db: Db, filters: CalibrationFilters, quantity: CalibrationQuantity): Promise<CalibrationTrend> {
  return cached(db, key('trend', filters, quantity), async () => {
    const pts = await pointRows(db, filters, quantity, 'none')
    const col = pts.data.q[quantity]
    const by = new Map<string, number[]>()
    for (const r of pts.rows) {
      const y = pts.data.projects.yearDesigned[pts.data.project[r]!]
      if (y === null || y === undefined) continue
      const k = `${y}|${col.basis[r]}`
      ;(by.get(k) ?? by.set(k, []).get(k)!).push(col.assumed[r]! / col.final[r]!)
    }
    const years = [...by.entries()].map(([k, ratios]) => {
      const [y, b] = k.split('|').map(Number) as [number, number]
      const s = sortedCopy(ratios)
      let under = 0
      for (const v of s) if (v < 1) under++
      return { year: y, basis: col.bases[b]!, n: s.length, q1: quantileOfSorted(s, 0.25), median: quantileOfSorted(s, 0.5), q3: quantileOfSorted(s, 0.75), underestimateRate: under / s.length }
    })
    years.sort((a, b) => a.year - b.year || a.basis.localeCompare(b.basis))
    return { quantity, years }
  })
}

/** Misses: strength-side quantities, braces whose final exceeded the assumption; the stiffness factor, braces outside the band. */
export async function calibrationMisses(db: Db, filters: CalibrationFilters, quantity: CalibrationQuantity, q: { sort: (typeof MISS_SORTS)[number]; dir: 'asc' | 'desc'; limit: number }): Promise<CalibrationMiss[]> {
  const tolerance = (await getSizingDefaults(db)).stiffnessTolerance
  return cached(db, key('misses', filters, quantity, q, tolerance), async () => {
    const pts = await pointRows(db, filters, quantity, 'none')
    const d = pts.data
    const col = d.q[quantity]
    const band = QUANTITY_INFO[quantity].side === 'band'
    const items: CalibrationMiss[] = []
    for (const r of pts.rows) {
      const ratio = col.assumed[r]! / col.final[r]!
      if (band ? Math.abs(ratio - 1) <= tolerance + 1e-12 : ratio >= 1) continue
      const pi = d.project[r]!
      items.push({
        braceId: d.braceId[r]!,
        projectCode: d.projects.code[pi]!,
        projectName: d.projects.name[pi]!,
        frameLine: d.frameLine.values[d.frameLine.codes[r]!]!,
        level: d.level.values[d.level.codes[r]!]!,
        supplier: d.projects.supplier[pi] ?? null,
        yearDesigned: d.projects.yearDesigned[pi] ?? null,
        basis: col.bases[col.basis[r]!]!,
        assumed: col.assumed[r]!,
        final: col.final[r]!,
        ratio,
      })
    }
    const sign = q.dir === 'asc' ? 1 : -1
    const byRatio = (a: CalibrationMiss, b: CalibrationMiss) => a.ratio - b.ratio
    const cmp: Record<(typeof MISS_SORTS)[number], (a: CalibrationMiss, b: CalibrationMiss) => number> = {
      ratio: byRatio,
      project: (a, b) => a.projectCode.localeCompare(b.projectCode) || byRatio(a, b),
      year: (a, b) => (a.yearDesigned ?? 0) - (b.yearDesigned ?? 0) || byRatio(a, b),
      supplier: (a, b) => (a.supplier ?? '').localeCompare(b.supplier ?? '') || byRatio(a, b),
    }
    items.sort((a, b) => sign * cmp[q.sort](a, b) || a.braceId - b.braceId)
    return items.slice(0, q.limit)
  })
}

async function tonnageByProject(db: Db): Promise<Map<number, { preliminary: TonnageByCategory; final: TonnageByCategory }>> {
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
  }, m => m.size * 200)
}

/** GET /api/calibration/cost */
export async function calibrationCost(db: Db, filters: CalibrationFilters): Promise<CalibrationCost> {
  return cached(db, key('cost', filters), async () => {
    const d = await phaseData(db, filters.phase)
    const rows = selectRows(d, filters)
    const tonnage = await tonnageByProject(db)
    const byProject = new Map<number, { t: number[]; c: number[] }>()
    const { tmax, cmax } = d.q
    for (const r of rows) {
      const pi = d.project[r]!
      const e = byProject.get(pi) ?? byProject.set(pi, { t: [], c: [] }).get(pi)!
      e.t.push(tmax.basis[r]! >= 0 ? tmax.assumed[r]! / tmax.final[r]! : NaN)
      e.c.push(cmax.basis[r]! >= 0 ? cmax.assumed[r]! / cmax.final[r]! : NaN)
    }
    const inputs = [...byProject.entries()]
      .sort((a, b) => d.projects.code[a[0]]!.localeCompare(d.projects.code[b[0]]!))
      .map(([pi, e]) => {
        const t = tonnage.get(d.projects.id[pi]!)
        return { code: d.projects.code[pi]!, name: d.projects.name[pi]!, yearDesigned: d.projects.yearDesigned[pi] ?? null, tmaxRatios: e.t, cmaxRatios: e.c, preliminary: t?.preliminary ?? {}, final: t?.final ?? {} }
      })
    return costOfConservatism(inputs)
  })
}

/** GET /api/starting-factors */
export async function startingFactors(db: Db, query: StartingFactorsQuery): Promise<StartingFactors> {
  const settings = await getCalibrationSettings(db)
  return cached(db, key('starting', query, settings), async () => {
    const d = await phaseData(db, 'sd')
    const group = selectRows(d, {
      supplier: query.supplier ? [query.supplier] : undefined,
      configuration: query.configuration ? [query.configuration] : undefined,
      coreAreaMin: query.coreAreaMin,
      coreAreaMax: query.coreAreaMax,
      yearFrom: query.yearFrom,
      yearTo: query.yearTo,
    })
    const projectIds = Int32Array.from(d.project)
    const suggestions: StartingSuggestion[] = []
    const backtests = {} as StartingFactors['backtest']
    for (const quantity of STARTING_QUANTITIES) {
      const col = d.q[quantity]
      const cols: FactorColumns = { projectId: projectIds, yearDesigned: d.yearDesigned, yearCompleted: d.yearCompleted, assumed: col.assumed, final: col.final }
      const firmBy = new Map<number, number[]>()
      const groupBy = new Map<number, number[]>()
      for (let r = 0; r < d.n; r++) {
        const b = col.basis[r]!
        if (b >= 0) (firmBy.get(b) ?? firmBy.set(b, []).get(b)!).push(r)
      }
      for (const r of group) {
        const b = col.basis[r]!
        if (b >= 0) (groupBy.get(b) ?? groupBy.set(b, []).get(b)!).push(r)
      }
      // Bases of the comparable group (the firm's when the group has none), largest first.
      const bases = [...(groupBy.size ? groupBy : firmBy).keys()].sort((a, b) => (groupBy.get(b)?.length ?? 0) - (groupBy.get(a)?.length ?? 0) || (firmBy.get(b)!.length - firmBy.get(a)!.length))
      for (const b of bases) {
        const firmRows = firmBy.get(b)!
        const firmSorted = await cached(db, key('firm-finals', quantity, b), async () => {
          const f = new Float64Array(firmRows.length)
          for (let i = 0; i < firmRows.length; i++) f[i] = col.final[firmRows[i]!]!
          return f.sort()
        }, f => f.byteLength)
        suggestions.push(suggestStarting(cols, groupBy.get(b) ?? [], firmRows, { quantity, basis: col.bases[b]!, quantile: query.quantile, minGroupSize: settings.minGroupSize, habitYears: settings.habitYears }, firmSorted))
      }
      const primary = bases[0]
      backtests[quantity] = primary === undefined ? [] : backtest(cols, groupBy.get(primary) ?? [], firmBy.get(primary)!, { quantity, quantile: query.quantile, minGroupSize: settings.minGroupSize })
    }
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

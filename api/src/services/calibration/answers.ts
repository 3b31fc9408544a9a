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
import { costOfConservatism, histogramBins, quantileOfSorted, sortedCopy, suggestStarting, summarizeRatios, yearBand, STARTING_CAUTIONS, type TonnageByCategory } from '@shared/calibration'
import type { Db } from '../../db'
import { poolOf } from '../../db/calibration'
import { getSizingDefaults } from '../settings'
import { getCalibrationSettings } from './settings'
import { backtestIndexed, groupSortedFinals, startingIndex } from './starting-index'
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

const groupCodesOf = new WeakMap<PhaseData, Map<CalibrationGrouping, { codes: Int32Array; values: string[] }>>()
/** Each row's group label under `by`, as a code into `values` (worked out once per phase data). */
function groupCodes(d: PhaseData, by: CalibrationGrouping): { codes: Int32Array; values: string[] } {
  let m = groupCodesOf.get(d)
  if (!m) groupCodesOf.set(d, (m = new Map()))
  let g = m.get(by)
  if (!g) {
    const label = groupLabeller(d, by)
    const codes = new Int32Array(d.n)
    const values: string[] = []
    const index = new Map<string, number>()
    for (let r = 0; r < d.n; r++) {
      const v = label(r)
      let c = index.get(v)
      if (c === undefined) {
        c = values.length
        values.push(v)
        index.set(v, c)
      }
      codes[r] = c
    }
    g = { codes, values }
    m.set(by, g)
  }
  return g
}

/** The filtered rows that carry `quantity`, with their group labels. */
export async function pointRows(db: Db, filters: CalibrationFilters, quantity: CalibrationQuantity, groupBy: CalibrationGrouping): Promise<PointRows> {
  const data = await phaseData(db, filters.phase)
  const all = selectRows(data, filters)
  const basis = data.q[quantity].basis
  const rows = new Int32Array(all.length)
  const group = new Int32Array(all.length)
  const groups: string[] = []
  // Labels are numbered once per data version; here they are renumbered in order of first appearance.
  const labels = groupCodes(data, groupBy)
  const local = new Int32Array(labels.values.length).fill(-1)
  let m = 0
  for (let k = 0; k < all.length; k++) {
    const r = all[k]!
    if (basis[r]! < 0) continue
    const g = labels.codes[r]!
    let c = local[g]!
    if (c < 0) {
      c = local[g] = groups.length
      groups.push(labels.values[g]!)
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
    // Ratios per (group, basis), in order of first appearance (a numeric key, not a string per row).
    const nb = col.bases.length
    const slot = new Int32Array(pts.groups.length * nb).fill(-1)
    const byGroup: { g: number; b: number; ratios: number[] }[] = []
    const byBasis = new Map<number, number[]>()
    let min = Infinity
    let max = -Infinity
    for (let k = 0; k < pts.rows.length; k++) {
      const r = pts.rows[k]!
      const ratio = col.assumed[r]! / col.final[r]!
      const b = col.basis[r]!
      const gk = pts.group[k]! * nb + b
      if (slot[gk]! < 0) {
        slot[gk] = byGroup.length
        byGroup.push({ g: pts.group[k]!, b, ratios: [] })
      }
      byGroup[slot[gk]!]!.ratios.push(ratio)
      ;(byBasis.get(b) ?? byBasis.set(b, []).get(b)!).push(ratio)
      if (ratio < min) min = ratio
      if (ratio > max) max = ratio
    }
    const side = QUANTITY_INFO[quantity].side
    if (!pts.rows.length) return { quantity, side, tolerance, groups: [], overall: [] }
    const bins = histogramBins(min, max)
    const groups = byGroup
      .map(({ g, b, ratios }) => summarizeRatios(ratios, { group: pts.groups[g]!, basis: col.bases[b]!, tolerance, bins }))
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

/**
 * Per project, the rank of its code and of its supplier ('' when none) in `localeCompare` order
 * (equal under localeCompare → equal rank), so sorting by rank is sorting by localeCompare.
 */
const ranksOf = new WeakMap<PhaseData, { code: Int32Array; supplier: Int32Array }>()
function projectRanks(d: PhaseData): { code: Int32Array; supplier: Int32Array } {
  let r = ranksOf.get(d)
  if (!r) {
    const rank = (values: string[]) => {
      const order = values.map((_, i) => i).sort((a, b) => values[a]!.localeCompare(values[b]!))
      const out = new Int32Array(values.length)
      for (let k = 1; k < order.length; k++) out[order[k]!] = out[order[k - 1]!]! + (values[order[k - 1]!]!.localeCompare(values[order[k]!]!) === 0 ? 0 : 1)
      return out
    }
    r = { code: rank(d.projects.code), supplier: rank(d.projects.supplier.map(v => v ?? '')) }
    ranksOf.set(d, r)
  }
  return r
}

/** Misses: strength-side quantities, braces whose final exceeded the assumption; the stiffness factor, braces outside the band. */
export async function calibrationMisses(db: Db, filters: CalibrationFilters, quantity: CalibrationQuantity, q: { sort: (typeof MISS_SORTS)[number]; dir: 'asc' | 'desc'; limit: number }): Promise<CalibrationMiss[]> {
  const tolerance = (await getSizingDefaults(db)).stiffnessTolerance
  return cached(db, key('misses', filters, quantity, q, tolerance), async () => {
    const pts = await pointRows(db, filters, quantity, 'none')
    const d = pts.data
    const col = d.q[quantity]
    const band = QUANTITY_INFO[quantity].side === 'band'
    const p = d.projects
    const ranks = projectRanks(d)
    const ratioOf = (r: number) => col.assumed[r]! / col.final[r]!
    const sign = q.dir === 'asc' ? 1 : -1
    const byRatio = (a: number, b: number) => ratioOf(a) - ratioOf(b)
    // The sort of the full list of misses, on row indices (the same keys and tie-breaks, so the
    // `limit` first rows kept while scanning are the first `limit` of the sorted list).
    const cmp: Record<(typeof MISS_SORTS)[number], (a: number, b: number) => number> = {
      ratio: byRatio,
      project: (a, b) => ranks.code[d.project[a]!]! - ranks.code[d.project[b]!]! || byRatio(a, b),
      year: (a, b) => (p.yearDesigned[d.project[a]!] ?? 0) - (p.yearDesigned[d.project[b]!] ?? 0) || byRatio(a, b),
      supplier: (a, b) => ranks.supplier[d.project[a]!]! - ranks.supplier[d.project[b]!]! || byRatio(a, b),
    }
    const order = (a: number, b: number) => sign * cmp[q.sort](a, b) || d.braceId[a]! - d.braceId[b]!
    const best: number[] = []
    for (const r of pts.rows) {
      const ratio = ratioOf(r)
      if (band ? Math.abs(ratio - 1) <= tolerance + 1e-12 : ratio >= 1) continue
      if (best.length === q.limit) {
        if (order(r, best[q.limit - 1]!) >= 0) continue
        best.pop()
      }
      let i = best.length
      while (i > 0 && order(r, best[i - 1]!) < 0) i--
      best.splice(i, 0, r)
    }
    return best.map(r => {
      const pi = d.project[r]!
      return {
        braceId: d.braceId[r]!,
        projectCode: p.code[pi]!,
        projectName: p.name[pi]!,
        frameLine: d.frameLine.values[d.frameLine.codes[r]!]!,
        level: d.level.values[d.level.codes[r]!]!,
        supplier: p.supplier[pi] ?? null,
        yearDesigned: p.yearDesigned[pi] ?? null,
        basis: col.bases[col.basis[r]!]!,
        assumed: col.assumed[r]!,
        final: col.final[r]!,
        ratio: ratioOf(r),
      }
    })
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
    // Per-version ingredients (firm rows per basis, their sorted finals, the back-test's buckets);
    // the query only marks its group and counts over them.
    const index = startingIndex(d)
    const inGroup = new Uint8Array(d.n)
    for (const r of group) inGroup[r] = 1
    const suggestions: StartingSuggestion[] = []
    const backtests = {} as StartingFactors['backtest']
    for (const quantity of STARTING_QUANTITIES) {
      const col = d.q[quantity]
      const { cols, bases: firmBy } = index[quantity]
      const groupBy = new Map<number, number[]>()
      for (const r of group) {
        const b = col.basis[r]!
        if (b >= 0) (groupBy.get(b) ?? groupBy.set(b, []).get(b)!).push(r)
      }
      // Bases of the comparable group (the firm's when the group has none), largest first.
      const bases = [...(groupBy.size ? groupBy : firmBy).keys()].sort((a, b) => (groupBy.get(b)?.length ?? 0) - (groupBy.get(a)?.length ?? 0) || (firmBy.get(b)!.rows.length - firmBy.get(a)!.rows.length))
      for (const b of bases) {
        const firm = firmBy.get(b)!
        const groupRows = groupBy.get(b) ?? []
        const opts = { quantity, basis: col.bases[b]!, quantile: query.quantile, minGroupSize: settings.minGroupSize, habitYears: settings.habitYears }
        suggestions.push(suggestStarting(cols, groupRows, firm.rows, opts, firm.sorted, groupSortedFinals(firm, inGroup, groupRows.length)))
      }
      const primary = bases[0]
      backtests[quantity] = primary === undefined ? [] : backtestIndexed(cols, firmBy.get(primary)!, groupBy.get(primary) ?? [], inGroup, { quantity, quantile: query.quantile, minGroupSize: settings.minGroupSize })
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

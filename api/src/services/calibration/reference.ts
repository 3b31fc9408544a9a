import { Dictionary, Float64, Int32, Table, Utf8, makeData, makeVector, tableToIPC, vectorFromArray } from 'apache-arrow'
import {
  STARTING_QUANTITIES,
  QUANTITY_INFO,
  type CalibrationCost,
  type CalibrationFilters,
  type CalibrationGrouping,
  type CalibrationMiss,
  type CalibrationQuantity,
  type CalibrationSummary,
  type CalibrationTrend,
  type MISS_SORTS,
  type StartingFactorsQuery,
  type StartingSuggestion,
  type StartingFactors,
} from '@shared/schemas/calibration'
import { backtest, costOfConservatism, histogramBins, quantileOfSorted, sortedCopy, suggestStarting, summarizeRatios, yearBand, type FactorColumns, type TonnageByCategory } from '@shared/calibration'
import { backtestIndexed, groupSortedFinals, startingIndex } from './starting-index'
import { selectRows, type PhaseData } from './store'

/**
 * The straightforward computation of every analytics answer, kept as the reference the fast paths
 * of answers.ts / derived.ts are compared against (tests/api/calibration-derived.test.ts) and timed
 * against (npm run bench:analytics). Not used by the app: each call selects, groups and sorts from
 * scratch. The code is the analytics' code as it stood before the per-version precomputation.
 */

export interface RefPointRows {
  data: PhaseData
  quantity: CalibrationQuantity
  rows: Int32Array
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

export function refPointRows(data: PhaseData, filters: Partial<CalibrationFilters>, quantity: CalibrationQuantity, groupBy: CalibrationGrouping): RefPointRows {
  const all = selectRows(data, filters)
  const basis = data.q[quantity].basis
  const label = groupLabeller(data, groupBy)
  const rows: number[] = []
  const group: number[] = []
  const groups: string[] = []
  const index = new Map<string, number>()
  for (const r of all) {
    if (basis[r]! < 0) continue
    const v = label(r)
    let c = index.get(v)
    if (c === undefined) {
      c = groups.length
      groups.push(v)
      index.set(v, c)
    }
    rows.push(r)
    group.push(c)
  }
  return { data, quantity, rows: Int32Array.from(rows), group: Int32Array.from(group), groups }
}

export function refSummary(d: PhaseData, filters: Partial<CalibrationFilters>, quantity: CalibrationQuantity, groupBy: CalibrationGrouping, tolerance: number): CalibrationSummary {
  const pts = refPointRows(d, filters, quantity, groupBy)
  const col = d.q[quantity]
  const byGroup = new Map<string, { g: number; b: number; ratios: number[] }>()
  const byBasis = new Map<number, number[]>()
  let min = Infinity
  let max = -Infinity
  for (let k = 0; k < pts.rows.length; k++) {
    const r = pts.rows[k]!
    const ratio = col.assumed[r]! / col.final[r]!
    const b = col.basis[r]!
    const key = `${pts.group[k]}|${b}`
    const e = byGroup.get(key) ?? byGroup.set(key, { g: pts.group[k]!, b, ratios: [] }).get(key)!
    e.ratios.push(ratio)
    ;(byBasis.get(b) ?? byBasis.set(b, []).get(b)!).push(ratio)
    if (ratio < min) min = ratio
    if (ratio > max) max = ratio
  }
  const side = QUANTITY_INFO[quantity].side
  if (!pts.rows.length) return { quantity, side, tolerance, groups: [], overall: [] }
  const bins = histogramBins(min, max)
  const groups = [...byGroup.values()]
    .map(({ g, b, ratios }) => summarizeRatios(ratios, { group: pts.groups[g]!, basis: col.bases[b]!, tolerance, bins }))
    .sort((a, b) => a.group.localeCompare(b.group) || b.n - a.n)
  const overall = [...byBasis.entries()].map(([b, ratios]) => summarizeRatios(ratios, { group: 'all braces', basis: col.bases[b]!, tolerance, bins })).sort((a, b) => b.n - a.n)
  return { quantity, side, tolerance, groups, overall }
}

export function refTrend(d: PhaseData, filters: Partial<CalibrationFilters>, quantity: CalibrationQuantity): CalibrationTrend {
  const pts = refPointRows(d, filters, quantity, 'none')
  const col = d.q[quantity]
  const by = new Map<string, number[]>()
  for (const r of pts.rows) {
    const y = d.projects.yearDesigned[d.project[r]!]
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
}

export function refMisses(d: PhaseData, filters: Partial<CalibrationFilters>, quantity: CalibrationQuantity, q: { sort: (typeof MISS_SORTS)[number]; dir: 'asc' | 'desc'; limit: number }, tolerance: number): CalibrationMiss[] {
  const pts = refPointRows(d, filters, quantity, 'none')
  const col = d.q[quantity]
  const band = QUANTITY_INFO[quantity].side === 'band'
  const p = d.projects
  const out: CalibrationMiss[] = []
  for (const r of pts.rows) {
    const ratio = col.assumed[r]! / col.final[r]!
    if (band ? Math.abs(ratio - 1) <= tolerance + 1e-12 : ratio >= 1) continue
    const pi = d.project[r]!
    out.push({
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
      ratio,
    })
  }
  const sign = q.dir === 'asc' ? 1 : -1
  const cmp: Record<(typeof MISS_SORTS)[number], (a: CalibrationMiss, b: CalibrationMiss) => number> = {
    ratio: (a, b) => a.ratio - b.ratio,
    project: (a, b) => a.projectCode.localeCompare(b.projectCode) || a.ratio - b.ratio,
    year: (a, b) => (a.yearDesigned ?? 0) - (b.yearDesigned ?? 0) || a.ratio - b.ratio,
    supplier: (a, b) => (a.supplier ?? '').localeCompare(b.supplier ?? '') || a.ratio - b.ratio,
  }
  out.sort((a, b) => sign * cmp[q.sort](a, b) || a.braceId - b.braceId)
  return out.slice(0, q.limit)
}

export function refCost(d: PhaseData, filters: Partial<CalibrationFilters>, tonnage: Map<number, { preliminary: TonnageByCategory; final: TonnageByCategory }>): CalibrationCost {
  const rows = selectRows(d, filters)
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
}

/** The filters a starting-factor query applies to the firm's rows. */
export function startingFilters(query: StartingFactorsQuery): Partial<CalibrationFilters> {
  return {
    supplier: query.supplier ? [query.supplier] : undefined,
    configuration: query.configuration ? [query.configuration] : undefined,
    coreAreaMin: query.coreAreaMin,
    coreAreaMax: query.coreAreaMax,
    yearFrom: query.yearFrom,
    yearTo: query.yearTo,
  }
}

/** Suggestions and back-tests of a starting-factor query (the answer without its settings echo and cautions). */
export function refStarting(d: PhaseData, query: StartingFactorsQuery, settings: { minGroupSize: number; habitYears: number }): { suggestions: StartingSuggestion[]; backtest: StartingFactors['backtest'] } {
  const group = selectRows(d, startingFilters(query))
  const projectId = Int32Array.from(d.project)
  const suggestions: StartingSuggestion[] = []
  const backtests = {} as StartingFactors['backtest']
  for (const quantity of STARTING_QUANTITIES) {
    const col = d.q[quantity]
    const cols: FactorColumns = { projectId, yearDesigned: d.yearDesigned, yearCompleted: d.yearCompleted, assumed: col.assumed, final: col.final }
    const firmBy = new Map<number, number[]>()
    for (let r = 0; r < d.n; r++) {
      const b = col.basis[r]!
      if (b >= 0) (firmBy.get(b) ?? firmBy.set(b, []).get(b)!).push(r)
    }
    const groupBy = new Map<number, number[]>()
    for (const r of group) {
      const b = col.basis[r]!
      if (b >= 0) (groupBy.get(b) ?? groupBy.set(b, []).get(b)!).push(r)
    }
    const bases = [...(groupBy.size ? groupBy : firmBy).keys()].sort((a, b) => (groupBy.get(b)?.length ?? 0) - (groupBy.get(a)?.length ?? 0) || firmBy.get(b)!.length - firmBy.get(a)!.length)
    for (const b of bases) {
      const opts = { quantity, basis: col.bases[b]!, quantile: query.quantile, minGroupSize: settings.minGroupSize, habitYears: settings.habitYears }
      suggestions.push(suggestStarting(cols, groupBy.get(b) ?? [], firmBy.get(b)!, opts))
    }
    const primary = bases[0]
    backtests[quantity] = primary === undefined ? [] : backtest(cols, groupBy.get(primary) ?? [], firmBy.get(primary)!, { quantity, quantile: query.quantile, minGroupSize: settings.minGroupSize })
  }
  return { suggestions, backtest: backtests }
}

/** The points as an Arrow IPC stream, as points.ts built it (a Map remap per dictionary column). */
export function refPointsArrow(p: RefPointRows): Uint8Array {
  const d = p.data
  const col = d.q[p.quantity]
  const n = p.rows.length
  const rows = p.rows
  const dictionary = (codeOf: (k: number) => number, valueOf: (code: number) => string) => {
    const remap = new Map<number, number>()
    const values: string[] = []
    const codes = new Int32Array(n)
    for (let k = 0; k < n; k++) {
      const c = codeOf(k)
      let m = remap.get(c)
      if (m === undefined) {
        m = values.length
        values.push(valueOf(c))
        remap.set(c, m)
      }
      codes[k] = m
    }
    const type = new Dictionary(new Utf8(), new Int32())
    return makeVector(makeData({ type, length: n, nullCount: 0, data: codes, dictionary: vectorFromArray(values, new Utf8()) }))
  }
  const braceId = new Int32Array(n)
  const assumed = new Float64Array(n)
  const final = new Float64Array(n)
  for (let k = 0; k < n; k++) {
    const r = rows[k]!
    braceId[k] = d.braceId[r]!
    assumed[k] = col.assumed[r]!
    final[k] = col.final[r]!
  }
  const table = new Table({
    braceId: makeVector(makeData({ type: new Int32(), length: n, nullCount: 0, data: braceId })),
    projectCode: dictionary(k => d.project[rows[k]!]!, c => d.projects.code[c]!),
    projectName: dictionary(k => d.project[rows[k]!]!, c => d.projects.name[c]!),
    frameLine: dictionary(k => d.frameLine.codes[rows[k]!]!, c => d.frameLine.values[c]!),
    level: dictionary(k => d.level.codes[rows[k]!]!, c => d.level.values[c]!),
    group: dictionary(k => p.group[k]!, c => p.groups[c]!),
    basis: dictionary(k => col.basis[rows[k]!]!, c => col.bases[c]!),
    assumed: makeVector(makeData({ type: new Float64(), length: n, nullCount: 0, data: assumed })),
    final: makeVector(makeData({ type: new Float64(), length: n, nullCount: 0, data: final })),
  })
  table.schema.metadata.set('quantity', p.quantity)
  return tableToIPC(table, 'stream')
}

/**
 * The starting-factor computation as the app ran it before derived.ts (on the per-version index of
 * starting-index.ts, a selectRows scan and per-query group lists): for the benchmark's before/after.
 */
export function previousStarting(d: PhaseData, query: StartingFactorsQuery, settings: { minGroupSize: number; habitYears: number }): { suggestions: StartingSuggestion[]; backtest: StartingFactors['backtest'] } {
  const group = selectRows(d, startingFilters(query))
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
    const bases = [...(groupBy.size ? groupBy : firmBy).keys()].sort((a, b) => (groupBy.get(b)?.length ?? 0) - (groupBy.get(a)?.length ?? 0) || firmBy.get(b)!.rows.length - firmBy.get(a)!.rows.length)
    for (const b of bases) {
      const firm = firmBy.get(b)!
      const groupRows = groupBy.get(b) ?? []
      const opts = { quantity, basis: col.bases[b]!, quantile: query.quantile, minGroupSize: settings.minGroupSize, habitYears: settings.habitYears }
      suggestions.push(suggestStarting(cols, groupRows, firm.rows, opts, firm.sorted, groupSortedFinals(firm, inGroup, groupRows.length)))
    }
    const primary = bases[0]
    backtests[quantity] = primary === undefined ? [] : backtestIndexed(cols, firmBy.get(primary)!, groupBy.get(primary) ?? [], inGroup, { quantity, quantile: query.quantile, minGroupSize: settings.minGroupSize })
  }
  return { suggestions, backtest: backtests }
}

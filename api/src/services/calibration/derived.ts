import {
  QUANTITY_INFO,
  STARTING_QUANTITIES,
  type CalibrationCost,
  type CalibrationFilters,
  type CalibrationGrouping,
  type CalibrationMiss,
  type CalibrationQuantity,
  type CalibrationSummary,
  type CalibrationTrend,
  type MISS_SORTS,
  type StartingFactors,
  type StartingFactorsQuery,
  type StartingSuggestion,
} from '@shared/schemas/calibration'
import { costOfProject, costTotals, histogramBins, type ProjectCost, quantileOfSorted, summarizeSortedRatios, yearBand, type TonnageByCategory } from '@shared/calibration'
import { drain, layoutSteps, quantityIndexSteps, sortByValueParts, startingAnswerIndexed, startingIndex } from './starting-index'
import type { PhaseData } from './store'

/**
 * What every analytics query needs from one phase's data, worked out once per PhaseData (a new
 * data version is a new PhaseData, so this lives and dies with it, in a WeakMap):
 * - per filter column, a code per project (or row) so a query tests each distinct value once;
 * - per quantity, each row's assumed / final ratio and the rows ordered by (ratio, brace id), so the
 *   sorted ratios of any filtered subset are one pass over that order with the filter's row mask
 *   (no sort per query);
 * - per quantity and miss sort, the rows ordered by (sort key, ratio, brace id), so the first
 *   `limit` misses are read off the order;
 * - per grouping, each row's group code; project ranks in localeCompare order.
 * Each answer here equals, value for value and in the same order, the straightforward computation
 * in reference.ts (tests/api/calibration-derived.test.ts compares them on random histories).
 */

export type MissSort = (typeof MISS_SORTS)[number]

interface Coded {
  codes: Int32Array
  values: string[]
}

interface Derived {
  groups: Map<CalibrationGrouping, GroupCodes>
  views: Map<CalibrationQuantity, SortedView>
  projectFilters?: { supplier: Coded; use: Coded; sdc: Coded; edition: Coded }
  ratio: Map<CalibrationQuantity, Float64Array>
  byRatio: Map<CalibrationQuantity, Int32Array>
  missOrder: Map<string, Int32Array>
  braceOrder?: Int32Array
  ranks?: { code: Int32Array; supplier: Int32Array }
  /** Dense rank of (year designed ?? 0) per project, for the misses' year sort. */
  yearRank?: Int32Array
  /** Per project, a code of its year designed (−1 when none), and the years. */
  rowYear?: { byProject: Int32Array; years: number[] }
  projectRows?: { count: Int32Array; first: Int32Array; at: Int32Array; rows: Int32Array }
  /** Projects by code rank (ties by project index). */
  projectsByCode?: Int32Array
}

const store = new WeakMap<PhaseData, Derived>()

function derivedOf(d: PhaseData): Derived {
  let x = store.get(d)
  if (!x) {
    x = { groups: new Map(), views: new Map(), ratio: new Map(), byRatio: new Map(), missOrder: new Map() }
    store.set(d, x)
  }
  return x
}

function code(values: readonly (string | null)[]): Coded {
  const index = new Map<string, number>()
  const out: string[] = []
  const codes = new Int32Array(values.length)
  for (let i = 0; i < values.length; i++) {
    const v = values[i]
    if (v === null || v === undefined) {
      codes[i] = -1
      continue
    }
    let c = index.get(v)
    if (c === undefined) {
      c = out.length
      out.push(v)
      index.set(v, c)
    }
    codes[i] = c
  }
  return { codes, values: out }
}

// ————————————————————————————————————————————— selection

/** The rows passing the filters (ascending, as `selectRows` gives them) and a mask of them by row. */
export interface Selection {
  rows: Int32Array
  mask: Uint8Array
}

/** Which codes of `c` a list filter lets through (null: no filter, everything passes). */
function allowed(c: Coded, list: readonly string[] | undefined): Uint8Array | null {
  if (!list?.length) return null
  const set = new Set(list)
  const ok = new Uint8Array(c.values.length)
  for (let k = 0; k < c.values.length; k++) ok[k] = set.has(c.values[k]!) ? 1 : 0
  return ok
}

/** A query's filters as small lookup tables: a row passes when its project and configuration pass and, with a core band, its core area is in it. */
export interface Tables {
  projectOk: Uint8Array
  configOk: Uint8Array
  core: boolean
  lo: number
  hi: number
}

/** `selectRows` of store.ts, with each distinct filter value tested once instead of once per project. */
export function selection(d: PhaseData, f: Partial<CalibrationFilters>): Selection {
  const { projectOk, configOk, core, lo, hi } = tables(d, f)
  const n = d.n
  const mask = new Uint8Array(n)
  const rows = new Int32Array(n)
  const project = d.project
  const cfg = d.configuration.codes
  let m = 0
  if (core) {
    const area = d.finalCoreArea
    for (let i = 0; i < n; i++) {
      if (projectOk[project[i]!] && configOk[cfg[i]!]) {
        const a = area[i]!
        if (a >= lo && a <= hi) {
          mask[i] = 1
          rows[m++] = i
        }
      }
    }
  } else {
    for (let i = 0; i < n; i++) {
      if (projectOk[project[i]!] && configOk[cfg[i]!]) {
        mask[i] = 1
        rows[m++] = i
      }
    }
  }
  return { rows: rows.subarray(0, m), mask }
}

export function tables(d: PhaseData, f: Partial<CalibrationFilters>): Tables {
  const x = derivedOf(d)
  const p = d.projects
  const pf = (x.projectFilters ??= { supplier: code(p.supplier), use: code(p.use), sdc: code(p.sdc), edition: code(p.edition) })
  const sup = allowed(pf.supplier, f.supplier)
  const use = allowed(pf.use, f.use)
  const sdc = allowed(pf.sdc, f.sdc)
  const ed = allowed(pf.edition, f.codeEdition)
  const P = p.id.length
  const projectOk = new Uint8Array(P)
  const { yearFrom, yearTo, storiesMin, storiesMax } = f
  for (let j = 0; j < P; j++) {
    const y = p.yearDesigned[j] ?? null
    const s = p.stories[j] ?? null
    if (yearFrom !== undefined && (y === null || !(y >= yearFrom))) continue
    if (yearTo !== undefined && (y === null || !(y <= yearTo))) continue
    if (storiesMin !== undefined && (s === null || !(s >= storiesMin))) continue
    if (storiesMax !== undefined && (s === null || !(s <= storiesMax))) continue
    if (sup) { const c = pf.supplier.codes[j]!; if (c < 0 || !sup[c]) continue }
    if (use) { const c = pf.use.codes[j]!; if (c < 0 || !use[c]) continue }
    if (sdc) { const c = pf.sdc.codes[j]!; if (c < 0 || !sdc[c]) continue }
    if (ed) { const c = pf.edition.codes[j]!; if (c < 0 || !ed[c]) continue }
    projectOk[j] = 1
  }
  const configs = f.configuration?.length ? new Set(f.configuration) : null
  const configOk = new Uint8Array(d.configuration.values.length)
  for (let k = 0; k < configOk.length; k++) configOk[k] = !configs || configs.has(d.configuration.values[k]!) ? 1 : 0
  return { projectOk, configOk, core: f.coreAreaMin !== undefined || f.coreAreaMax !== undefined, lo: f.coreAreaMin ?? -Infinity, hi: f.coreAreaMax ?? Infinity }
}

// ————————————————————————————————————————————— per-version orders

const NOT_STATED: Record<Exclude<CalibrationGrouping, 'none' | 'yearBand'>, string> = { supplier: 'supplier not stated', configuration: 'configuration not stated', office: 'office not stated' }

/** Row group codes, and the same codes by project or by configuration code (whichever decides the label). */
export interface GroupCodes extends Coded {
  byProject: Int32Array | null
  byConfig: Int32Array | null
}

/** Each row's group label under `by`, as a code into `values` (numbered in order of first appearance over the rows). */
export function groupCodes(d: PhaseData, by: CalibrationGrouping): GroupCodes {
  const x = derivedOf(d)
  let g = x.groups.get(by)
  if (!g) {
    const p = d.projects
    const codes = new Int32Array(d.n)
    if (by === 'none') g = { codes, values: d.n ? ['all braces'] : [], byProject: null, byConfig: null }
    else {
      const perConfig = by === 'configuration'
      const labels = perConfig
        ? d.configuration.values
        : by === 'supplier'
          ? p.supplier.map(v => v ?? NOT_STATED.supplier)
          : by === 'office'
            ? p.office.map(v => v ?? NOT_STATED.office)
            : p.yearDesigned.map(v => yearBand(v ?? null))
      const source = perConfig ? d.configuration.codes : d.project
      const pc = code(labels)
      const values: string[] = []
      const local = new Int32Array(pc.values.length).fill(-1)
      for (let r = 0; r < d.n; r++) {
        const c = pc.codes[source[r]!]!
        let l = local[c]!
        if (l < 0) {
          l = local[c] = values.length
          values.push(pc.values[c]!)
        }
        codes[r] = l
      }
      const table = Int32Array.from(pc.codes, c => local[c]!)
      g = { codes, values, byProject: perConfig ? null : table, byConfig: perConfig ? table : null }
    }
    x.groups.set(by, g)
  }
  return g
}

/** Each row's assumed / final ratio of `quantity` (NaN where the pair lacks it). */
export function ratios(d: PhaseData, quantity: CalibrationQuantity): Float64Array {
  const x = derivedOf(d)
  let v = x.ratio.get(quantity)
  if (!v) {
    const col = d.q[quantity]
    v = new Float64Array(d.n)
    for (let r = 0; r < d.n; r++) v[r] = col.basis[r]! >= 0 ? col.assumed[r]! / col.final[r]! : NaN
    x.ratio.set(quantity, v)
  }
  return v
}

/** Rows ascending by brace id. */
function braceOrder(d: PhaseData): Int32Array {
  const x = derivedOf(d)
  if (!x.braceOrder) {
    const o = new Int32Array(d.n)
    let sorted = true
    for (let r = 0; r < d.n; r++) {
      o[r] = r
      if (r && d.braceId[r]! < d.braceId[r - 1]!) sorted = false
    }
    if (!sorted) o.sort((a, b) => d.braceId[a]! - d.braceId[b]!)
    x.braceOrder = o
  }
  return x.braceOrder
}

/** Rows carrying `quantity`, ascending by (ratio, brace id). */
export function rowsByRatio(d: PhaseData, quantity: CalibrationQuantity): Int32Array {
  return derivedOf(d).byRatio.get(quantity) ?? drain(rowsByRatioParts(d, quantity))
}

/**
 * `rowsByRatio` in parts, yielding after the ratios, the rows that carry the quantity and each pass
 * of the sort. A request that needs the order meanwhile builds it at once; the first one built is kept.
 */
function* rowsByRatioParts(d: PhaseData, quantity: CalibrationQuantity): Generator<void, Int32Array> {
  const x = derivedOf(d)
  const built = x.byRatio.get(quantity)
  if (built) return built
  const ratio = ratios(d, quantity)
  yield
  const basis = d.q[quantity].basis
  const bo = braceOrder(d)
  const rows = new Int32Array(d.n)
  let m = 0
  for (let i = 0; i < bo.length; i++) if (basis[bo[i]!]! >= 0) rows[m++] = bo[i]!
  yield
  const o = yield* sortByValueParts(rows.subarray(0, m), ratio)
  const meanwhile = x.byRatio.get(quantity)
  if (meanwhile) return meanwhile
  x.byRatio.set(quantity, o)
  return o
}

/**
 * The rows carrying `quantity` in (ratio, brace id) order, with the columns a query reads laid out in
 * that order: a pass over the order then reads memory sequentially (plus small per-project tables)
 * instead of jumping to a random row at every step.
 */
export interface SortedView {
  rows: Int32Array
  project: Int32Array
  config: Int32Array
  core: Float64Array
  basis: Int32Array
  ratio: Float64Array
}

export function sortedView(d: PhaseData, quantity: CalibrationQuantity): SortedView {
  return derivedOf(d).views.get(quantity) ?? drain(sortedViewParts(d, quantity))
}

/** Rows of the sorted view laid out between two yields of `sortedViewParts`. */
const VIEW_PART = 65_536

/** `sortedView` in parts of VIEW_PART rows (after the order itself, built in parts too); the first one built is kept. */
function* sortedViewParts(d: PhaseData, quantity: CalibrationQuantity): Generator<void, SortedView> {
  const x = derivedOf(d)
  const built = x.views.get(quantity)
  if (built) return built
  const rows = yield* rowsByRatioParts(d, quantity)
  const n = rows.length
  const ratio = ratios(d, quantity)
  const basis = d.q[quantity].basis
  const v: SortedView = { rows, project: new Int32Array(n), config: new Int32Array(n), core: new Float64Array(n), basis: new Int32Array(n), ratio: new Float64Array(n) }
  for (let start = 0; start < n; start += VIEW_PART) {
    yield
    const end = Math.min(n, start + VIEW_PART)
    for (let i = start; i < end; i++) {
      const r = rows[i]!
      v.project[i] = d.project[r]!
      v.config[i] = d.configuration.codes[r]!
      v.core[i] = d.finalCoreArea[r]!
      v.basis[i] = basis[r]!
      v.ratio[i] = ratio[r]!
    }
  }
  const meanwhile = x.views.get(quantity)
  if (meanwhile) return meanwhile
  x.views.set(quantity, v)
  return v
}

/**
 * Positions in `v` of the rows passing the filter tables, ascending (one sequential pass).
 */
function passing(v: SortedView, t: Tables): Int32Array {
  const n = v.rows.length
  const out = new Int32Array(n)
  const { projectOk, configOk } = t
  const vp = v.project
  const vc = v.config
  let m = 0
  if (t.core) {
    const { lo, hi } = t
    const core = v.core
    for (let i = 0; i < n; i++) if (projectOk[vp[i]!] && configOk[vc[i]!] && core[i]! >= lo && core[i]! <= hi) out[m++] = i
  } else {
    for (let i = 0; i < n; i++) if (projectOk[vp[i]!] && configOk[vc[i]!]) out[m++] = i
  }
  return out.subarray(0, m)
}

/**
 * Per project, the rank of its code and of its supplier ('' when none) in `localeCompare` order
 * (equal under localeCompare → equal rank), so sorting by rank is sorting by localeCompare.
 */
export function projectRanks(d: PhaseData): { code: Int32Array; supplier: Int32Array } {
  const x = derivedOf(d)
  if (!x.ranks) {
    const rank = (values: string[]) => {
      // Rank the distinct values (a stable sort of few), then spread to projects.
      const c = code(values)
      const order = c.values.map((_, i) => i).sort((a, b) => c.values[a]!.localeCompare(c.values[b]!))
      const of = new Int32Array(c.values.length)
      for (let k = 1; k < order.length; k++) of[order[k]!] = of[order[k - 1]!]! + (c.values[order[k - 1]!]!.localeCompare(c.values[order[k]!]!) === 0 ? 0 : 1)
      const out = new Int32Array(values.length)
      for (let j = 0; j < values.length; j++) out[j] = of[c.codes[j]!]!
      return out
    }
    x.ranks = { code: rank(d.projects.code), supplier: rank(d.projects.supplier.map(v => v ?? '')) }
  }
  return x.ranks
}

function yearRank(d: PhaseData): Int32Array {
  const x = derivedOf(d)
  if (!x.yearRank) {
    const ys = d.projects.yearDesigned.map(v => v ?? 0)
    const distinct = [...new Set(ys)].sort((a, b) => a - b)
    const at = new Map(distinct.map((y, i) => [y, i]))
    x.yearRank = Int32Array.from(ys, y => at.get(y)!)
  }
  return x.yearRank
}

/** Per project, the key of a miss sort (ties under the sort's comparator ↔ equal keys); null for 'ratio'. */
function missKey(d: PhaseData, sort: MissSort): Int32Array | null {
  if (sort === 'ratio') return null
  if (sort === 'year') return yearRank(d)
  const r = projectRanks(d)
  return sort === 'project' ? r.code : r.supplier
}

/** Rows carrying `quantity`, ascending by (the sort's project key, ratio, brace id). */
function missOrder(d: PhaseData, quantity: CalibrationQuantity, sort: MissSort): Int32Array {
  const key = missKey(d, sort)
  if (!key) return rowsByRatio(d, quantity)
  const x = derivedOf(d)
  const k = `${quantity}|${sort}`
  let o = x.missOrder.get(k)
  if (!o) {
    // A stable counting sort of the (ratio, brace id) order by the key.
    const base = rowsByRatio(d, quantity)
    let K = 0
    for (let j = 0; j < key.length; j++) if (key[j]! + 1 > K) K = key[j]! + 1
    const count = new Int32Array(K + 1)
    for (let i = 0; i < base.length; i++) count[key[d.project[base[i]!]!]! + 1]!++
    for (let c = 1; c <= K; c++) count[c]! += count[c - 1]!
    o = new Int32Array(base.length)
    for (let i = 0; i < base.length; i++) o[count[key[d.project[base[i]!]!]!]!++] = base[i]!
    x.missOrder.set(k, o)
  }
  return o
}

/**
 * Every per-version structure of `d` (the queries would build each on first use), as steps of a
 * few tenths of a second at most, for a build in the background that pauses between them.
 */
export function preparationSteps(d: PhaseData): PreparationStep[] {
  const quantities = Object.keys(d.q) as CalibrationQuantity[]
  return [
    () => {
      for (const g of ['supplier', 'configuration', 'yearBand', 'office', 'none'] as const) groupCodes(d, g)
    },
    ...quantities.flatMap(q => [() => rowsByRatioParts(d, q), () => sortedViewParts(d, q)]),
    ...quantities.flatMap(q => (['ratio', 'project', 'year', 'supplier'] as const).map(s => () => void missOrder(d, q, s))),
    () => {
      rowYears(d)
      projectsByCode(d)
      projectRowCounts(d)
      selection(d, {})
    },
    ...STARTING_QUANTITIES.map(q => () => quantityIndexSteps(d, q)),
    () => void startingIndex(d),
    () => layoutSteps(d),
  ]
}

/**
 * One step of `preparationSteps`: done when it returns, or, for the longer ones, a build that yields
 * between its parts (a background build runs it part by part, pausing in between).
 */
export type PreparationStep = () => void | Generator<void, unknown>

/** Builds every per-version structure of `d` now. */
export function prepare(d: PhaseData): void {
  for (const step of preparationSteps(d)) {
    const parts = step()
    if (parts) drain(parts)
  }
}

// ————————————————————————————————————————————— answers

/** Points of one quantity: row indices with a value, plus the group label of each. */
export interface PointRows {
  data: PhaseData
  quantity: CalibrationQuantity
  rows: Int32Array
  /** Group label code per point (into `groups`). */
  group: Int32Array
  groups: string[]
}

/** The filtered rows that carry `quantity`, with their group labels (numbered in order of first appearance). */
export function pointRowsOf(data: PhaseData, filters: Partial<CalibrationFilters>, quantity: CalibrationQuantity, groupBy: CalibrationGrouping): PointRows {
  const all = selection(data, filters).rows
  const basis = data.q[quantity].basis
  const rows = new Int32Array(all.length)
  const group = new Int32Array(all.length)
  const groups: string[] = []
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

/** GET /api/calibration/summary's answer. */
export function summaryAnswer(d: PhaseData, filters: Partial<CalibrationFilters>, quantity: CalibrationQuantity, groupBy: CalibrationGrouping, tolerance: number): CalibrationSummary {
  const t = tables(d, filters)
  const col = d.q[quantity]
  const labels = groupCodes(d, groupBy)
  const nb = col.bases.length
  // One pass over the rows that pass, in ratio order (the sorted view): counts and the first row
  // (lowest row number) of each (group, basis) slot and of each basis, min / max.
  const v = sortedView(d, quantity)
  const pos = passing(v, t)
  const vb = v.basis
  const vr = v.ratio
  const vrow = v.rows
  const groupOf = labels.byProject ?? labels.byConfig
  const groupKey = labels.byProject ? v.project : v.config
  const G = labels.values.length * nb
  const gkN = new Int32Array(G)
  const gkFirst = new Int32Array(G).fill(0x7fffffff)
  const basisN = new Int32Array(nb)
  const basisFirst = new Int32Array(nb).fill(0x7fffffff)
  let min = Infinity
  let max = -Infinity
  for (let k = 0; k < pos.length; k++) {
    const i = pos[k]!
    const b = vb[i]!
    const gk = (groupOf ? groupOf[groupKey[i]!]! : 0) * nb + b
    const r = vrow[i]!
    gkN[gk]!++
    if (r < gkFirst[gk]!) gkFirst[gk] = r
    basisN[b]!++
    if (r < basisFirst[b]!) basisFirst[b] = r
    const x = vr[i]!
    if (x < min) min = x
    if (x > max) max = x
  }
  const side = QUANTITY_INFO[quantity].side
  if (!pos.length) return { quantity, side, tolerance, groups: [], overall: [] }
  // Slots and bases in order of first appearance over the rows (the order ties keep below).
  const slotKey: number[] = []
  for (let gk = 0; gk < G; gk++) if (gkN[gk]) slotKey.push(gk)
  slotKey.sort((a, b) => gkFirst[a]! - gkFirst[b]!)
  const basisOrder: number[] = []
  for (let b = 0; b < nb; b++) if (basisN[b]) basisOrder.push(b)
  basisOrder.sort((a, b) => basisFirst[a]! - basisFirst[b]!)
  // Each slot's and each basis's ratios, sorted: a second pass over the same rows in ratio order.
  const S = slotKey.length
  const slotAt = new Int32Array(S + 1)
  const slotPos = new Int32Array(G)
  for (let s = 0; s < S; s++) {
    slotPos[slotKey[s]!] = slotAt[s]!
    slotAt[s + 1] = slotAt[s]! + gkN[slotKey[s]!]!
  }
  const basisAt = new Int32Array(nb + 1)
  for (let b = 0; b < nb; b++) basisAt[b + 1] = basisAt[b]! + basisN[b]!
  const total = slotAt[S]!
  const slotVals = new Float64Array(total)
  const basisVals = new Float64Array(total)
  const basisPos = basisAt.slice(0, nb)
  for (let k = 0; k < pos.length; k++) {
    const i = pos[k]!
    const b = vb[i]!
    const x = vr[i]!
    slotVals[slotPos[(groupOf ? groupOf[groupKey[i]!]! : 0) * nb + b]!++] = x
    basisVals[basisPos[b]!++] = x
  }
  const bins = histogramBins(min, max)
  const groups = slotKey
    .map((gk, s) => summarizeSortedRatios(slotVals.subarray(slotAt[s]!, slotAt[s + 1]!), { group: labels.values[Math.floor(gk / nb)]!, basis: col.bases[gk % nb]!, tolerance, bins }))
    .sort((a, b) => a.group.localeCompare(b.group) || b.n - a.n)
  const overall = basisOrder.map(b => summarizeSortedRatios(basisVals.subarray(basisAt[b]!, basisAt[b + 1]!), { group: 'all braces', basis: col.bases[b]!, tolerance, bins })).sort((a, b) => b.n - a.n)
  return { quantity, side, tolerance, groups, overall }
}

function rowYears(d: PhaseData): { byProject: Int32Array; years: number[] } {
  const x = derivedOf(d)
  if (!x.rowYear) {
    const years: number[] = []
    const at = new Map<number, number>()
    const byProject = Int32Array.from(d.projects.yearDesigned, y => {
      if (y === null || y === undefined) return -1
      let c = at.get(y)
      if (c === undefined) {
        c = years.length
        years.push(y)
        at.set(y, c)
      }
      return c
    })
    x.rowYear = { byProject, years }
  }
  return x.rowYear
}

/** GET /api/calibration/trend's answer. */
export function trendAnswer(d: PhaseData, filters: Partial<CalibrationFilters>, quantity: CalibrationQuantity): CalibrationTrend {
  const t = tables(d, filters)
  const col = d.q[quantity]
  const nb = col.bases.length
  const { byProject: yc, years: yearOf } = rowYears(d)
  const v = sortedView(d, quantity)
  const pos = passing(v, t)
  const S = yearOf.length * nb
  const count = new Int32Array(S)
  const vp = v.project
  const vb = v.basis
  const vr = v.ratio
  for (let k = 0; k < pos.length; k++) {
    const i = pos[k]!
    const y = yc[vp[i]!]!
    if (y >= 0) count[y * nb + vb[i]!]!++
  }
  const at = new Int32Array(S + 1)
  for (let s = 0; s < S; s++) at[s + 1] = at[s]! + count[s]!
  const vals = new Float64Array(at[S]!)
  const fill = at.slice(0, S)
  for (let k = 0; k < pos.length; k++) {
    const i = pos[k]!
    const y = yc[vp[i]!]!
    if (y >= 0) vals[fill[y * nb + vb[i]!]!++] = vr[i]!
  }
  const years: CalibrationTrend['years'] = []
  for (let s = 0; s < S; s++) {
    if (!count[s]) continue
    const w = vals.subarray(at[s]!, at[s + 1]!)
    let under = 0
    for (let i = 0; i < w.length && w[i]! < 1; i++) under++
    years.push({ year: yearOf[Math.floor(s / nb)]!, basis: col.bases[s % nb]!, n: w.length, q1: quantileOfSorted(w, 0.25), median: quantileOfSorted(w, 0.5), q3: quantileOfSorted(w, 0.75), underestimateRate: under / w.length })
  }
  years.sort((a, b) => a.year - b.year || a.basis.localeCompare(b.basis))
  return { quantity, years }
}

/** GET /api/calibration/misses's answer (and the CSV's rows). */
export function missesAnswer(d: PhaseData, filters: Partial<CalibrationFilters>, quantity: CalibrationQuantity, q: { sort: MissSort; dir: 'asc' | 'desc'; limit: number }, tolerance: number): CalibrationMiss[] {
  const mask = selection(d, filters).mask
  const col = d.q[quantity]
  const band = QUANTITY_INFO[quantity].side === 'band'
  const ratio = ratios(d, quantity)
  const order = missOrder(d, quantity, q.sort)
  const key = missKey(d, q.sort)
  const limit = q.limit
  const picked: number[] = []
  const band1 = tolerance + 1e-12
  const take = (r: number) => {
    if (!mask[r]) return
    const v = ratio[r]!
    if (band ? Math.abs(v - 1) <= band1 : v >= 1) return
    picked.push(r)
  }
  if (q.dir === 'asc') {
    for (let i = 0; i < order.length && picked.length < limit; i++) take(order[i]!)
  } else {
    // Descending by (key, ratio), ties (equal key and ratio) still by ascending brace id: runs of
    // equal (key, ratio) from the end, each read forward.
    const proj = d.project
    let i = order.length - 1
    while (i >= 0 && picked.length < limit) {
      const r = order[i]!
      const v = ratio[r]!
      const kv = key ? key[proj[r]!]! : 0
      let j = i
      while (j > 0) {
        const s = order[j - 1]!
        if (ratio[s] !== v || (key && key[proj[s]!] !== kv)) break
        j--
      }
      for (let k = j; k <= i && picked.length < limit; k++) take(order[k]!)
      i = j - 1
    }
  }
  const p = d.projects
  return picked.map(r => {
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
      ratio: ratio[r]!,
    }
  })
}

function projectsByCode(d: PhaseData): Int32Array {
  const x = derivedOf(d)
  if (!x.projectsByCode) {
    const rank = projectRanks(d).code
    x.projectsByCode = Int32Array.from(d.projects.id, (_, j) => j).sort((a, b) => rank[a]! - rank[b]! || a - b)
  }
  return x.projectsByCode
}

type Tonnage = Map<number, { preliminary: TonnageByCategory; final: TonnageByCategory }>
/** Per tonnage map (one per data version), per project: its cost part over all its rows. */
const wholeProjectCost = new WeakMap<PhaseData, WeakMap<Tonnage, (ProjectCost | undefined)[]>>()

/** GET /api/calibration/cost's answer. */
export function costAnswer(d: PhaseData, filters: Partial<CalibrationFilters>, tonnage: Tonnage): CalibrationCost {
  const t = tables(d, filters)
  const rowLevel = t.core || !!filters.configuration?.length
  const P = d.projects.id.length
  const count = new Int32Array(P)
  const first = new Int32Array(P).fill(-1)
  const rows = rowLevel ? selection(d, filters).rows : null
  if (rows) {
    for (let k = 0; k < rows.length; k++) {
      const pi = d.project[rows[k]!]!
      if (first[pi]! < 0) first[pi] = k
      count[pi]!++
    }
  } else {
    // Only project filters: a passing project keeps all its rows; its first row orders ties.
    const pc = projectRowCounts(d)
    for (let j = 0; j < P; j++) if (t.projectOk[j] && pc.count[j]) {
      first[j] = pc.first[j]!
      count[j] = pc.count[j]!
    }
  }
  // Projects in code order (localeCompare), ties in order of their first selected row.
  const byCode = projectsByCode(d)
  const rank = projectRanks(d).code
  const projects: number[] = []
  for (let i = 0; i < byCode.length; ) {
    let j = i + 1
    while (j < byCode.length && rank[byCode[j]!] === rank[byCode[i]!]) j++
    if (j === i + 1) {
      if (first[byCode[i]!]! >= 0) projects.push(byCode[i]!)
    } else {
      const run: number[] = []
      for (let k = i; k < j; k++) if (first[byCode[k]!]! >= 0) run.push(byCode[k]!)
      run.sort((a, b) => first[a]! - first[b]!)
      for (const pi of run) projects.push(pi)
    }
    i = j
  }
  const p = d.projects
  const input = (pi: number, tr: ArrayLike<number>, cr: ArrayLike<number>) => {
    const w = tonnage.get(p.id[pi]!)
    return { code: p.code[pi]!, name: p.name[pi]!, yearDesigned: p.yearDesigned[pi] ?? null, tmaxRatios: tr, cmaxRatios: cr, preliminary: w?.preliminary ?? {}, final: w?.final ?? {} }
  }
  const tr = ratios(d, 'tmax')
  const cr = ratios(d, 'cmax')
  if (!rows) {
    let perTonnage = wholeProjectCost.get(d)
    if (!perTonnage) wholeProjectCost.set(d, (perTonnage = new WeakMap()))
    let parts = perTonnage.get(tonnage)
    if (!parts) perTonnage.set(tonnage, (parts = new Array(P)))
    const pr = projectRowList(d)
    return costTotals(
      projects.map(pi => {
        let part = parts![pi]
        if (!part) {
          const list = pr.rows.subarray(pr.at[pi]!, pr.at[pi + 1]!)
          part = parts![pi] = costOfProject(input(pi, Float64Array.from(list, r => tr[r]!), Float64Array.from(list, r => cr[r]!)))
        }
        return part
      }),
    )
  }
  // Each project's ratios in row order, in one buffer.
  const at = new Int32Array(P)
  let off = 0
  for (const pi of projects) {
    at[pi] = off
    off += count[pi]!
  }
  const tb = new Float64Array(off)
  const cb = new Float64Array(off)
  const pos = at.slice()
  for (let k = 0; k < rows.length; k++) {
    const r = rows[k]!
    const i = pos[d.project[r]!]!++
    tb[i] = tr[r]!
    cb[i] = cr[r]!
  }
  return costTotals(projects.map(pi => costOfProject(input(pi, tb.subarray(at[pi]!, at[pi]! + count[pi]!), cb.subarray(at[pi]!, at[pi]! + count[pi]!)))))
}

/** Per project, its number of rows and its first row. */
function projectRowCounts(d: PhaseData): { count: Int32Array; first: Int32Array } {
  const x = derivedOf(d)
  if (!x.projectRows) {
    const P = d.projects.id.length
    const count = new Int32Array(P)
    const first = new Int32Array(P).fill(-1)
    for (let r = 0; r < d.n; r++) {
      const pi = d.project[r]!
      if (first[pi]! < 0) first[pi] = r
      count[pi]!++
    }
    const at = new Int32Array(P + 1)
    for (let j = 0; j < P; j++) at[j + 1] = at[j]! + count[j]!
    const rows = new Int32Array(d.n)
    const fill = at.slice(0, P)
    for (let r = 0; r < d.n; r++) rows[fill[d.project[r]!]!++] = r
    x.projectRows = { count, first, at, rows }
  }
  return x.projectRows
}

/** Per project, its rows ascending (rows[at[j]] … rows[at[j + 1] − 1]). */
function projectRowList(d: PhaseData): { at: Int32Array; rows: Int32Array } {
  projectRowCounts(d)
  return derivedOf(d).projectRows!
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

/** Suggestions and back-tests of a starting-factor query. */
export function startingAnswer(d: PhaseData, query: StartingFactorsQuery, settings: { minGroupSize: number; habitYears: number }): { suggestions: StartingSuggestion[]; backtest: StartingFactors['backtest'] } {
  return startingAnswerIndexed(d, tables(d, startingFilters(query)), query.quantile, settings)
}


import { STARTING_QUANTITIES, type BacktestYear, type StartingFactors, type StartingQuantity, type StartingSuggestion } from '@shared/schemas/calibration'
import { finishedYear, quantileOfSorted, ruleQuantile, ruleText, scoreValue, shrinkToward, shrunkQuantile, type FactorColumns } from '@shared/calibration'
import type { PhaseData } from './store'

/**
 * What every starting-factor query needs from one phase's data, worked out once per data version
 * (per quantity and basis): the firm's rows, their finals in ascending order, and the back-test's
 * "finished before year Y" buckets. A query then only filters and counts: its group's sorted finals
 * are the firm's sorted rows that pass the filter (no sort), and the back-test's growing pools are
 * order statistics over those rows (a Fenwick tree over value positions) instead of a merge of
 * every firm row per year. The answers are the ones `suggestStarting` / `backtest` give (the same
 * values in the same order, the same arithmetic); tests/api/starting-index.test.ts compares them.
 *
 * The app's path is `startingAnswerIndexed` (below): per basis, views of the firm's rows laid out in
 * final order and in assumed order (project, configuration, core area, bucket, year beside each),
 * so a query's group is one sequential pass per view with the filter tables of derived.ts, and the
 * back-test's pools are read through per-block counts (tests/api/calibration-derived.test.ts
 * compares it with the plain `suggestStarting` / `backtest`). `backtestIndexed` /
 * `groupSortedFinals` stay for that test and the benchmark's before/after.
 */

export interface BasisIndex {
  basis: number
  /** Firm rows on this basis, ascending (the order `startingFactors` has always used). */
  rows: Int32Array
  /** The same rows ordered by final value, ascending. */
  byValue: Int32Array
  /** Their finals in that order: the firm's sorted finals. */
  sorted: Float64Array
  /** Back-test buckets: keys (finished years) in the order `backtest` consumes them. */
  keys: number[]
  /** Bucket of each firm row, by row index (−1 for rows not on this basis). */
  bucketOf: Int32Array
  /** Distinct firm projects finished in the first k buckets, k = 0…keys.length. */
  firmProjectsAt: Int32Array
  /** Firm quantile after the first k buckets, per quantile p (bounded: see firmQuantilesAt). */
  firmQuantiles: Map<number, Float64Array>
}

export interface QuantityIndex {
  cols: FactorColumns
  /** Bases in order of first appearance over the rows. */
  bases: Map<number, BasisIndex>
}

export type StartingIndex = Record<StartingQuantity, QuantityIndex>

const indexes = new WeakMap<PhaseData, StartingIndex>()

/** The index of `d` (built on first use, kept as long as the phase data is). */
export function startingIndex(d: PhaseData): StartingIndex {
  let ix = indexes.get(d)
  if (!ix) {
    ix = buildIndex(d)
    indexes.set(d, ix)
  }
  return ix
}

function buildIndex(d: PhaseData): StartingIndex {
  const projectId = Int32Array.from(d.project)
  const out = {} as StartingIndex
  for (const quantity of STARTING_QUANTITIES) {
    const col = d.q[quantity]
    const cols: FactorColumns = { projectId, yearDesigned: d.yearDesigned, yearCompleted: d.yearCompleted, assumed: col.assumed, final: col.final }
    const lists = new Map<number, number[]>()
    for (let r = 0; r < d.n; r++) {
      const b = col.basis[r]!
      if (b >= 0) (lists.get(b) ?? lists.set(b, []).get(b)!).push(r)
    }
    const bases = new Map<number, BasisIndex>()
    for (const [b, list] of lists) bases.set(b, basisIndex(cols, b, Int32Array.from(list), d.n))
    out[quantity] = { cols, bases }
  }
  return out
}

function basisIndex(cols: FactorColumns, basis: number, rows: Int32Array, n: number): BasisIndex {
  const byValue = Int32Array.from(rows).sort((a, b) => cols.final[a]! - cols.final[b]!)
  const sorted = new Float64Array(byValue.length)
  for (let i = 0; i < byValue.length; i++) sorted[i] = cols.final[byValue[i]!]!
  // Buckets exactly as `backtest` makes them: keyed by finished year in order of first appearance
  // over the rows, the keys then sorted with the same comparator.
  const first = new Map<number, number>()
  for (let i = 0; i < rows.length; i++) {
    const y = finishedYear(cols, rows[i]!)
    if (!first.has(y)) first.set(y, first.size)
  }
  const keys = [...first.keys()].sort((a, b) => a - b)
  const rank = new Map(keys.map((k, i) => [k, i]))
  const bucketOf = new Int32Array(n).fill(-1)
  const projectsIn: Set<number>[] = keys.map(() => new Set())
  for (let i = 0; i < rows.length; i++) {
    const r = rows[i]!
    const k = rank.get(finishedYear(cols, r))!
    bucketOf[r] = k
    projectsIn[k]!.add(cols.projectId[r]!)
  }
  const firmProjectsAt = new Int32Array(keys.length + 1)
  const seen = new Set<number>()
  for (let k = 0; k < keys.length; k++) {
    for (const p of projectsIn[k]!) seen.add(p)
    firmProjectsAt[k + 1] = seen.size
  }
  return { basis, rows, byValue, sorted, keys, bucketOf, firmProjectsAt, firmQuantiles: new Map() }
}

/** Counts over positions 0…n−1 with prefix sums and k-th smallest in O(log n). */
class Fenwick {
  private tree: Int32Array
  private top: number
  size = 0
  constructor(private n: number) {
    this.tree = new Int32Array(n + 1)
    this.top = 1
    while (this.top * 2 <= n) this.top *= 2
  }
  add(pos: number) {
    for (let x = pos + 1; x <= this.n; x += x & -x) this.tree[x]!++
    this.size++
  }
  /** Position of the k-th (0-based) smallest position added. */
  kth(k: number): number {
    let pos = 0
    let rem = k + 1
    for (let step = this.top; step > 0; step >>= 1) {
      const next = pos + step
      if (next <= this.n && this.tree[next]! < rem) {
        pos = next
        rem -= this.tree[next]!
      }
    }
    return pos
  }
}

/** A sorted pool seen through a Fenwick tree: `values[kth(i)]` is its i-th smallest value. */
function poolView(fw: Fenwick, values: ArrayLike<number>): ArrayLike<number> {
  return new Proxy({} as ArrayLike<number>, {
    get: (_t, prop) => (prop === 'length' ? fw.size : typeof prop === 'string' ? values[fw.kth(Number(prop))] : undefined),
  })
}

const QUANTILE_MEMO = 32

/** The firm's quantile p after the first k buckets, k = 0…keys.length (NaN for an empty pool). */
export function firmQuantilesAt(ix: BasisIndex, p: number): Float64Array {
  const hit = ix.firmQuantiles.get(p)
  if (hit) return hit
  const out = new Float64Array(ix.keys.length + 1).fill(NaN)
  // Positions (in value order) of each bucket's rows.
  const inBucket: number[][] = ix.keys.map(() => [])
  for (let i = 0; i < ix.byValue.length; i++) inBucket[ix.bucketOf[ix.byValue[i]!]!]!.push(i)
  const fw = new Fenwick(ix.byValue.length)
  const view = poolView(fw, ix.sorted)
  for (let k = 0; k < ix.keys.length; k++) {
    for (const pos of inBucket[k]!) fw.add(pos)
    out[k + 1] = quantileOfSorted(view, p)
  }
  if (ix.firmQuantiles.size >= QUANTILE_MEMO) ix.firmQuantiles.delete(ix.firmQuantiles.keys().next().value!)
  ix.firmQuantiles.set(p, out)
  return out
}

/** The group's finals sorted ascending: the firm's sorted rows on this basis that are in the group. */
export function groupSortedFinals(ix: BasisIndex, inGroup: Uint8Array, count: number): Float64Array {
  const out = new Float64Array(count)
  let m = 0
  for (let i = 0; i < ix.byValue.length && m < count; i++) if (inGroup[ix.byValue[i]!]) out[m++] = ix.sorted[i]!
  return out
}

/**
 * `backtest(cols, groupRows, ix.rows, o)` on the index: the same years, values and order.
 * `groupRows` are the group's rows on this basis (ascending), `inGroup` marks them by row index.
 */
export function backtestIndexed(cols: FactorColumns, ix: BasisIndex, groupRows: ArrayLike<number>, inGroup: Uint8Array, o: { quantity: StartingQuantity; quantile: number; minGroupSize: number }): BacktestYear[] {
  const p = ruleQuantile(o.quantity, o.quantile)
  const byYear = new Map<number, number[]>()
  for (let i = 0; i < groupRows.length; i++) {
    const r = groupRows[i]!
    const y = cols.yearDesigned[r]!
    ;(byYear.get(y) ?? byYear.set(y, []).get(y)!).push(r)
  }
  const years = [...byYear.keys()].sort((a, b) => a - b)
  const firmAt = firmQuantilesAt(ix, p)
  // The group's rows as positions in the group's value order, listed per bucket.
  const B = ix.keys.length
  const groupInBucket: number[][] = Array.from({ length: B }, () => [])
  let g = 0
  for (let i = 0; i < ix.byValue.length; i++) {
    const r = ix.byValue[i]!
    if (inGroup[r]) groupInBucket[ix.bucketOf[r]!]!.push(g++)
  }
  const groupValues = groupSortedFinals(ix, inGroup, g)
  const groupRowAt = new Int32Array(g)
  g = 0
  for (let i = 0; i < ix.byValue.length; i++) if (inGroup[ix.byValue[i]!]) groupRowAt[g++] = ix.byValue[i]!
  const fw = new Fenwick(g)
  const groupPool = poolView(fw, groupValues)
  const groupProjects = new Set<number>()
  let next = 0
  const out: BacktestYear[] = []
  for (const year of years) {
    while (next < B && ix.keys[next]! < year) {
      for (const pos of groupInBucket[next]!) {
        fw.add(pos)
        groupProjects.add(cols.projectId[groupRowAt[pos]!]!)
      }
      next++
    }
    if (next === 0) continue
    const groupValue = fw.size ? quantileOfSorted(groupPool, p) : null
    const v = shrinkToward(groupValue, firmAt[next]!, fw.size ? groupProjects.size : 0, o.minGroupSize)
    const rows = byYear.get(year)!
    let sAbove = 0
    let sCons = 0
    let hAbove = 0
    let hCons = 0
    const projects = new Set<number>()
    for (const r of rows) {
      const f = cols.final[r]!
      const a = cols.assumed[r]!
      projects.add(cols.projectId[r]!)
      if (f > v.suggested) sAbove++
      sCons += v.suggested / f - 1
      if (f > a) hAbove++
      hCons += a / f - 1
    }
    const n = rows.length
    out.push({
      year,
      projects: projects.size,
      braces: n,
      trainedOn: v.shrunk ? ix.firmProjectsAt[next]! : groupProjects.size,
      suggested: v.suggested,
      suggestedUnderestimateRate: sAbove / n,
      suggestedMeanConservatism: sCons / n,
      habitUnderestimateRate: hAbove / n,
      habitMeanConservatism: hCons / n,
    })
  }
  return out
}

const LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1

/**
 * `rows` stably sorted by `v[row]` ascending, all values ≥ 0 and not NaN (an LSD radix sort on the
 * IEEE 754 bits, which order such doubles as unsigned integers).
 */
export function sortByValue(rows: Int32Array, v: Float64Array): Int32Array {
  if (!LITTLE_ENDIAN || v.byteOffset % 8 !== 0) return Int32Array.from(rows).sort((a, b) => v[a]! - v[b]!) // typed-array sort is stable
  const bits = new Uint32Array(v.buffer, v.byteOffset, v.length * 2)
  let a = Int32Array.from(rows)
  let b = new Int32Array(rows.length)
  const count = new Int32Array(65537)
  for (let pass = 0; pass < 4 && a.length; pass++) {
    const word = pass >> 1
    const shift = (pass & 1) * 16
    count.fill(0)
    for (let i = 0; i < a.length; i++) count[((bits[2 * a[i]! + word]! >>> shift) & 0xffff) + 1]!++
    if (count[((bits[2 * a[0]! + word]! >>> shift) & 0xffff) + 1] === a.length) continue // one key: order unchanged
    for (let k = 1; k < 65537; k++) count[k]! += count[k - 1]!
    for (let i = 0; i < a.length; i++) b[count[(bits[2 * a[i]! + word]! >>> shift) & 0xffff]!++] = a[i]!
    ;[a, b] = [b, a]
  }
  return a
}

/** A query's filter tables (see derived.ts): project and configuration codes that pass, and the core-area band. */
export interface FilterTables {
  projectOk: Uint8Array
  configOk: Uint8Array
  core: boolean
  lo: number
  hi: number
}

/** Columns of a basis's firm rows laid out in an order (by final, or by assumed), for sequential passes. */
interface BasisView {
  rows: Int32Array
  project: Int32Array
  config: Int32Array
  core: Float64Array
  /** Final (by-final view) or assumed (by-assumed view) value, ascending. */
  value: Float64Array
  /** Back-test bucket of each row. */
  extra: Int32Array
  /** Year designed of each row (NaN when missing). */
  year: Float64Array
}

const views = new WeakMap<BasisIndex, { byFinal: BasisView; byAssumed: BasisView }>()

function viewsOf(d: PhaseData, cols: FactorColumns, ix: BasisIndex) {
  let v = views.get(ix)
  if (!v) {
    const make = (rows: Int32Array, value: ArrayLike<number>): BasisView => {
      const n = rows.length
      const out: BasisView = { rows, project: new Int32Array(n), config: new Int32Array(n), core: new Float64Array(n), value: new Float64Array(n), extra: new Int32Array(n), year: new Float64Array(n) }
      for (let i = 0; i < n; i++) {
        const r = rows[i]!
        out.project[i] = d.project[r]!
        out.config[i] = d.configuration.codes[r]!
        out.core[i] = d.finalCoreArea[r]!
        out.value[i] = value[r]!
        out.extra[i] = ix.bucketOf[r]!
        out.year[i] = cols.yearDesigned[r]!
      }
      return out
    }
    const assumed = cols.assumed instanceof Float64Array ? cols.assumed : Float64Array.from(cols.assumed)
    v = {
      byFinal: make(ix.byValue, cols.final),
      byAssumed: make(sortByValue(ix.rows, assumed), cols.assumed),
    }
    views.set(ix, v)
  }
  return v
}

/** Positions in `v` of the rows passing the filter tables, ascending. */
function passing(v: BasisView, t: FilterTables): Int32Array {
  const n = v.rows.length
  const out = new Int32Array(n)
  const { projectOk, configOk, lo, hi } = t
  const vp = v.project
  const vc = v.config
  const core = v.core
  let m = 0
  if (t.core) {
    for (let i = 0; i < n; i++) if (projectOk[vp[i]!] && configOk[vc[i]!] && core[i]! >= lo && core[i]! <= hi) out[m++] = i
  } else {
    for (let i = 0; i < n; i++) if (projectOk[vp[i]!] && configOk[vc[i]!]) out[m++] = i
  }
  return out.subarray(0, m)
}

/** Distinct values counter over small non-negative integers (project indices), reset in O(1). */
class Distinct {
  private stamp: Int32Array
  private now = 0
  size = 0
  constructor(n: number) {
    this.stamp = new Int32Array(n)
  }
  clear() {
    this.now++
    this.size = 0
  }
  add(v: number) {
    if (this.stamp[v] !== this.now) {
      this.stamp[v] = this.now
      this.size++
    }
  }
}

/**
 * Suggestions and back-tests for the comparable group: the rows `groupRows` (ascending) passing the
 * filter tables `t`. The same answer as `suggestStarting` / `backtest` of shared/calibration on the
 * group's and the firm's rows (reference.ts `refStarting`; tests/api/calibration-derived.test.ts),
 * from passes over the per-basis views: the group's sorted finals and the habit's sorted assumed
 * values are the views' rows that pass the filters, in view order (no sort per query).
 */
export function startingAnswerIndexed(d: PhaseData, groupRows: Int32Array, t: FilterTables, quantile: number, settings: { minGroupSize: number; habitYears: number }): { suggestions: StartingSuggestion[]; backtest: StartingFactors['backtest'] } {
  const index = startingIndex(d)
  const suggestions: StartingSuggestion[] = []
  const backtests = {} as StartingFactors['backtest']
  const P = d.projects.id.length
  const distinct = new Distinct(P)
  for (const quantity of STARTING_QUANTITIES) {
    const col = d.q[quantity]
    const { cols, bases: firmBy } = index[quantity]
    const p = ruleQuantile(quantity, quantile)
    // Per basis: the group's positions in the by-final view, and its first row (for the order of bases).
    const per = new Map<number, { ix: BasisIndex; pos: Int32Array; firstRow: number }>()
    for (const [b, ix] of firmBy) {
      const pos = passing(viewsOf(d, cols, ix).byFinal, t)
      let firstRow = Infinity
      const rows = ix.byValue
      for (let k = 0; k < pos.length; k++) if (rows[pos[k]!]! < firstRow) firstRow = rows[pos[k]!]!
      per.set(b, { ix, pos, firstRow })
    }
    const inGroup = [...per.keys()].filter(b => per.get(b)!.pos.length > 0).sort((a, b) => per.get(a)!.firstRow - per.get(b)!.firstRow)
    const gn = (b: number) => per.get(b)!.pos.length
    const bases = (inGroup.length ? inGroup : [...firmBy.keys()]).sort((a, b) => gn(b) - gn(a) || firmBy.get(b)!.rows.length - firmBy.get(a)!.rows.length)
    for (const b of bases) {
      const { ix, pos } = per.get(b)!
      const v = viewsOf(d, cols, ix)
      const groupFinals = new Float64Array(pos.length)
      distinct.clear()
      let latest = -Infinity
      const fv = v.byFinal
      for (let k = 0; k < pos.length; k++) {
        const i = pos[k]!
        groupFinals[k] = fv.value[i]!
        distinct.add(fv.project[i]!)
        const y = fv.year[i]!
        if (Number.isFinite(y) && y > latest) latest = y
      }
      const projects = distinct.size
      // The habit (habitOf): the median assumed value of the group's rows designed after latest − habitYears,
      // read in assumed order off the by-assumed view.
      let habit: number | null = null
      if (latest !== -Infinity) {
        const a = v.byAssumed
        const recent = new Float64Array(pos.length)
        const since = latest - settings.habitYears
        const { projectOk, configOk, lo, hi } = t
        const n = a.rows.length
        let m = 0
        for (let i = 0; i < n; i++) {
          const y = a.year[i]!
          if (!(y > since) || !Number.isFinite(y) || !projectOk[a.project[i]!] || !configOk[a.config[i]!]) continue
          if (t.core && !(a.core[i]! >= lo && a.core[i]! <= hi)) continue
          recent[m++] = a.value[i]!
        }
        habit = quantileOfSorted(recent.subarray(0, m), 0.5)
      }
      const sv = shrunkQuantile(groupFinals, ix.sorted, p, settings.minGroupSize, projects)
      const judged = groupFinals.length ? groupFinals : ix.sorted
      const s = scoreValue(sv.suggested, judged)
      const h = habit === null ? null : scoreValue(habit, judged)
      suggestions.push({
        quantity,
        basis: col.bases[b]!,
        suggested: sv.suggested,
        groupValue: sv.groupValue,
        firmValue: sv.firmValue,
        groupSize: projects,
        shrunk: sv.shrunk,
        weight: sv.weight,
        habit,
        underestimateRateSuggested: s.underestimateRate,
        underestimateRateHabit: h?.underestimateRate ?? null,
        meanConservatismSuggested: s.meanConservatism,
        meanConservatismHabit: h?.meanConservatism ?? null,
        rule: ruleText(quantity, quantile, settings.minGroupSize),
      })
    }
    const primary = bases[0]
    if (primary === undefined) {
      backtests[quantity] = []
      continue
    }
    backtests[quantity] = backtestOnViews(d, cols, per.get(primary)!.ix, per.get(primary)!.pos, groupRows, col.basis, primary, p, settings.minGroupSize)
  }
  return { suggestions, backtest: backtests }
}

const yearCodesOf = new WeakMap<PhaseData, { codes: Int32Array; years: number[] }>()
/** Each row's year designed as a code into `years` (NaN, the missing year, is one value like any other). */
function yearCodes(d: PhaseData): { codes: Int32Array; years: number[] } {
  let y = yearCodesOf.get(d)
  if (!y) {
    const years: number[] = []
    const at = new Map<number, number>()
    const codes = new Int32Array(d.n)
    for (let r = 0; r < d.n; r++) {
      const v = d.yearDesigned[r]!
      let c = at.get(v)
      if (c === undefined) {
        c = years.length
        years.push(v)
        at.set(v, c)
      }
      codes[r] = c
    }
    y = { codes, years }
    yearCodesOf.set(d, y)
  }
  return y
}

const BLOCK = 8

/**
 * `backtest(cols, groupRows on the basis, ix.rows, …)`: the group's growing pools as order statistics
 * over the group's value-ordered positions `pos` (per-block counts of the buckets added so far,
 * then a scan of one block), and each year's scores accumulated in one pass over the group's rows in
 * ascending order (the order, and so the floating-point sums, of `backtest`).
 */
function backtestOnViews(d: PhaseData, cols: FactorColumns, ix: BasisIndex, pos: Int32Array, groupRows: Int32Array, basis: Int32Array, b: number, p: number, minGroupSize: number): BacktestYear[] {
  const v = viewsOf(d, cols, ix).byFinal
  const G = pos.length
  const B = ix.keys.length
  const NB = (G >> BLOCK) + 1
  const bucket = new Int32Array(G)
  const values = new Float64Array(G)
  const blockHist = new Int32Array(NB * B)
  const inBucket = new Int32Array(B)
  // Distinct group projects in the pool after k buckets: a project joins with its earliest bucket.
  const P = d.projects.id.length
  const minBucket = new Int32Array(P).fill(-1)
  for (let k = 0; k < G; k++) {
    const i = pos[k]!
    const bk = v.extra[i]!
    bucket[k] = bk
    values[k] = v.value[i]!
    blockHist[(k >> BLOCK) * B + bk]!++
    inBucket[bk]!++
    const pr = v.project[i]!
    if (minBucket[pr]! < 0 || bk < minBucket[pr]!) minBucket[pr] = bk
  }
  const projectsAt = new Int32Array(B + 1)
  for (let j = 0; j < P; j++) if (minBucket[j]! >= 0) projectsAt[minBucket[j]! + 1]!++
  for (let k = 1; k <= B; k++) projectsAt[k]! += projectsAt[k - 1]!

  // Years of the group's rows (ascending rows) on this basis, in order of first appearance; counts and projects per year.
  const { codes: yc, years: yearOf } = yearCodes(d)
  const Y = yearOf.length
  const braces = new Int32Array(Y)
  const projects = new Int32Array(Y)
  const seen = new Uint8Array(Y * P)
  const firstSeen: number[] = []
  for (let k = 0; k < groupRows.length; k++) {
    const r = groupRows[k]!
    if (basis[r] !== b) continue
    const y = yc[r]!
    if (braces[y]!++ === 0) firstSeen.push(y)
    const key = y * P + cols.projectId[r]!
    if (!seen[key]) {
      seen[key] = 1
      projects[y]!++
    }
  }
  const years = firstSeen.map(y => yearOf[y]!).sort((a, c) => a - c)
  const codeOf = new Map(firstSeen.map(y => [yearOf[y]!, y]))
  const firmAt = firmQuantilesAt(ix, p)
  // The pool after `next` buckets, read through per-block counts.
  const blockCount = new Int32Array(NB)
  let size = 0
  let next = 0
  const kth = (j: number): number => {
    let blk = 0
    let cum = 0
    while (cum + blockCount[blk]! <= j) cum += blockCount[blk++]!
    for (let k = blk << BLOCK; ; k++) {
      if (bucket[k]! < next) {
        if (cum === j) return values[k]!
        cum++
      }
    }
  }
  const pool = new Proxy({} as ArrayLike<number>, {
    get: (_t, prop) => (prop === 'length' ? size : typeof prop === 'string' ? kth(Number(prop)) : undefined),
  })
  const suggested = new Float64Array(Y)
  const trained = new Int32Array(Y)
  const scored = new Uint8Array(Y)
  for (const year of years) {
    while (next < B && ix.keys[next]! < year) {
      for (let blk = 0; blk < NB; blk++) blockCount[blk]! += blockHist[blk * B + next]!
      size += inBucket[next]!
      next++
    }
    if (next === 0) continue
    const groupValue = size ? quantileOfSorted(pool, p) : null
    const sv = shrinkToward(groupValue, firmAt[next]!, size ? projectsAt[next]! : 0, minGroupSize)
    const y = codeOf.get(year)!
    suggested[y] = sv.suggested
    trained[y] = sv.shrunk ? ix.firmProjectsAt[next]! : projectsAt[next]!
    scored[y] = 1
  }
  const sAbove = new Int32Array(Y)
  const hAbove = new Int32Array(Y)
  const sCons = new Float64Array(Y)
  const hCons = new Float64Array(Y)
  for (let k = 0; k < groupRows.length; k++) {
    const r = groupRows[k]!
    if (basis[r] !== b) continue
    const y = yc[r]!
    if (!scored[y]) continue
    const f = cols.final[r]!
    const a = cols.assumed[r]!
    const s = suggested[y]!
    if (f > s) sAbove[y]!++
    sCons[y]! += s / f - 1
    if (f > a) hAbove[y]!++
    hCons[y]! += a / f - 1
  }
  const out: BacktestYear[] = []
  for (const year of years) {
    const y = codeOf.get(year)!
    if (!scored[y]) continue
    const n = braces[y]!
    out.push({
      year,
      projects: projects[y]!,
      braces: n,
      trainedOn: trained[y]!,
      suggested: suggested[y]!,
      suggestedUnderestimateRate: sAbove[y]! / n,
      suggestedMeanConservatism: sCons[y]! / n,
      habitUnderestimateRate: hAbove[y]! / n,
      habitMeanConservatism: hCons[y]! / n,
    })
  }
  return out
}

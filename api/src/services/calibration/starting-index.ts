import { STARTING_QUANTITIES, type BacktestYear, type StartingQuantity } from '@shared/schemas/calibration'
import { finishedYear, quantileOfSorted, ruleQuantile, shrinkToward, type FactorColumns } from '@shared/calibration'
import type { PhaseData } from './store'

/**
 * What every starting-factor query needs from one phase's data, worked out once per data version
 * (per quantity and basis): the firm's rows, their finals in ascending order, and the back-test's
 * "finished before year Y" buckets. A query then only filters and counts: its group's sorted finals
 * are the firm's sorted rows that pass the filter (no sort), and the back-test's growing pools are
 * order statistics over those rows (a Fenwick tree over value positions) instead of a merge of
 * every firm row per year. The answers are the ones `suggestStarting` / `backtest` give (the same
 * values in the same order, the same arithmetic); tests/api/starting-index.test.ts compares them.
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

import { STARTING_QUANTITIES, type BacktestYear, type StartingFactors, type StartingQuantity, type StartingSuggestion } from '@shared/schemas/calibration'
import { finishedYear, quantileOfSorted, ruleQuantile, ruleText, shrinkToward, type FactorColumns } from '@shared/calibration'
import type { PhaseData } from './store'

/**
 * What every starting-factor query needs from one phase's data, worked out once per data version
 * (per quantity and basis): the firm's rows, their finals in ascending order, the distinct finals and
 * assumed values with each row's rank among them, and the back-test's "finished before year Y"
 * buckets. A query then only filters and counts. The answers are the ones `suggestStarting` /
 * `backtest` give (the same values in the same order, the same arithmetic); tests compare them.
 *
 * The app's path is `startingAnswerIndexed` (below), on a cell layout of the rows (see Layout): a
 * query's group is a set of cells, read as a few long stretches; one pass over them counts, per
 * quantity, the group's finals per distinct value (a histogram per basis: the group's sorted finals
 * without a sort) and the recent rows' assumed values (the habit), its projects, and on the
 * primary basis the back-test's pool per bucket and final; the scores run over the distinct values
 * with their counts, in the order of the sorted finals; the back-test's year sums read the group's
 * rows in ascending row order off a bit set over a canonical order. What does not depend on the
 * quantile is kept per group for the next query with the same filters.
 * tests/api/calibration-derived.test.ts compares it with reference.ts's plain computation.
 * `backtestIndexed` / `groupSortedFinals` stay for tests/api/starting-index.test.ts and the
 * benchmark's before/after.
 *
 * The finals and assumed values on a basis are finite and positive (pairValue keeps no other pair),
 * so equal values are interchangeable in every sum and the radix sort of `sortByValue` applies.
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
  /** The distinct finals on this basis, ascending, and how many firm rows hold each. */
  finalValues: Float64Array
  finalCounts: Int32Array
  /** The distinct assumed values on this basis, ascending. */
  assumedValues: Float64Array
  /** The firm's pool in value order as buckets, with per-block counts per bucket (firmQuantilesAt builds it). */
  firmPool: { bucket: Int32Array; blockHist: Int32Array } | undefined
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
  const out = {} as StartingIndex
  for (const quantity of STARTING_QUANTITIES) out[quantity] = startingQuantityIndex(d, quantity)
  return out
}

const quantityIndexes = new WeakMap<PhaseData, { projectId: Int32Array; built: Partial<StartingIndex> }>()

/** One quantity's part of the index of `d` (built on first use; a background build takes them one by one). */
export function startingQuantityIndex(d: PhaseData, quantity: StartingQuantity): QuantityIndex {
  return quantityIndexes.get(d)?.built[quantity] ?? drain(quantityIndexSteps(d, quantity))
}

/** Runs a build made of steps (see `quantityIndexSteps`) to its end, at once. */
export function drain<T>(steps: Generator<void, T>): T {
  for (;;) {
    const r = steps.next()
    if (r.done) return r.value
  }
}

/**
 * Builds one quantity's part of the index of `d` step by step: it yields after grouping the rows by
 * basis and after each basis, so a background build can let requests run in between. Kept when
 * done (the first to finish, if a request built the same part meanwhile).
 */
export function* quantityIndexSteps(d: PhaseData, quantity: StartingQuantity): Generator<void, QuantityIndex> {
  let parts = quantityIndexes.get(d)
  if (!parts) quantityIndexes.set(d, (parts = { projectId: Int32Array.from(d.project), built: {} }))
  const done = parts.built[quantity]
  if (done) return done
  const col = d.q[quantity]
  const cols: FactorColumns = { projectId: parts.projectId, yearDesigned: d.yearDesigned, yearCompleted: d.yearCompleted, assumed: col.assumed, final: col.final }
  const lists = new Map<number, number[]>()
  for (let r = 0; r < d.n; r++) {
    const b = col.basis[r]!
    if (b >= 0) (lists.get(b) ?? lists.set(b, []).get(b)!).push(r)
  }
  yield
  const bases = new Map<number, BasisIndex>()
  for (const [b, list] of lists) {
    bases.set(b, basisIndex(cols, b, Int32Array.from(list), d.n))
    yield
  }
  return (parts.built[quantity] ??= { cols, bases })
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
  // Distinct finals (ascending, with the firm's count of each) and distinct assumed values.
  let m = 0
  for (let i = 0; i < sorted.length; i++) if (i === 0 || sorted[i] !== sorted[i - 1]) m++
  const finalValues = new Float64Array(m)
  const finalCounts = new Int32Array(m)
  m = 0
  for (let i = 0; i < sorted.length; i++) {
    if (i === 0 || sorted[i] !== sorted[i - 1]) finalValues[m++] = sorted[i]!
    finalCounts[m - 1]!++
  }
  const assumed = Float64Array.from(rows, r => cols.assumed[r]!).sort()
  m = 0
  for (let i = 0; i < assumed.length; i++) if (i === 0 || assumed[i] !== assumed[i - 1]) assumed[m++] = assumed[i]!
  return { basis, rows, byValue, sorted, keys, bucketOf, firmProjectsAt, firmQuantiles: new Map(), finalValues, finalCounts, assumedValues: assumed.slice(0, m), firmPool: undefined }
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

/**
 * `quantileOfSorted` of a sorted sequence of length n whose i-th value is `at(i)`: the type-7
 * quantile reads the first value (p = 0), the last (p = 1), or the two order statistics around
 * (n − 1)·p, so only those are looked up, and the same function does the arithmetic.
 */
export function quantileBy(n: number, p: number, at: (i: number) => number): number {
  const view: { length: number; [i: number]: number } = { length: n }
  if (n > 0 && p >= 0 && p <= 1) {
    if (p === 0) view[0] = at(0)
    else if (p === 1) view[n - 1] = at(n - 1)
    else {
      const h = (n - 1) * p
      const lo = Math.floor(h)
      const hi = Math.ceil(h)
      view[lo] = at(lo)
      if (hi !== lo) view[hi] = at(hi)
    }
  }
  return quantileOfSorted(view, p)
}

/** Counts, in the narrowest array that holds them (kept stats are many). */
type Counts = Int32Array | Uint16Array | Uint8Array

/** A copy of a[from, to) in the narrowest of Uint8Array, Uint16Array, Int32Array that holds its values (all ≥ 0). */
function narrow(a: Int32Array, from = 0, to = a.length): Counts {
  let max = 0
  for (let i = from; i < to; i++) if (a[i]! > max) max = a[i]!
  return max < 256 ? Uint8Array.from(a.subarray(from, to)) : max < 65536 ? Uint16Array.from(a.subarray(from, to)) : a.slice(from, to)
}

/**
 * `quantileOfSorted` of the sorted sequence holding counts[i] copies of values[i] (n copies in
 * all); one walk over the counts serves both order statistics (quantileBy asks in ascending order).
 */
function quantileOfCounts(counts: Counts, values: Float64Array, n: number, p: number): number {
  let i = 0
  let cum = counts[0] ?? 0
  return quantileBy(n, p, j => {
    while (j >= cum) cum += counts[++i]!
    return values[i]!
  })
}

const BLOCK = 8

/**
 * The j-th smallest (0-based) value of a growing pool: positions k (in value order, `values[k]`
 * ascending) whose bucket[k] < next; blockCount[blk] holds how many there are in block blk of 2^BLOCK positions.
 */
function poolKth(j: number, blockCount: Int32Array, bucket: Int32Array, values: Float64Array, next: number): number {
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

const QUANTILE_MEMO = 32

/** The firm's quantile p after the first k buckets, k = 0…keys.length (NaN for an empty pool). */
export function firmQuantilesAt(ix: BasisIndex, p: number): Float64Array {
  const hit = ix.firmQuantiles.get(p)
  if (hit) return hit
  const B = ix.keys.length
  const N = ix.byValue.length
  const NB = (N >> BLOCK) + 1
  if (!ix.firmPool) {
    const bucket = new Int32Array(N)
    const blockHist = new Int32Array(NB * B)
    for (let i = 0; i < N; i++) {
      const bk = ix.bucketOf[ix.byValue[i]!]!
      bucket[i] = bk
      blockHist[(i >> BLOCK) * B + bk]!++
    }
    ix.firmPool = { bucket, blockHist }
  }
  const { bucket, blockHist } = ix.firmPool
  const out = new Float64Array(B + 1).fill(NaN)
  const blockCount = new Int32Array(NB)
  let size = 0
  for (let k = 0; k < B; k++) {
    for (let blk = 0; blk < NB; blk++) {
      const c = blockHist[blk * B + k]!
      blockCount[blk]! += c
      size += c
    }
    out[k + 1] = quantileBy(size, p, j => poolKth(j, blockCount, bucket, ix.sorted, k + 1))
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
    const groupValue = fw.size ? quantileBy(fw.size, p, i => groupValues[fw.kth(i)]!) : null
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
  return drain(sortByValueParts(rows, v))
}

/** `sortByValue` in parts: it yields after each pass of the radix sort (a background build pauses there). */
export function* sortByValueParts(rows: Int32Array, v: Float64Array): Generator<void, Int32Array> {
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
    yield
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

// ————————————————————————————————————————————— the app's path

/**
 * The cell layout of the app's path. A starting-factor query filters projects by supplier and year
 * designed and rows by configuration and core area, so rows sharing (project supplier, project
 * year designed, row year designed, configuration, core area) — a cell — are all in the group or
 * all out. The cells are numbered in that order, so a query's cells lie next to each other.
 *
 * Quantities whose rows sit on the same bases (the same basis code on every row, as when the bases
 * are code editions) share a partition. A partition lays its rows out by basis and cell (a run per
 * basis and cell, runs of a basis in cell order), with what a query reads per row beside them in
 * that order — the project, the back-test bucket, the canonical position, and per quantity the
 * ranks of the final and the assumed value, interleaved — so a query reads long stretches
 * sequentially, never tests a row, and reads each row once for all the partition's quantities.
 * Per run the first row is kept, so the order of the bases, the primary basis and each basis's
 * latest year (the habit's window) are known before the rows are read. Nothing the answer depends
 * on follows the order inside a run.
 *
 * The back-test sums each year's scores over the group's rows in ascending row order; for that
 * each basis's rows are also kept in a canonical order (by year designed, then row), with each
 * quantity's finals and habit terms: the query marks its rows' canonical positions in a bit set and
 * reads the marked positions in order.
 */
interface Layout {
  /** Per cell: its project class (supplier and year designed of the projects), configuration code, core area and year designed (codes into yearCodes). */
  cellClass: Int32Array
  cellConfig: Int32Array
  cellCore: Float64Array
  cellYear: Int32Array
  /** Per project, its class; per class, one of its projects. */
  classOf: Int32Array
  classProject: Int32Array
  partitions: Partition[]
}

interface Partition {
  /** The quantities sharing it (members), Q of them; number of bases (codes 0…nb−1). */
  members: StartingQuantity[]
  Q: number
  nb: number
  /** Run of basis b and cell c (k = b·C + c): laid-out positions [runAt[k], runAt[k + 1]); its first row (d.n when empty). */
  runAt: Int32Array
  runFirst: Int32Array
  /** Per laid-out row: project, back-test bucket (on its basis), canonical position. */
  project: Int32Array
  bucket: Int32Array
  canonical: Int32Array
  /**
   * Per laid-out row i and member m (at i·Q + m): the rank of the final and of the assumed value in
   * one numbering over all members and bases; member m's basis b holds ranks
   * [finalAt[m·(nb + 1) + b], finalAt[m·(nb + 1) + b + 1]) (its distinct finals in order), likewise assumedAt.
   */
  final: Int32Array
  finalAt: Int32Array
  assumed: Int32Array
  assumedAt: Int32Array
  /** Basis b's canonical positions [canonicalAt[b], canonicalAt[b + 1]); those of its rows designed in year code y from canonYearAt[b·(Y + 1) + y]. */
  canonicalAt: Int32Array
  canonYearAt: Int32Array
  /** Per member, per canonical position: final, assumed / final − 1, final > assumed. */
  canon: { final: Float64Array; habitTerm: Float64Array; habitUnder: Uint8Array }[]
}

const layouts = new WeakMap<PhaseData, Layout>()

/** The app path's layout of `d` (built on first use with the index, kept as long as the phase data is). */
export function startingLayout(d: PhaseData): Layout {
  return layouts.get(d) ?? drain(layoutSteps(d))
}

/** Builds the layout of `d` step by step (yielding before each partition), kept when done as `startingLayout`'s. */
export function* layoutSteps(d: PhaseData): Generator<void, Layout> {
  const known = layouts.get(d)
  if (known) return known
  const L = yield* buildLayout(d, startingIndex(d))
  if (!layouts.has(d)) layouts.set(d, L)
  return layouts.get(d)!
}

function sameCodes(a: Int32Array, b: Int32Array): boolean {
  if (a.length !== b.length) return false
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false
  return true
}

function* buildLayout(d: PhaseData, index: StartingIndex): Generator<void, Layout> {
  const n = d.n
  const P = d.projects.id.length
  const { codes: yc, years } = yearCodes(d)
  const Y = years.length
  // Project classes: (supplier, year designed) of the project.
  const classKey = new Map<string, number>()
  const classOf = new Int32Array(P)
  const classProject: number[] = []
  for (let j = 0; j < P; j++) {
    const k = JSON.stringify([d.projects.supplier[j] ?? null, d.projects.yearDesigned[j] ?? null])
    let c = classKey.get(k)
    if (c === undefined) {
      c = classProject.length
      classProject.push(j)
      classKey.set(k, c)
    }
    classOf[j] = c
  }
  // Cells, numbered in order of first appearance.
  const coreCode = new Map<number, number>()
  const cfgN = d.configuration.values.length + 1
  const cellKey = new Map<number | string, number>()
  // A cell's key as one number while it stays exact, else as text.
  const numeric = classProject.length * (Y + 1) * (cfgN + 1) * (n + 1) < Number.MAX_SAFE_INTEGER
  const cellOf = new Int32Array(n)
  const cellClass: number[] = []
  const cellConfig: number[] = []
  const cellCore: number[] = []
  const cellYear: number[] = []
  for (let r = 0; r < n; r++) {
    const a = d.finalCoreArea[r]!
    let cc = coreCode.get(a)
    if (cc === undefined) coreCode.set(a, (cc = coreCode.size))
    const cls = classOf[d.project[r]!]!
    const cfg = d.configuration.codes[r]!
    const key = numeric ? ((cls * Y + yc[r]!) * cfgN + cfg + 1) * (n + 1) + cc : `${cls}|${yc[r]}|${cfg}|${cc}`
    let c = cellKey.get(key)
    if (c === undefined) {
      c = cellClass.length
      cellKey.set(key, c)
      cellClass.push(cls)
      cellConfig.push(cfg)
      cellCore.push(a)
      cellYear.push(yc[r]!)
    }
    cellOf[r] = c
  }
  // Cells renumbered in (supplier, year designed of the project, of the row, configuration, core
  // area) order, so that a query's cells (one supplier or all, a configuration or all, a band of
  // core areas) lie next to each other: its rows are then a few long stretches of the layout.
  const C = cellClass.length
  const supplierOf = (c: number) => d.projects.supplier[classProject[cellClass[c]!]!] ?? null
  const projectYear = (c: number) => d.projects.yearDesigned[classProject[cellClass[c]!]!] ?? Infinity
  const last = (v: number) => (Number.isNaN(v) ? Infinity : v)
  const byKey = Array.from({ length: C }, (_, c) => c).sort((a, b) => {
    const sa = supplierOf(a)
    const sb = supplierOf(b)
    if (sa !== sb) return sa === null ? 1 : sb === null ? -1 : sa < sb ? -1 : 1
    return (
      projectYear(a) - projectYear(b) ||
      cellClass[a]! - cellClass[b]! ||
      last(years[cellYear[a]!]!) - last(years[cellYear[b]!]!) ||
      cellYear[a]! - cellYear[b]! ||
      cellConfig[a]! - cellConfig[b]! ||
      last(cellCore[a]!) - last(cellCore[b]!) ||
      a - b
    )
  })
  const rank = new Int32Array(C)
  for (let k = 0; k < C; k++) rank[byKey[k]!] = k
  for (let r = 0; r < n; r++) cellOf[r] = rank[cellOf[r]!]!
  // Partitions: quantities with the same basis code on every row.
  const groups: StartingQuantity[][] = []
  for (const quantity of STARTING_QUANTITIES) {
    const g = groups.find(m => sameCodes(d.q[m[0]!].basis, d.q[quantity].basis))
    if (g) g.push(quantity)
    else groups.push([quantity])
  }
  const partitions: Partition[] = []
  for (const members of groups) {
    yield
    partitions.push(yield* partitionLayout(d, index, members, cellOf, C, yc, Y))
  }
  return {
    cellClass: Int32Array.from(byKey, c => cellClass[c]!),
    cellConfig: Int32Array.from(byKey, c => cellConfig[c]!),
    cellCore: Float64Array.from(byKey, c => cellCore[c]!),
    cellYear: Int32Array.from(byKey, c => cellYear[c]!),
    classOf,
    classProject: Int32Array.from(classProject),
    partitions,
  }
}

/**
 * One partition's layout, in parts (a yield after the canonical order, after each member's ranks
 * and columns, and after the runs): at 250,000 rows and four members the whole took about a third
 * of a second, too long a stretch for the event loop in a background build.
 */
function* partitionLayout(d: PhaseData, index: StartingIndex, members: StartingQuantity[], cellOf: Int32Array, C: number, yc: Int32Array, Y: number): Generator<void, Partition> {
  const n = d.n
  const Q = members.length
  const basis = d.q[members[0]!].basis
  const bases = index[members[0]!].bases
  let nb = 0
  for (const b of bases.keys()) if (b + 1 > nb) nb = b + 1
  const canonicalAt = new Int32Array(nb + 1)
  for (let b = 0; b < nb; b++) canonicalAt[b + 1] = canonicalAt[b]! + (bases.get(b)?.rows.length ?? 0)
  const N = canonicalAt[nb]!
  // Canonical order: each basis's rows (ascending) stably by year code.
  const canonOf = new Int32Array(n).fill(-1)
  const canonYearAt = new Int32Array(nb * (Y + 1))
  for (const [b, ix] of bases) {
    const at = new Int32Array(Y + 1)
    for (let i = 0; i < ix.rows.length; i++) at[yc[ix.rows[i]!]! + 1]!++
    for (let y = 0; y < Y; y++) at[y + 1]! += at[y]!
    for (let y = 0; y <= Y; y++) canonYearAt[b * (Y + 1) + y] = canonicalAt[b]! + at[y]!
    for (let i = 0; i < ix.rows.length; i++) canonOf[ix.rows[i]!] = canonicalAt[b]! + at[yc[ix.rows[i]!]!]!++
  }
  yield
  // Per member: ranks by row (one numbering over members and bases), canonical columns.
  const finalAt = new Int32Array(Q * (nb + 1))
  const assumedAt = new Int32Array(Q * (nb + 1))
  const finalRank: Int32Array[] = []
  const assumedRank: Int32Array[] = []
  const canon: Partition['canon'] = []
  let fNext = 0
  let aNext = 0
  for (let m = 0; m < Q; m++) {
    const col = d.q[members[m]!]
    const qb = index[members[m]!].bases
    const fr = new Int32Array(n).fill(-1)
    const ar = new Int32Array(n).fill(-1)
    for (let b = 0; b <= nb; b++) {
      finalAt[m * (nb + 1) + b] = fNext
      assumedAt[m * (nb + 1) + b] = aNext
      const ix = qb.get(b)
      if (b === nb || !ix) continue
      const fv = ix.finalValues
      let k = 0
      for (let i = 0; i < ix.byValue.length; i++) {
        while (fv[k] !== ix.sorted[i]) k++
        fr[ix.byValue[i]!] = fNext + k
      }
      for (let i = 0; i < ix.rows.length; i++) ar[ix.rows[i]!] = aNext + lowerBound(ix.assumedValues, col.assumed[ix.rows[i]!]!)
      fNext += fv.length
      aNext += ix.assumedValues.length
    }
    finalRank.push(fr)
    assumedRank.push(ar)
    const c = { final: new Float64Array(N), habitTerm: new Float64Array(N), habitUnder: new Uint8Array(N) }
    for (let r = 0; r < n; r++) {
      const pos = canonOf[r]!
      if (pos < 0) continue
      const f = col.final[r]!
      const a = col.assumed[r]!
      c.final[pos] = f
      c.habitTerm[pos] = a / f - 1
      c.habitUnder[pos] = f > a ? 1 : 0
    }
    canon.push(c)
    yield
  }
  // Runs (basis, cell): a stable counting sort of the rows on a basis.
  const runAt = new Int32Array(C * nb + 1)
  const runFirst = new Int32Array(C * nb).fill(n)
  for (let r = 0; r < n; r++) {
    const b = basis[r]!
    if (b < 0) continue
    const k = b * C + cellOf[r]!
    runAt[k + 1]!++
    if (r < runFirst[k]!) runFirst[k] = r
  }
  for (let k = 0; k < C * nb; k++) runAt[k + 1]! += runAt[k]!
  yield
  const fill = runAt.slice(0, C * nb)
  const project = new Int32Array(N)
  const bucket = new Int32Array(N)
  const canonical = new Int32Array(N)
  const final = new Int32Array(N * Q)
  const assumed = new Int32Array(N * Q)
  for (let r = 0; r < n; r++) {
    const b = basis[r]!
    if (b < 0) continue
    const i = fill[b * C + cellOf[r]!]!++
    project[i] = d.project[r]!
    bucket[i] = bases.get(b)!.bucketOf[r]!
    canonical[i] = canonOf[r]!
    for (let m = 0; m < Q; m++) {
      final[i * Q + m] = finalRank[m]![r]!
      assumed[i * Q + m] = assumedRank[m]![r]!
    }
  }
  return { members, Q, nb, runAt, runFirst, project, bucket, canonical, final, finalAt, assumed, assumedAt, canonicalAt, canonYearAt, canon }
}

/** The first index i with v[i] ≥ x in the ascending `v`. */
function lowerBound(v: Float64Array, x: number): number {
  let lo = 0
  let hi = v.length
  while (lo < hi) {
    const mid = (lo + hi) >> 1
    if (v[mid]! < x) lo = mid + 1
    else hi = mid
  }
  return lo
}

/**
 * Buffers a query reuses (a query runs synchronously start to end, so one set serves all). Stamp
 * arrays mark "seen in this pass" by holding the pass's number, so they need no clearing.
 */
const scratch = {
  pass: 0,
  cells: new Int32Array(0),
  finalHist: new Int32Array(0),
  assumedHist: new Int32Array(0),
  projectStamp: new Int32Array(0),
  yearProjectStamp: new Int32Array(0),
  minBucketStamp: new Int32Array(0),
  minBucket: new Int32Array(0),
  touched: new Int32Array(0),
}
type Buffers = { [K in keyof typeof scratch]: (typeof scratch)[K] extends Int32Array ? K : never }[keyof typeof scratch]

/** Scratch buffer `k` with room for at least n values (contents unspecified; new room is zero). */
function room(k: Buffers, n: number): Int32Array {
  if (scratch[k].length < n) scratch[k] = new Int32Array(Math.max(n, Math.ceil(scratch[k].length * 1.5)))
  return scratch[k]
}
/** A new pass number for the stamp arrays. */
function nextPass(): number {
  if (scratch.pass >= 0x7fffffff) {
    scratch.pass = 0
    scratch.projectStamp.fill(0)
    scratch.yearProjectStamp.fill(0)
    scratch.minBucketStamp.fill(0)
  }
  return ++scratch.pass
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

interface Score {
  underestimateRate: number
  meanConservatism: number
}

/**
 * Suggestions and back-tests for the comparable group, the rows passing the filter tables `t` of a
 * starting-factor query (whose project filters are the supplier and the year designed only). The
 * same answer as `suggestStarting` / `backtest` of shared/calibration on the group's and the
 * firm's rows (reference.ts `refStarting`; tests/api/calibration-derived.test.ts).
 */
export function startingAnswerIndexed(d: PhaseData, t: FilterTables, quantile: number, settings: { minGroupSize: number; habitYears: number }): { suggestions: StartingSuggestion[]; backtest: StartingFactors['backtest'] } {
  const index = startingIndex(d)
  const L = startingLayout(d)
  const cells = groupCells(L, t)
  const stats = groupStatsCached(d, cells, settings.habitYears, () => {
    const out = new Map<StartingQuantity, QuantityStats>()
    for (const part of L.partitions) {
      const s = groupStats(d, L, index, part, cells, settings.habitYears)
      part.members.forEach((q, m) => out.set(q, s[m]!))
    }
    return out
  })
  const suggestions: StartingSuggestion[] = []
  const backtests = {} as StartingFactors['backtest']
  for (const quantity of STARTING_QUANTITIES) backtests[quantity] = quantityAnswer(d, index[quantity], stats.get(quantity)!, quantity, quantile, settings.minGroupSize, suggestions)
  return { suggestions, backtest: backtests }
}

/**
 * The quantile-independent part of the answers for a group (its cells) and habit window, kept per
 * data version for the groups asked last (least recently used leave first, within a byte budget):
 * a query that changes only the quantile, or a second quantile of the same filters, then reads no
 * rows. The kept stats are never written after they are made.
 */
const STATS_BUDGET = 24 * 1024 * 1024
interface StatsEntry {
  cells: Int32Array
  habitYears: number
  stats: Map<StartingQuantity, QuantityStats>
  bytes: number
}
const statsKept = new WeakMap<PhaseData, { entries: Map<string, StatsEntry>; bytes: number }>()

/** Bytes of the typed arrays in `stats` (each counted once). */
function statsBytes(stats: Map<StartingQuantity, QuantityStats>): number {
  const seen = new Set<ArrayBufferView>()
  const add = (a: ArrayBufferView) => seen.add(a)
  for (const q of stats.values()) {
    for (const b of q.bases) add(b.hist)
    const p = q.primary
    if (p) for (const a of [p.braces, p.projects, p.nextOf, p.hAbove, p.hCons, p.hist2, p.blockHist2, p.inBucket, p.projectsAt, p.bits]) add(a)
  }
  let bytes = 1024
  for (const a of seen) bytes += a.byteLength
  return bytes
}

/** Forgets the kept group stats of `d` (benchmarks time the path that reads the rows); the count and bytes that were kept. */
export function dropStartingStats(d: PhaseData): { entries: number; bytes: number } {
  const kept = statsKept.get(d)
  statsKept.delete(d)
  return { entries: kept?.entries.size ?? 0, bytes: kept?.bytes ?? 0 }
}

/** False while `withoutKeptStats` runs. */
let keepingStats = true

/**
 * Runs `fn` (synchronous) without keeping or reading any group stats: answers computed only to
 * compile the code (the code warm-up) neither fill the stats budget nor find another's stats.
 */
export function withoutKeptStats<T>(fn: () => T): T {
  keepingStats = false
  try {
    return fn()
  } finally {
    keepingStats = true
  }
}

function groupStatsCached(d: PhaseData, cells: Int32Array, habitYears: number, compute: () => Map<StartingQuantity, QuantityStats>): Map<StartingQuantity, QuantityStats> {
  if (!keepingStats) return compute()
  let kept = statsKept.get(d)
  if (!kept) statsKept.set(d, (kept = { entries: new Map(), bytes: 0 }))
  let h = 0x811c9dc5
  for (let i = 0; i < cells.length; i++) h = Math.imul(h ^ cells[i]!, 0x01000193)
  const key = `${habitYears}|${cells.length}|${h >>> 0}`
  const hit = kept.entries.get(key)
  if (hit && hit.habitYears === habitYears && sameCodes(hit.cells, cells)) {
    kept.entries.delete(key)
    kept.entries.set(key, hit)
    return hit.stats
  }
  const stats = compute()
  const bytes = statsBytes(stats) + cells.byteLength
  if (bytes > STATS_BUDGET / 4) return stats
  if (hit) {
    kept.entries.delete(key)
    kept.bytes -= hit.bytes
  }
  kept.entries.set(key, { cells: cells.slice(), habitYears, stats, bytes })
  kept.bytes += bytes
  for (const [k, e] of kept.entries) {
    if (kept.bytes <= STATS_BUDGET) break
    kept.entries.delete(k)
    kept.bytes -= e.bytes
  }
  return stats
}

/**
 * The cells of the group, ascending. A project class passes when its projects do; they must agree
 * (they do for the supplier and year-designed filters, which read only the class's attributes).
 */
function groupCells(L: Layout, t: FilterTables): Int32Array {
  const K = L.classProject.length
  const classOk = new Uint8Array(K)
  for (let k = 0; k < K; k++) classOk[k] = t.projectOk[L.classProject[k]!]!
  for (let j = 0; j < L.classOf.length; j++) {
    if (t.projectOk[j] !== classOk[L.classOf[j]!]) throw new Error('startingAnswerIndexed: the project filter is not a filter on supplier and year designed only.')
  }
  const C = L.cellClass.length
  const cells = room('cells', C)
  let nc = 0
  for (let c = 0; c < C; c++) {
    if (!classOk[L.cellClass[c]!] || !t.configOk[L.cellConfig[c]!]) continue
    if (t.core) {
      const a = L.cellCore[c]!
      if (!(a >= t.lo && a <= t.hi)) continue
    }
    cells[nc++] = c
  }
  return cells.slice(0, nc)
}

/** What a query needs of the group on one basis, whatever the quantile. */
interface BasisStats {
  b: number
  /** The group's rows on the basis, and its distinct projects. */
  n: number
  projects: number
  /** Counts of the group's finals per distinct final of the basis (ix.finalValues). */
  hist: Counts
  habit: number | null
}

/** What the back-test needs of the group on the primary basis, whatever the quantile. */
interface PrimaryStats {
  b: number
  /** Years designed of the group's rows, ascending as `backtest` sorts them; their codes (into yearCodes). */
  years: number[]
  codes: number[]
  braces: Int32Array
  projects: Int32Array
  /** Per year code: buckets finished before the year (0: the year is not scored). */
  nextOf: Int32Array
  hAbove: Int32Array
  hCons: Float64Array
  /** The pool: counts per (bucket k, final rank r) at k·D + r, per (bucket, block of 64 ranks), per bucket. */
  hist2: Counts
  blockHist2: Counts
  inBucket: Int32Array
  /** Distinct group projects finished in the first k buckets. */
  projectsAt: Int32Array
  /** The group's canonical positions on the basis, relative to its first (a bit set); the basis's canonical positions per year and the member's finals there. */
  bits: Int32Array
  c0: number
  canonYearAt: Int32Array
  canonFinal: Float64Array
}

interface QuantityStats {
  /** Bases in the reference's order; stats per basis in that order. */
  bases: BasisStats[]
  primary: PrimaryStats | null
}

const RANK_BLOCK = 6

/**
 * One stretch [start, end) of laid-out rows: each row's finals (and, given `ar`, assumed values)
 * counted per rank for the Q members, its project stamped at stampBase + project; the number of
 * projects new to this pass.
 */
function countRun(Q: number, fr: Int32Array, ar: Int32Array | null, project: Int32Array, finalHist: Int32Array, assumedHist: Int32Array, stamp: Int32Array, stampBase: number, pass: number, start: number, end: number): number {
  let distinct = 0
  for (let i = start; i < end; i++) {
    const key = stampBase + project[i]!
    if (stamp[key] !== pass) {
      stamp[key] = pass
      distinct++
    }
  }
  if (Q === 1) {
    for (let i = start; i < end; i++) finalHist[fr[i]!]!++
    if (ar) for (let i = start; i < end; i++) assumedHist[ar[i]!]!++
    return distinct
  }
  const hi = end * Q
  for (let o = start * Q; o < hi; o++) finalHist[fr[o]!]!++
  if (ar) for (let o = start * Q; o < hi; o++) assumedHist[ar[o]!]!++
  return distinct
}

/** The primary basis's pool and marks while the group's rows are read (see poolRun). */
interface Pool {
  Q: number
  /** Per member: its basis's number of distinct finals D, their first global rank, its pool tables' start in hist2 / blockHist2. */
  D: Int32Array
  base: Int32Array
  at2: Int32Array
  atBlock: Int32Array
  nblk: Int32Array
  c0: number
  hist2: Int32Array
  blockHist2: Int32Array
  inBucket: Int32Array
  bits: Int32Array
  yearStamp: Int32Array
  minStamp: Int32Array
  minBucket: Int32Array
  touched: Int32Array
  nt: number
}

/**
 * One stretch of the primary basis, all of one year designed: its rows counted per (bucket, final
 * rank) and per (bucket, rank block) for each member, each project's earliest bucket kept,
 * canonical positions marked; the number of projects new to the year (stamped at yearBase + project).
 */
function poolRun(pool: Pool, fr: Int32Array, bucket: Int32Array, canonical: Int32Array, project: Int32Array, yearBase: number, pass: number, start: number, end: number): number {
  const { Q, c0, inBucket, bits, yearStamp, minStamp, minBucket, touched, hist2, blockHist2 } = pool
  let nt = pool.nt
  let distinct = 0
  for (let i = start; i < end; i++) {
    const pr = project[i]!
    const bk = bucket[i]!
    inBucket[bk]!++
    if (minStamp[pr] !== pass) {
      minStamp[pr] = pass
      minBucket[pr] = bk
      touched[nt++] = pr
    } else if (bk < minBucket[pr]!) minBucket[pr] = bk
    const x = canonical[i]! - c0
    bits[x >> 5]! |= 1 << (x & 31)
    if (yearStamp[yearBase + pr] !== pass) {
      yearStamp[yearBase + pr] = pass
      distinct++
    }
  }
  pool.nt = nt
  for (let m = 0; m < Q; m++) {
    const D = pool.D[m]!
    const base = pool.base[m]!
    const at2 = pool.at2[m]!
    const atBlock = pool.atBlock[m]!
    const nblk = pool.nblk[m]!
    for (let i = start; i < end; i++) {
      const bk = bucket[i]!
      const rank = fr[i * Q + m]! - base
      hist2[at2 + bk * D + rank]!++
      blockHist2[atBlock + bk * nblk + (rank >> RANK_BLOCK)]!++
    }
  }
  return distinct
}

/**
 * The quantile-independent part of the answer for each member of a partition, for the group
 * `cells`: one pass over the group's rows counts, per member, finals and recent assumed values per
 * distinct value and, on the primary basis, the pool per bucket and final; and, once for all
 * members, distinct projects per basis, projects per year and per bucket, and the rows' canonical
 * positions.
 */
function groupStats(d: PhaseData, L: Layout, index: StartingIndex, part: Partition, cells: Int32Array, habitYears: number): QuantityStats[] {
  const { Q, nb, runAt, runFirst, finalAt, assumedAt } = part
  const firmBy = index[part.members[0]!].bases
  const C = L.cellClass.length
  const { years: yearOf } = yearCodes(d)
  const Y = yearOf.length
  // Per basis, from the runs: the group's rows, first row and latest year designed.
  const count = new Int32Array(nb)
  const first = new Int32Array(nb).fill(d.n)
  const latest = new Float64Array(nb).fill(-Infinity)
  for (let k = 0; k < cells.length; k++) {
    const c = cells[k]!
    const y = yearOf[L.cellYear[c]!]!
    for (let b = 0; b < nb; b++) {
      const m = runAt[b * C + c + 1]! - runAt[b * C + c]!
      if (!m) continue
      count[b]! += m
      if (runFirst[b * C + c]! < first[b]!) first[b] = runFirst[b * C + c]!
      if (Number.isFinite(y) && y > latest[b]!) latest[b] = y
    }
  }
  // Bases as the reference orders them: the group's in order of first appearance (else the firm's),
  // then by group rows and firm rows, both descending (a stable sort).
  const inGroup: number[] = []
  for (let b = 0; b < nb; b++) if (count[b]! > 0) inGroup.push(b)
  inGroup.sort((a, b) => first[a]! - first[b]!)
  const order = (inGroup.length ? inGroup : [...firmBy.keys()]).sort((a, b) => count[b]! - count[a]! || firmBy.get(b)!.rows.length - firmBy.get(a)!.rows.length)
  const primary = order[0] !== undefined && count[order[0]]! > 0 ? order[0] : -1
  // The habit's window per basis: rows designed after latest − habitYears (habitOf).
  const since = new Float64Array(nb)
  for (let b = 0; b < nb; b++) since[b] = latest[b]! - habitYears

  const P = d.projects.id.length
  const F = finalAt[Q * (nb + 1) - 1]!
  const A = assumedAt[Q * (nb + 1) - 1]!
  const finalHist = room('finalHist', F)
  finalHist.fill(0, 0, F)
  const assumedHist = room('assumedHist', A)
  assumedHist.fill(0, 0, A)
  const stamp = room('projectStamp', nb * P)
  const pass = nextPass()
  const projects = new Int32Array(nb)
  // The primary basis's pool and marks (empty without one).
  const pix = primary < 0 ? null : firmBy.get(primary)!
  const B = pix ? pix.keys.length : 0
  const Dm = new Int32Array(Q)
  const baseM = new Int32Array(Q)
  const at2 = new Int32Array(Q + 1)
  const atBlock = new Int32Array(Q + 1)
  const nblk = new Int32Array(Q)
  for (let m = 0; m < Q && pix; m++) {
    baseM[m] = finalAt[m * (nb + 1) + primary]!
    Dm[m] = finalAt[m * (nb + 1) + primary + 1]! - baseM[m]!
    nblk[m] = (Dm[m]! >> RANK_BLOCK) + 1
    at2[m + 1] = at2[m]! + B * Dm[m]!
    atBlock[m + 1] = atBlock[m]! + B * nblk[m]!
  }
  const c0 = primary < 0 ? 0 : part.canonicalAt[primary]!
  const pool: Pool = {
    Q,
    D: Dm,
    base: baseM,
    at2,
    atBlock,
    nblk,
    c0,
    hist2: new Int32Array(at2[Q]!),
    blockHist2: new Int32Array(atBlock[Q]!),
    inBucket: new Int32Array(B),
    bits: new Int32Array(primary < 0 ? 0 : ((part.canonicalAt[primary + 1]! - c0) >> 5) + 1),
    yearStamp: room('yearProjectStamp', Y * P),
    minStamp: room('minBucketStamp', P),
    minBucket: room('minBucket', P),
    touched: room('touched', P),
    nt: 0,
  }
  const yearProjects = new Int32Array(Y)
  const { final: fr, assumed: ar, canonical, bucket, project } = part
  // Per basis, the group's runs in cell order, neighbouring cells of one year read as one stretch.
  for (let b = 0; b < nb; b++) {
    if (!count[b]) continue
    const bC = b * C
    for (let k = 0; k < cells.length; ) {
      const yc = L.cellYear[cells[k]!]!
      const start = runAt[bC + cells[k]!]!
      let end = runAt[bC + cells[k]! + 1]!
      for (k++; k < cells.length && cells[k] === cells[k - 1]! + 1 && L.cellYear[cells[k]!] === yc; k++) end = runAt[bC + cells[k]! + 1]!
      if (start === end) continue
      const y = yearOf[yc]!
      projects[b]! += countRun(Q, fr, Number.isFinite(y) && y > since[b]! ? ar : null, project, finalHist, assumedHist, stamp, b * P, pass, start, end)
      if (b === primary) yearProjects[yc]! += poolRun(pool, fr, bucket, canonical, project, yc * P, pass, start, end)
    }
  }

  // Shared by the members: the back-test's years, braces, projects per year and per bucket.
  let years: number[] = []
  let codes: number[] = []
  const braces = new Int32Array(Y)
  const nextOf = new Int32Array(Y)
  const projectsAt = new Int32Array(B + 1)
  if (pix) {
    // Years designed of the group's rows on the primary basis in order of first appearance, then
    // sorted as `backtest` sorts them; braces per year (from the runs).
    const firstOf = new Int32Array(Y).fill(d.n)
    for (let k = 0; k < cells.length; k++) {
      const c = cells[k]!
      const m = runAt[primary * C + c + 1]! - runAt[primary * C + c]!
      if (!m) continue
      const y = L.cellYear[c]!
      braces[y]! += m
      if (runFirst[primary * C + c]! < firstOf[y]!) firstOf[y] = runFirst[primary * C + c]!
    }
    const firstSeen: number[] = []
    for (let y = 0; y < Y; y++) if (braces[y]) firstSeen.push(y)
    firstSeen.sort((a, c) => firstOf[a]! - firstOf[c]!)
    years = firstSeen.map(y => yearOf[y]!).sort((a, c) => a - c)
    const codeOf = new Map(firstSeen.map(y => [yearOf[y]!, y]))
    codes = years.map(y => codeOf.get(y)!)
    // Buckets finished before each year (the back-test skips a year with none).
    let next = 0
    for (let j = 0; j < years.length; j++) {
      while (next < B && pix.keys[next]! < years[j]!) next++
      nextOf[codes[j]!] = next
    }
    for (let j = 0; j < pool.nt; j++) projectsAt[pool.minBucket[pool.touched[j]!]! + 1]!++
    for (let k = 1; k <= B; k++) projectsAt[k]! += projectsAt[k - 1]!
  }

  return part.members.map((quantity, m) => {
    const qb = index[quantity].bases
    const bases: BasisStats[] = []
    for (const b of order) {
      const ix = qb.get(b)!
      const n = count[b]!
      const hist = narrow(finalHist, finalAt[m * (nb + 1) + b]!, finalAt[m * (nb + 1) + b + 1]!)
      let habit: number | null = null
      if (latest[b] !== -Infinity) {
        const ah = assumedHist.subarray(assumedAt[m * (nb + 1) + b]!, assumedAt[m * (nb + 1) + b + 1]!)
        let k = 0
        for (let i = 0; i < ah.length; i++) k += ah[i]!
        habit = k ? quantileOfCounts(ah, ix.assumedValues, k, 0.5) : quantileOfSorted(new Float64Array(0), 0.5)
      }
      bases.push({ b, n, projects: projects[b]!, hist, habit })
    }
    if (!pix) return { bases, primary: null }
    // The habit's scores per scored year, its rows in ascending row order.
    const hAbove = new Int32Array(Y)
    const hCons = new Float64Array(Y)
    const { habitTerm, habitUnder } = part.canon[m]!
    const bits = pool.bits
    for (const y of codes) {
      if (!nextOf[y]) continue
      let above = 0
      let cons = 0
      const lo = part.canonYearAt[primary * (Y + 1) + y]! - c0
      const hi = part.canonYearAt[primary * (Y + 1) + y + 1]! - c0
      for (let w = lo >> 5; w <= (hi - 1) >> 5; w++) {
        let word = bits[w]! & wordMask(w, lo, hi)
        while (word) {
          const low = word & -word
          word ^= low
          const cp = c0 + (w << 5) + 31 - Math.clz32(low)
          above += habitUnder[cp]!
          cons += habitTerm[cp]!
        }
      }
      hAbove[y] = above
      hCons[y] = cons
    }
    return {
      bases,
      primary: {
        b: primary,
        years,
        codes,
        braces,
        projects: yearProjects,
        nextOf,
        hAbove,
        hCons,
        hist2: narrow(pool.hist2, at2[m]!, at2[m + 1]!),
        blockHist2: narrow(pool.blockHist2, atBlock[m]!, atBlock[m + 1]!),
        inBucket: pool.inBucket,
        projectsAt,
        bits,
        c0,
        canonYearAt: part.canonYearAt,
        canonFinal: part.canon[m]!.final,
      },
    }
  })
}

/** The bits of word w of a bit set that lie in [lo, hi) (lo < hi). */
function wordMask(w: number, lo: number, hi: number): number {
  let m = -1
  if (w === lo >> 5) m &= -1 << (lo & 31)
  if (w === (hi - 1) >> 5 && (hi & 31) !== 0) m &= (1 << (hi & 31)) - 1
  return m
}

/**
 * `scoreValue(value, finals)` and, unless null, `scoreValue(other, finals)` for the sorted finals
 * holding counts[i] copies of values[i] (n in all): the same terms added in the same order (equal
 * finals give equal terms), the two sums side by side.
 */
function scoreOfCounts(value: number, other: number | null, counts: Counts, values: Float64Array, n: number): { s: Score; o: Score | null } {
  let above = 0
  let cons = 0
  let aboveO = 0
  let consO = 0
  const D = values.length
  if (other === null) {
    for (let i = 0; i < D; i++) {
      const c = counts[i]!
      if (!c) continue
      const f = values[i]!
      if (f > value) above += c
      const t = value / f - 1
      for (let j = 0; j < c; j++) cons += t
    }
  } else {
    for (let i = 0; i < D; i++) {
      const c = counts[i]!
      if (!c) continue
      const f = values[i]!
      if (f > value) above += c
      if (f > other) aboveO += c
      const t = value / f - 1
      const tO = other / f - 1
      for (let j = 0; j < c; j++) {
        cons += t
        consO += tO
      }
    }
  }
  const score = (a: number, x: number): Score => (n ? { underestimateRate: a / n, meanConservatism: x / n } : { underestimateRate: 0, meanConservatism: 0 })
  return { s: score(above, cons), o: other === null ? null : score(aboveO, consO) }
}

/** One quantity's suggestions (pushed onto `out`) and back-test at quantile `quantile`, from the group's stats. */
function quantityAnswer(d: PhaseData, qi: QuantityIndex, stats: QuantityStats, quantity: StartingQuantity, quantile: number, minGroupSize: number, out: StartingSuggestion[]): BacktestYear[] {
  const col = d.q[quantity]
  const p = ruleQuantile(quantity, quantile)
  const rule = ruleText(quantity, quantile, minGroupSize)
  for (const s of stats.bases) {
    const ix = qi.bases.get(s.b)!
    const firmValue = quantileOfSorted(ix.sorted, p)
    const groupValue = s.n ? quantileOfCounts(s.hist, ix.finalValues, s.n, p) : null
    const sv = shrinkToward(groupValue, firmValue, s.n ? s.projects : 0, minGroupSize)
    // Judged on the group's finals; on the firm's when the group is empty.
    const sc = s.n ? scoreOfCounts(sv.suggested, s.habit, s.hist, ix.finalValues, s.n) : scoreOfCounts(sv.suggested, s.habit, ix.finalCounts, ix.finalValues, ix.rows.length)
    out.push({
      quantity,
      basis: col.bases[s.b]!,
      suggested: sv.suggested,
      groupValue: sv.groupValue,
      firmValue: sv.firmValue,
      groupSize: s.projects,
      shrunk: sv.shrunk,
      weight: sv.weight,
      habit: s.habit,
      underestimateRateSuggested: sc.s.underestimateRate,
      underestimateRateHabit: sc.o?.underestimateRate ?? null,
      meanConservatismSuggested: sc.s.meanConservatism,
      meanConservatismHabit: sc.o?.meanConservatism ?? null,
      rule,
    })
  }
  return stats.primary ? backtestAt(d, qi.bases.get(stats.primary.b)!, stats.primary, p, minGroupSize) : []
}

/**
 * `backtest(cols, the group's rows on the primary basis, the firm's rows on it, …)` from the
 * group's stats: each year's pool is the group's rows in the buckets finished before it, its order
 * statistics read off the per-(bucket, final) counts (per-block counts first, then the ranks of one
 * block); the year's scores are summed over its rows in ascending row order (the order, and so the
 * floating-point sums, of `backtest`), the marked canonical positions in order.
 */
function backtestAt(d: PhaseData, ix: BasisIndex, s: PrimaryStats, p: number, minGroupSize: number): BacktestYear[] {
  const fv = ix.finalValues
  const D = fv.length
  const NBLK = (D >> RANK_BLOCK) + 1
  const { hist2, blockHist2, bits, c0, canonYearAt, canonFinal } = s
  const Y = yearCodes(d).years.length
  const firmAt = firmQuantilesAt(ix, p)
  const blockCount = new Int32Array(NBLK)
  let size = 0
  let next = 0
  // The j-th smallest of the pool of the first `next` buckets.
  const kth = (j: number): number => {
    let blk = 0
    let cum = 0
    while (cum + blockCount[blk]! <= j) cum += blockCount[blk++]!
    for (let r = blk << RANK_BLOCK; ; r++) {
      let c = 0
      for (let k = 0; k < next; k++) c += hist2[k * D + r]!
      if (j < cum + c) return fv[r]!
      cum += c
    }
  }
  const out: BacktestYear[] = []
  for (let j = 0; j < s.years.length; j++) {
    const y = s.codes[j]!
    const upTo = s.nextOf[y]!
    if (!upTo) continue
    while (next < upTo) {
      for (let blk = 0; blk < NBLK; blk++) blockCount[blk]! += blockHist2[next * NBLK + blk]!
      size += s.inBucket[next]!
      next++
    }
    const groupValue = size ? quantileBy(size, p, kth) : null
    const sv = shrinkToward(groupValue, firmAt[next]!, size ? s.projectsAt[next]! : 0, minGroupSize)
    const sug = sv.suggested
    let above = 0
    let cons = 0
    const lo = canonYearAt[s.b * (Y + 1) + y]! - c0
    const hi = canonYearAt[s.b * (Y + 1) + y + 1]! - c0
    for (let w = lo >> 5; w <= (hi - 1) >> 5; w++) {
      let word = bits[w]! & wordMask(w, lo, hi)
      while (word) {
        const low = word & -word
        word ^= low
        const f = canonFinal[c0 + (w << 5) + 31 - Math.clz32(low)]!
        if (f > sug) above++
        cons += sug / f - 1
      }
    }
    const n = s.braces[y]!
    out.push({
      year: s.years[j]!,
      projects: s.projects[y]!,
      braces: n,
      trainedOn: sv.shrunk ? ix.firmProjectsAt[next]! : s.projectsAt[next]!,
      suggested: sug,
      suggestedUnderestimateRate: above / n,
      suggestedMeanConservatism: cons / n,
      habitUnderestimateRate: s.hAbove[y]! / n,
      habitMeanConservatism: s.hCons[y]! / n,
    })
  }
  return out
}

import type { BacktestYear, StartingQuantity, StartingSuggestion } from '../schemas/calibration'
import { quantileOfSorted, sortedCopy } from './stats'

/**
 * Evidence-based starting factors from the firm's finished braces.
 *
 * Rule: the suggestion is the chosen quantile p (default 0.9) of the comparable FINAL values (the
 * supplier's qualified β, ω, stiffness factor; the coupon / mill-cert core yield), so that about
 * 1 − p of past braces would still have come in above it. The stiffness factor is judged two-sided
 * (too stiff and too soft both matter), so it takes the median instead.
 *
 * Shrinkage (credibility weighting): with n comparable PROJECTS and the firm's threshold m
 * (minGroupSize), w = min(1, n / m) and suggested = w·group + (1 − w)·firm, where group and firm
 * are the same rule applied to the comparable group's braces and to the whole firm's (same basis).
 * n counts projects, not braces: the braces of one project share a supplier, a submittal and often a
 * plate heat, so forty braces of one job are one piece of evidence, not forty.
 */

/** Columns of observations on one basis: row i is one brace's pair. */
export interface FactorColumns {
  projectId: ArrayLike<number>
  yearDesigned: ArrayLike<number>
  /** Year completed; NaN when not recorded. */
  yearCompleted: ArrayLike<number>
  assumed: ArrayLike<number>
  final: ArrayLike<number>
}

/** Quantile actually used for a quantity: the chosen one, or the median for the two-sided stiffness factor. */
export function ruleQuantile(quantity: StartingQuantity, p: number): number {
  return quantity === 'stiffness' ? 0.5 : p
}

export function ruleText(quantity: StartingQuantity, p: number, minGroupSize: number): string {
  const shrink = `shrunk toward the firm-wide value with weight w = n / ${minGroupSize} when fewer than ${minGroupSize} comparable projects (n)`
  if (quantity === 'stiffness') return `Median of comparable final stiffness factors (two-sided: judged against the tolerance band, so not an upper quantile); ${shrink}.`
  const pct = Math.round(p * 100)
  const what = quantity === 'overstrength' ? 'final expected core yield stresses (coupon or mill-cert Fysc; yield-range upper bound where no test exists)' : `final ${quantity === 'beta' ? 'β' : 'ω'} values at their stated deformation`
  return `P${pct} (type 7 quantile) of comparable ${what}; ${shrink}.`
}

/** Credibility weight of a group of n against the threshold m: min(1, n / m). */
export function credibilityWeight(n: number, minGroupSize: number): number {
  if (!(minGroupSize > 0)) throw new RangeError('minGroupSize must be positive.')
  return Math.min(1, n / minGroupSize)
}

export interface ShrunkValue {
  groupValue: number | null
  firmValue: number
  weight: number
  shrunk: boolean
  suggested: number
}

/** The shrunk suggestion from sorted group and firm finals (the firm's must not be empty); the weight uses the group's project count. */
export function shrunkQuantile(groupSorted: ArrayLike<number>, firmSorted: ArrayLike<number>, p: number, minGroupSize: number, groupProjects: number): ShrunkValue {
  if (firmSorted.length === 0) throw new RangeError('shrunkQuantile: the firm has no values on this basis.')
  const firmValue = quantileOfSorted(firmSorted, p)
  const n = groupSorted.length ? groupProjects : 0
  const groupValue = groupSorted.length ? quantileOfSorted(groupSorted, p) : null
  return shrinkToward(groupValue, firmValue, n, minGroupSize)
}

/** The shrinkage step of `shrunkQuantile` from the two values: n comparable projects (0 for an empty group). */
export function shrinkToward(groupValue: number | null, firmValue: number, n: number, minGroupSize: number): ShrunkValue {
  const weight = credibilityWeight(n, minGroupSize)
  const suggested = groupValue === null ? firmValue : weight * groupValue + (1 - weight) * firmValue
  return { groupValue, firmValue, weight, shrunk: weight < 1, suggested }
}

/**
 * How a single starting value would have fared against finals: the share of finals above it
 * (an underestimate) and the mean over-conservatism, mean(value / final − 1).
 */
export function scoreValue(value: number, finals: ArrayLike<number>): { underestimateRate: number; meanConservatism: number } {
  const n = finals.length
  if (!n) return { underestimateRate: 0, meanConservatism: 0 }
  let above = 0
  let cons = 0
  for (let i = 0; i < n; i++) {
    const f = finals[i]!
    if (f > value) above++
    cons += value / f - 1
  }
  return { underestimateRate: above / n, meanConservatism: cons / n }
}

const pick = (col: ArrayLike<number>, rows: ArrayLike<number>) => {
  const out = new Float64Array(rows.length)
  for (let i = 0; i < rows.length; i++) out[i] = col[rows[i]!]!
  return out
}

/**
 * The firm's habit: the median assumed value over the last `habitYears` years of the group,
 * counted back from the group's latest year designed (years > latest − habitYears). Rows without a
 * year designed cannot be placed in time and do not count. Null for an empty group, or one whose
 * rows all lack the year.
 */
export function habitOf(cols: FactorColumns, rows: ArrayLike<number>, habitYears: number): number | null {
  let latest = -Infinity
  for (let i = 0; i < rows.length; i++) {
    const y = cols.yearDesigned[rows[i]!]!
    if (Number.isFinite(y) && y > latest) latest = y
  }
  if (latest === -Infinity) return null
  const recent: number[] = []
  for (let i = 0; i < rows.length; i++) {
    const y = cols.yearDesigned[rows[i]!]!
    if (Number.isFinite(y) && y > latest - habitYears) recent.push(cols.assumed[rows[i]!]!)
  }
  return quantileOfSorted(sortedCopy(recent), 0.5)
}

export interface SuggestOptions {
  quantity: StartingQuantity
  basis: string
  /** Chosen quantile, 0.5–0.99. */
  quantile: number
  minGroupSize: number
  habitYears: number
}

/**
 * One starting suggestion for a quantity on one basis, from the comparable group's rows and the firm's rows.
 * The caller may pass the firm's and the group's finals already sorted (the same values, ascending).
 */
export function suggestStarting(cols: FactorColumns, groupRows: ArrayLike<number>, firmRows: ArrayLike<number>, o: SuggestOptions, firmSorted?: Float64Array, groupSorted?: Float64Array): StartingSuggestion {
  const p = ruleQuantile(o.quantity, o.quantile)
  const groupFinals = groupSorted ?? sortedCopy(pick(cols.final, groupRows))
  // The firm's finals sorted (the caller may pass them, computed once per data version).
  const firmFinals = firmSorted ?? sortedCopy(pick(cols.final, firmRows))
  const projects = new Set<number>()
  for (let i = 0; i < groupRows.length; i++) projects.add(cols.projectId[groupRows[i]!]!)
  const v = shrunkQuantile(groupFinals, firmFinals, p, o.minGroupSize, projects.size)
  // Judged on the comparable finals; on the firm's when the group is empty.
  const judged = groupFinals.length ? groupFinals : firmFinals
  const habit = habitOf(cols, groupRows, o.habitYears)
  const s = scoreValue(v.suggested, judged)
  const h = habit === null ? null : scoreValue(habit, judged)
  return {
    quantity: o.quantity,
    basis: o.basis,
    suggested: v.suggested,
    groupValue: v.groupValue,
    firmValue: v.firmValue,
    groupSize: projects.size,
    shrunk: v.shrunk,
    weight: v.weight,
    habit,
    underestimateRateSuggested: s.underestimateRate,
    underestimateRateHabit: h?.underestimateRate ?? null,
    meanConservatismSuggested: s.meanConservatism,
    meanConservatismHabit: h?.meanConservatism ?? null,
    rule: ruleText(o.quantity, o.quantile, o.minGroupSize),
  }
}

/** The year a project counts as finished for the back-test: year completed, or year designed when that is missing. */
export function finishedYear(cols: FactorColumns, row: number): number {
  const c = cols.yearCompleted[row]!
  return Number.isFinite(c) ? c : cols.yearDesigned[row]!
}

/** Growing sorted sample: add a batch, keep it sorted by merging (O(n) per batch). */
class SortedPool {
  values = new Float64Array(0)
  add(batch: Float64Array) {
    if (!batch.length) return
    batch.sort()
    const a = this.values
    const out = new Float64Array(a.length + batch.length)
    let i = 0
    let j = 0
    let k = 0
    while (i < a.length && j < batch.length) out[k++] = a[i]! <= batch[j]! ? a[i++]! : batch[j++]!
    while (i < a.length) out[k++] = a[i++]!
    while (j < batch.length) out[k++] = batch[j++]!
    this.values = out
  }
}

/**
 * Back-test: for each year Y in which the group has projects (by year designed), the suggestion is
 * computed as `suggestStarting` would, but only from projects finished before Y (year completed < Y;
 * year designed when completion is missing), and scored on the group's braces of year Y against
 * what the firm actually assumed on those same braces. Years with no earlier finished project are skipped.
 */
export function backtest(cols: FactorColumns, groupRows: ArrayLike<number>, firmRows: ArrayLike<number>, o: Omit<SuggestOptions, 'habitYears' | 'basis'>): BacktestYear[] {
  const p = ruleQuantile(o.quantity, o.quantile)
  let size = 0
  for (let i = 0; i < firmRows.length; i++) size = Math.max(size, firmRows[i]! + 1)
  for (let i = 0; i < groupRows.length; i++) size = Math.max(size, groupRows[i]! + 1)
  const inGroup = new Uint8Array(size)
  for (let i = 0; i < groupRows.length; i++) inGroup[groupRows[i]!] = 1
  const byYear = new Map<number, number[]>()
  for (let i = 0; i < groupRows.length; i++) {
    const r = groupRows[i]!
    const y = cols.yearDesigned[r]!
    ;(byYear.get(y) ?? byYear.set(y, []).get(y)!).push(r)
  }
  const years = [...byYear.keys()].sort((a, b) => a - b)
  // Firm rows in order of the year they finished (bucketed by year: no comparator sort over every row).
  const buckets = new Map<number, number[]>()
  for (let i = 0; i < firmRows.length; i++) {
    const r = firmRows[i]!
    const y = finishedYear(cols, r)
    ;(buckets.get(y) ?? buckets.set(y, []).get(y)!).push(r)
  }
  const firmOrder: number[] = []
  for (const y of [...buckets.keys()].sort((a, b) => a - b)) for (const r of buckets.get(y)!) firmOrder.push(r)
  const groupPool = new SortedPool()
  const firmPool = new SortedPool()
  const groupProjects = new Set<number>()
  const firmProjects = new Set<number>()
  let next = 0
  const out: BacktestYear[] = []
  for (const year of years) {
    const gBatch: number[] = []
    const fBatch: number[] = []
    while (next < firmOrder.length && finishedYear(cols, firmOrder[next]!) < year) {
      const r = firmOrder[next++]!
      fBatch.push(cols.final[r]!)
      firmProjects.add(cols.projectId[r]!)
      if (inGroup[r]) {
        gBatch.push(cols.final[r]!)
        groupProjects.add(cols.projectId[r]!)
      }
    }
    firmPool.add(Float64Array.from(fBatch))
    groupPool.add(Float64Array.from(gBatch))
    if (!firmPool.values.length) continue
    const v = shrunkQuantile(groupPool.values, firmPool.values, p, o.minGroupSize, groupProjects.size)
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
      trainedOn: v.shrunk ? firmProjects.size : groupProjects.size,
      suggested: v.suggested,
      suggestedUnderestimateRate: sAbove / n,
      suggestedMeanConservatism: sCons / n,
      habitUnderestimateRate: hAbove / n,
      habitMeanConservatism: hCons / n,
    })
  }
  return out
}

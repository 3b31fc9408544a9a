import { mean, quantileSorted, sampleStandardDeviation } from 'simple-statistics'

/**
 * Statistics of the calibration review, on simple-statistics.
 *
 * Quantile definition: simple-statistics 7.12 `quantileSorted`, the linear interpolation between
 * order statistics of Hyndman & Fan type 7 (the default of R's `quantile` and numpy's
 * `percentile`): with the values sorted x[0] ≤ … ≤ x[n−1], Q(p) = x[⌊h⌋] + (h − ⌊h⌋)(x[⌈h⌉] − x[⌊h⌋]),
 * h = (n − 1)·p. Quartiles, medians and suggested quantiles all use it.
 */

/** A numeric copy sorted ascending (typed-array sort: numeric, fast). */
export function sortedCopy(values: ArrayLike<number>): Float64Array {
  const out = Float64Array.from(values as ArrayLike<number>)
  out.sort()
  return out
}

/** Quantile p (0–1) of values already sorted ascending, type 7 (see above). */
export function quantileOfSorted(sorted: ArrayLike<number>, p: number): number {
  return quantileSorted(sorted as unknown as number[], p)
}

/** Quantile p of unsorted values (type 7). */
export function quantileOf(values: ArrayLike<number>, p: number): number {
  return quantileOfSorted(sortedCopy(values), p)
}

export interface Describe {
  n: number
  mean: number
  /** Sample standard deviation (n − 1 denominator); 0 for a single value. */
  sd: number
  min: number
  q1: number
  median: number
  q3: number
  max: number
}

/** Count, mean, sample standard deviation and quartiles of a non-empty sample. */
export function describe(values: ArrayLike<number>): Describe {
  if (values.length === 0) throw new RangeError('describe: values must not be empty.')
  const s = sortedCopy(values)
  const arr = s as unknown as number[]
  return {
    n: s.length,
    mean: mean(arr),
    sd: s.length > 1 ? sampleStandardDeviation(arr) : 0,
    min: s[0]!,
    q1: quantileOfSorted(s, 0.25),
    median: quantileOfSorted(s, 0.5),
    q3: quantileOfSorted(s, 0.75),
    max: s[s.length - 1]!,
  }
}

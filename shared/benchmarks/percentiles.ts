import { quantileSorted } from 'simple-statistics'

/**
 * Percentile bands for benchmarks.
 *
 * Quantile definition: simple-statistics 7.12 `quantileSorted`, linear interpolation between
 * order statistics — Hyndman & Fan (1996) type 7, the default of R's `quantile` and of
 * `numpy.percentile`: for sorted x₀…x₍ₙ₋₁₎ and p in [0, 1], h = (n − 1)·p and
 * Q(p) = x⌊h⌋ + (h − ⌊h⌋)·(x⌊h⌋₊₁ − x⌊h⌋). With one value every percentile is that value.
 */

/** The percentiles reported: P10, P25, median, P75, P90. */
export const BAND_PERCENTILES = { p10: 0.1, p25: 0.25, p50: 0.5, p75: 0.75, p90: 0.9 } as const

export interface Band {
  /** Values the band was computed from (non-finite values are dropped first). */
  n: number
  p10: number
  p25: number
  p50: number
  p75: number
  p90: number
}

/**
 * P10/P25/P50/P75/P90 of `values` (type-7 quantiles, above). Non-finite values (null, NaN, ±∞)
 * are ignored; returns null when none is left. Unit: that of the values.
 */
export function percentileBand(values: readonly (number | null | undefined)[]): Band | null {
  const finite: number[] = []
  for (const v of values) if (typeof v === 'number' && Number.isFinite(v)) finite.push(v)
  if (finite.length === 0) return null
  // A typed array sorts numerically without a comparator call per pair: several times faster for
  // the thousands of projects of a benchmark group.
  return bandOfSorted(Float64Array.from(finite).sort())
}

/** The band of finite values already sorted ascending (at least one). */
export function bandOfSorted(sorted: Float64Array): Band {
  // quantileSorted reads only `length` and indices, so a typed array serves as well as an array.
  const xs = sorted as unknown as number[]
  return {
    n: xs.length,
    p10: quantileSorted(xs, BAND_PERCENTILES.p10),
    p25: quantileSorted(xs, BAND_PERCENTILES.p25),
    p50: quantileSorted(xs, BAND_PERCENTILES.p50),
    p75: quantileSorted(xs, BAND_PERCENTILES.p75),
    p90: quantileSorted(xs, BAND_PERCENTILES.p90),
  }
}

import type { RatioSummary } from '../schemas/calibration'
import { quantileOfSorted, sortedCopy } from './stats'

/** Bin edges shared by every summary of one answer, so groups can be compared bar by bar. */
export interface HistogramBins {
  start: number
  width: number
  count: number
}

/** Bin edges without binary-fraction noise (0.95, not 0.9500000000000001). */
const tidy = (x: number) => Math.round(x * 1e9) / 1e9

const NICE_WIDTHS = [0.001, 0.002, 0.0025, 0.005, 0.01, 0.02, 0.025, 0.05, 0.1, 0.2, 0.25, 0.5, 1, 2, 2.5, 5, 10]

/**
 * Equal-width bins over [min, max] of the ratios: about `target` bins (default 20) of a "nice"
 * width, edges on multiples of the width. One bin for a sample without spread.
 */
export function histogramBins(min: number, max: number, target = 20): HistogramBins {
  if (!Number.isFinite(min) || !Number.isFinite(max) || max < min) throw new RangeError('histogramBins: min and max must be finite with min ≤ max.')
  const span = max - min
  const width = span === 0 ? NICE_WIDTHS[4]! : (NICE_WIDTHS.find(w => span / w <= target) ?? NICE_WIDTHS[NICE_WIDTHS.length - 1]!)
  const start = tidy(Math.floor(min / width + 1e-9) * width)
  const count = Math.max(1, Math.floor((max - start) / width + 1e-9) + 1)
  return { start, width, count }
}

/**
 * Distribution of assumed / final ratios of one group on one basis (see RatioSummary).
 * Quartiles by the type 7 quantile (stats.ts); whiskers after Tukey: the furthest ratios within
 * 1.5 × IQR of the quartiles. Underestimate: ratio < 1 (final above assumed). Outside band:
 * |ratio − 1| > tolerance (the firm's two-sided stiffness band, ±10 % common practice, no source).
 */
export function summarizeRatios(ratios: ArrayLike<number>, opts: { group: string; basis: string; tolerance: number; bins: HistogramBins }): RatioSummary {
  if (ratios.length === 0) throw new RangeError('summarizeRatios: ratios must not be empty.')
  return summarizeSortedRatios(sortedCopy(ratios), opts)
}

/** `summarizeRatios` of ratios already sorted ascending (the same answer, without the sort). */
export function summarizeSortedRatios(s: ArrayLike<number>, opts: { group: string; basis: string; tolerance: number; bins: HistogramBins }): RatioSummary {
  if (s.length === 0) throw new RangeError('summarizeRatios: ratios must not be empty.')
  const n = s.length
  const q1 = quantileOfSorted(s, 0.25)
  const median = quantileOfSorted(s, 0.5)
  const q3 = quantileOfSorted(s, 0.75)
  const iqr = q3 - q1
  const lowFence = q1 - 1.5 * iqr
  const highFence = q3 + 1.5 * iqr
  let whiskerLow = s[0]!
  let whiskerHigh = s[n - 1]!
  for (let i = 0; i < n; i++) if (s[i]! >= lowFence) { whiskerLow = s[i]!; break }
  for (let i = n - 1; i >= 0; i--) if (s[i]! <= highFence) { whiskerHigh = s[i]!; break }
  let sum = 0
  let under = 0
  let outside = 0
  const { start, width, count } = opts.bins
  const counts = new Array<number>(count).fill(0)
  for (let i = 0; i < n; i++) {
    const r = s[i]!
    sum += r
    if (r < 1) under++
    if (Math.abs(r - 1) > opts.tolerance + 1e-12) outside++
    const b = Math.min(count - 1, Math.max(0, Math.floor((r - start) / width + 1e-9)))
    counts[b]!++
  }
  return {
    group: opts.group,
    basis: opts.basis,
    n,
    min: s[0]!,
    q1,
    median,
    q3,
    max: s[n - 1]!,
    mean: sum / n,
    whiskerLow,
    whiskerHigh,
    underestimateRate: under / n,
    outsideBandRate: outside / n,
    histogram: counts.map((c, i) => ({ x0: tidy(start + i * width), x1: tidy(start + (i + 1) * width), count: c })),
  }
}

import { scaleLinear, type ScaleLinear } from 'd3'
import type { RatioSummary } from '@shared/schemas/calibration'
import { plotBox, ticksOf, type Margin, type PlotBox, type Tick } from './axes'

/**
 * Geometry of the ratio (assumed / final) distribution, one row per group and basis: a Tukey
 * box-and-whisker from the summary's quartiles and whiskers, or its histogram, on one shared
 * ratio axis with the line ratio = 1 and the ±tolerance band. Pure.
 */

export interface DistributionInput {
  rows: readonly RatioSummary[]
  tolerance: number
  width: number
  /** Height of one row in px (its label line and the box below it). */
  rowHeight?: number
  margin?: Partial<Margin>
}

export interface BoxRow {
  summary: RatioSummary
  /** Top of the row, px. */
  top: number
  /** Vertical centre of the box, px. */
  mid: number
  /** Half height of the box, px. */
  half: number
  q1: number
  median: number
  q3: number
  whiskerLow: number
  whiskerHigh: number
  /** The extremes, drawn when they lie beyond a whisker (outliers exist). */
  min: number | undefined
  max: number | undefined
  bars: { x: number; y: number; width: number; height: number; count: number; x0: number; x1: number }[]
}

export interface DistributionGeometry {
  box: PlotBox
  height: number
  x: ScaleLinear<number, number>
  ticks: Tick[]
  /** Pixel x of ratio 1 and of the band edges. */
  one: number
  bandLeft: number
  bandRight: number
  rows: BoxRow[]
}

export const DISTRIBUTION_MARGIN: Margin = { top: 8, right: 16, bottom: 36, left: 16 }
const LABEL_SPACE = 20

/** The ratio domain: every row's extremes and histogram, the band and 1, padded 4 %. */
export function ratioDomain(rows: readonly RatioSummary[], tolerance: number): [number, number] {
  let lo = Math.min(1 - tolerance, 1)
  let hi = Math.max(1 + tolerance, 1)
  for (const r of rows) {
    for (const v of [r.min, r.max, r.whiskerLow, r.whiskerHigh, ...r.histogram.flatMap(b => [b.x0, b.x1])]) {
      if (!Number.isFinite(v)) continue
      lo = Math.min(lo, v)
      hi = Math.max(hi, v)
    }
  }
  const pad = (hi - lo) * 0.04
  return [lo - pad, hi + pad]
}

export function createDistribution(input: DistributionInput): DistributionGeometry {
  const rowHeight = input.rowHeight ?? 64
  const margin = { ...DISTRIBUTION_MARGIN, ...input.margin }
  const height = margin.top + margin.bottom + Math.max(1, input.rows.length) * rowHeight
  const box = plotBox(input.width, height, margin)
  const x = scaleLinear().domain(ratioDomain(input.rows, input.tolerance)).range([box.left, box.left + box.width]).nice()
  const rows = input.rows.map((s, i): BoxRow => {
    const top = box.top + i * rowHeight
    const plotTop = top + LABEL_SPACE
    const plotH = rowHeight - LABEL_SPACE - 6
    const maxCount = Math.max(1, ...s.histogram.map(b => b.count))
    return {
      summary: s,
      top,
      mid: plotTop + plotH / 2,
      half: Math.min(12, plotH / 2),
      q1: x(s.q1),
      median: x(s.median),
      q3: x(s.q3),
      whiskerLow: x(s.whiskerLow),
      whiskerHigh: x(s.whiskerHigh),
      min: s.min < s.whiskerLow ? x(s.min) : undefined,
      max: s.max > s.whiskerHigh ? x(s.max) : undefined,
      bars: s.histogram.map(b => {
        const h = (b.count / maxCount) * plotH
        return { x: x(b.x0), y: plotTop + plotH - h, width: Math.max(0, x(b.x1) - x(b.x0) - 1), height: h, count: b.count, x0: b.x0, x1: b.x1 }
      }),
    }
  })
  return {
    box,
    height,
    x,
    ticks: ticksOf(x, Math.max(2, Math.round(box.width / 90))),
    one: x(1),
    bandLeft: x(1 - input.tolerance),
    bandRight: x(1 + input.tolerance),
    rows,
  }
}

/**
 * Rows in display order: by group, then basis. Groups that come on more than one basis are
 * listed in `multiBasis`, so the screen can say that different bases are not pooled.
 */
export function orderRows(rows: readonly RatioSummary[]): { rows: RatioSummary[]; multiBasis: string[] } {
  const sorted = [...rows].sort((a, b) => a.group.localeCompare(b.group, undefined, { numeric: true }) || a.basis.localeCompare(b.basis))
  const bases = new Map<string, Set<string>>()
  for (const r of sorted) bases.set(r.group, (bases.get(r.group) ?? new Set()).add(r.basis))
  return { rows: sorted, multiBasis: [...bases].filter(([, b]) => b.size > 1).map(([g]) => g) }
}

import { scaleLinear, type ScaleLinear } from 'd3'
import type { PercentileBand } from '@shared/schemas/benchmarks'

/**
 * Percentile band rows (one per benchmark group): a thin P10–P90 range, a P25–P75 box and a median
 * tick on one linear scale shared by the groups. Pure: Vue draws the SVG.
 */

export interface BandRow {
  key: string
  label: string
  band: PercentileBand | null
  /** Too few projects to publish: drawn as a message, not a band. */
  suppressed: boolean
}

export interface BandGeometry {
  /** Pixel positions along the value axis. */
  p10: number
  p25: number
  p50: number
  p75: number
  p90: number
}

/**
 * The value scale of `rows`: from the smallest P10 (or 0 when all are positive) to the largest
 * P90 (or 0 when all are negative), rounded outward to nice values, onto [left, right] px.
 * With no band at all the domain is [0, 1].
 */
export function createBandScale(rows: readonly BandRow[], range: [number, number]): ScaleLinear<number, number> {
  const bands = rows.filter(r => !r.suppressed && r.band).map(r => r.band!)
  if (!bands.length) return scaleLinear().domain([0, 1]).range(range)
  let lo = Math.min(0, ...bands.map(b => b.p10))
  let hi = Math.max(0, ...bands.map(b => b.p90))
  if (lo === hi) hi = lo + 1
  return scaleLinear().domain([lo, hi]).nice().range(range)
}

/** Where a band's five percentiles fall on `x`. */
export function bandGeometry(band: PercentileBand, x: ScaleLinear<number, number>): BandGeometry {
  return { p10: x(band.p10), p25: x(band.p25), p50: x(band.p50), p75: x(band.p75), p90: x(band.p90) }
}

/** The chart as words, one sentence per group (its text alternative). */
export function describeBands(rows: readonly BandRow[], unit: string, format: (v: number) => string): string {
  return rows
    .map(r => {
      if (r.suppressed) return `${r.label}: too few projects to publish.`
      if (!r.band) return `${r.label}: no project has this figure.`
      const b = r.band
      return `${r.label} (${b.n} projects): median ${format(b.p50)} ${unit}, P25–P75 ${format(b.p25)}–${format(b.p75)}, P10–P90 ${format(b.p10)}–${format(b.p90)}.`
    })
    .join(' ')
}

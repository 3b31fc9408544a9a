import type { ScaleLinear } from 'd3'

/** Shared pieces of the calibration charts: ticks in pixels, margins, number formats. Pure. */

export interface Tick {
  value: number
  /** Position in pixels along the axis. */
  pos: number
  label: string
}

export interface Margin {
  top: number
  right: number
  bottom: number
  left: number
}

export interface PlotBox {
  left: number
  top: number
  width: number
  height: number
}

export function plotBox(width: number, height: number, margin: Margin): PlotBox {
  return { left: margin.left, top: margin.top, width: Math.max(1, width - margin.left - margin.right), height: Math.max(1, height - margin.top - margin.bottom) }
}

/** About `count` round ticks of a linear scale, with their pixel positions and labels. */
export function ticksOf(scale: ScaleLinear<number, number>, count: number, format: (v: number) => string = scale.tickFormat(count)): Tick[] {
  return scale.ticks(count).map(value => ({ value, pos: scale(value), label: format(value) }))
}

/** Integer-only ticks (years): no 2015.5. */
export function integerTicksOf(scale: ScaleLinear<number, number>, count: number): Tick[] {
  return scale
    .ticks(count)
    .filter(v => Number.isInteger(v))
    .map(value => ({ value, pos: scale(value), label: String(value) }))
}

/** A share 0…1 as a whole percent ("12 %"); not finite → "—". */
export function percent(share: number | null | undefined, digits = 0): string {
  if (share === null || share === undefined || !Number.isFinite(share)) return '—'
  return `${(share * 100).toFixed(digits)} %`
}

/** A number with fixed decimals, "—" when missing. */
export function fixed(value: number | null | undefined, digits = 2): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—'
  return value.toLocaleString('en-US', { minimumFractionDigits: digits, maximumFractionDigits: digits })
}

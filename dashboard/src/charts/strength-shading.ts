import { interpolateRgb, piecewise, scaleDiverging } from 'd3'
import { palette } from '../theme'

/**
 * Shading of a brace by how far its final adjusted compression strength moved from the assumed
 * one: shift = final Cmax / assumed Cmax − 1 (Cmax = β·ω·Ry·Fysc·Asc, AISC 341-16 F4.2a; both as
 * the engine recomputes them). A diverging scale of our own palette: steel blue where the final is
 * below the assumed (the frame was sized for more), a pale neutral at no change, amber to red where
 * the final is above (the beams, columns and connections were sized for less). Clamped at ±`SHIFT_LIMIT`.
 */

/** The shift at which the colour is full (±15 %). */
export const SHIFT_LIMIT = 0.15

export const SHADE_STOPS = Object.freeze({ below: palette.steel700, belowMid: palette.steel300, none: '#EEF1EE', aboveMid: palette.amber400, above: palette.red600 })
/** A brace with no final (governing) snapshot yet. */
export const PENDING_SHADE = palette.slate300

const scale = scaleDiverging<string>()
  .domain([-SHIFT_LIMIT, 0, SHIFT_LIMIT])
  .interpolator(piecewise(interpolateRgb, [SHADE_STOPS.below, SHADE_STOPS.belowMid, SHADE_STOPS.none, SHADE_STOPS.aboveMid, SHADE_STOPS.above]))
  .clamp(true)

/** final / assumed − 1, or null when either is missing or the assumed is not positive. */
export function strengthShift(assumedCmaxKip: number | null | undefined, finalCmaxKip: number | null | undefined): number | null {
  if (assumedCmaxKip === null || assumedCmaxKip === undefined || finalCmaxKip === null || finalCmaxKip === undefined) return null
  if (!(assumedCmaxKip > 0) || !Number.isFinite(finalCmaxKip)) return null
  return finalCmaxKip / assumedCmaxKip - 1
}

/** The colour of a shift (null → the pending grey). */
export function shadeOf(shift: number | null): string {
  return shift === null || !Number.isFinite(shift) ? PENDING_SHADE : scale(shift)
}

/** The legend: evenly spaced stops from −limit to +limit, each with its colour and label. */
export function shadeLegend(steps = 7): { value: number; color: string; label: string }[] {
  if (!(steps >= 2)) throw new RangeError('steps: must be at least 2.')
  return Array.from({ length: steps }, (_, i) => {
    const value = -SHIFT_LIMIT + (2 * SHIFT_LIMIT * i) / (steps - 1)
    const pct = Math.round(value * 1000) / 10
    const label = `${pct > 0 ? '+' : pct < 0 ? '−' : '±'}${Math.abs(pct)} %${i === 0 ? ' or less' : i === steps - 1 ? ' or more' : ''}`
    return { value, color: scale(value), label }
  })
}

/** The shift in words for a label or a screen reader: "final Cmax 4.2 % above assumed". */
export function shiftWords(shift: number | null): string {
  if (shift === null) return 'final values pending'
  const pct = (Math.abs(shift) * 100).toFixed(1)
  if (Number(pct) === 0) return 'final Cmax equal to assumed'
  return `final Cmax ${pct} % ${shift > 0 ? 'above' : 'below'} assumed`
}

import type { ColumnSpec } from '@shared/history/columns'
import { IMPORT_UNIT_FACTORS } from '@shared/units/tokens'

/**
 * Why a value that parses may still be wrong, for the review queue. Never changes the value.
 * Checks, in order: a decimal slip (×10 or ÷10 lands in the plausible band: 3.8 where 38 was
 * meant), a value typed in the other system's unit (MPa in a ksi column, kN in a kip column),
 * then a plain outlier beyond the band.
 */
export function suspectValue(spec: ColumnSpec, stored: number, asWritten: number, unit: string | undefined): string | undefined {
  const band = spec.plausible
  if (!band) return undefined
  const [lo, hi] = band
  // Hot path: most values are in band, so decide that before any other work.
  if (stored >= lo && stored <= hi) return undefined
  const inBand = (v: number) => v >= lo && v <= hi
  const shown = unit ? `${asWritten} ${unit}` : String(asWritten)
  if (spec.quantity && unit) {
    for (const [other, factor] of Object.entries(IMPORT_UNIT_FACTORS[spec.quantity])) {
      if (other === unit) continue
      if (inBand(asWritten * factor)) return `${spec.name} ${shown} is outside the usual ${lo}–${hi}; it fits if it was written in ${other} — likely a unit slip.`
    }
  }
  for (const [k, label] of [
    [10, 'a decimal slip (ten times too small)'],
    [0.1, 'a decimal slip (ten times too large)'],
    [0.01, 'a percentage typed as a ratio'],
  ] as const) {
    if (inBand(stored * k)) return `${spec.name} ${shown} is outside the usual ${lo}–${hi}; likely ${label}.`
  }
  return `${spec.name} ${shown} is outside the plausible range ${lo}–${hi}.`
}

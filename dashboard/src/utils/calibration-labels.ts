import { QUANTITY_INFO, type CalibrationGrouping, type CalibrationOptions, type CalibrationQuantity } from '@shared/schemas/calibration'
import { toDisplay, unitOf, type QuantityKind, type UnitSystem } from '@shared/units/systems'
import { CONFIGURATION_LABELS } from './worksheet-summary'

/** Words and units of the calibration screens, in one place. Pure. */

export const PHASE_LABELS = {
  sd: { short: 'SD', long: 'Schematic design' },
  dd: { short: 'DD', long: 'Design development' },
  cd: { short: 'CD', long: 'Construction documents' },
} as const

export const GROUPING_LABELS: Record<CalibrationGrouping, string> = {
  supplier: 'Supplier',
  configuration: 'Configuration',
  yearBand: 'Year band',
  office: 'Office',
  none: 'No grouping',
}

/** The quantities the picker offers, short names first. */
export const QUANTITY_SHORT: Record<CalibrationQuantity, string> = {
  beta: 'β',
  omega: 'ω',
  overstrength: 'Expected yield stress',
  stiffness: 'Stiffness',
  coreArea: 'Core area',
  tmax: 'Tmax',
  cmax: 'Cmax',
}

/** A stored configuration key in words ("inverted_v" → "Inverted-V (chevron)"); unknown keys as they are. */
export function configurationLabel(key: string): string {
  return (CONFIGURATION_LABELS as Record<string, string>)[key] ?? key
}

/** A group's name for people: supplier names instead of codes, configurations in words. */
export function groupLabel(grouping: CalibrationGrouping, group: string, options: CalibrationOptions | undefined): string {
  if (grouping === 'supplier') return options?.suppliers.find(s => s.code === group)?.name ?? group
  if (grouping === 'configuration') return configurationLabel(group)
  if (grouping === 'none') return group || 'All braces'
  return group
}

const KIND: Record<CalibrationQuantity, QuantityKind> = {
  beta: 'ratio',
  omega: 'ratio',
  stiffness: 'ratio',
  overstrength: 'stress',
  coreArea: 'area',
  tmax: 'force',
  cmax: 'force',
}

/** A quantity's API value (ksi, in², kip or a factor) in the display units of `units`. */
export function displayValue(quantity: CalibrationQuantity, value: number, units: UnitSystem): number {
  const kind = KIND[quantity]
  return kind === 'ratio' ? value : toDisplay(kind, value, units)
}

/** The display unit of a quantity ("" for factors). */
export function displayUnit(quantity: CalibrationQuantity, units: UnitSystem): string {
  const kind = KIND[quantity]
  return kind === 'ratio' ? '' : unitOf(kind, units)
}

/** Decimals to show a quantity's value with. */
export function displayDigits(quantity: CalibrationQuantity, units: UnitSystem): number {
  switch (KIND[quantity]) {
    case 'ratio':
      return 3
    case 'stress':
      return units === 'us' ? 1 : 0
    case 'area':
      return units === 'us' ? 2 : 0
    default:
      return units === 'us' ? 1 : 0
  }
}

/** "Cmax (kip)" / "β": an axis title. */
export function axisTitle(quantity: CalibrationQuantity, units: UnitSystem, which: 'Assumed' | 'Final'): string {
  const unit = displayUnit(quantity, units)
  return `${which} ${QUANTITY_SHORT[quantity]}${unit ? ` (${unit})` : ''}`
}

export const quantityLabel = (q: CalibrationQuantity) => QUANTITY_INFO[q].label

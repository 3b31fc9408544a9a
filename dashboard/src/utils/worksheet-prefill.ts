import type { UnitSystem } from '@shared/units/systems'
import { convertValue, createLevelRow, type BasisForm, type LevelRow, type WorksheetForm } from './worksheet-form'

/**
 * A pending update of the New frame worksheet made on another screen (the starting factors, later
 * a precedent's geometry): part of the sizing basis, and optionally the frame and its stories,
 * with the unit system its numbers are in. Pure, no Vue: the store holds it, the worksheet applies it.
 */
export interface WorksheetPrefill {
  /** What is handed over and where it comes from, shown as "<what> applied from <source>." */
  what: string
  source: string
  /** Unit system of the numbers below (stresses, lengths, forces, areas). */
  units: UnitSystem
  basis?: Partial<Omit<BasisForm, 'coreSteps' | 'useCoreSteps'>>
  label?: string
  configuration?: WorksheetForm['configuration']
  bayWidth?: number | null
  bracedBays?: number | null
  /** Stories bottom first; replaces the worksheet's stories when given. */
  levels?: Omit<LevelRow, 'id'>[]
}

const STRESS_KEYS = ['fyscMin', 'fyscMax', 'fysc'] as const

/**
 * The worksheet with the prefill applied: the prefill's numbers converted into the worksheet's
 * units, only the fields it carries changed, and the capacity basis switched to the kind whose
 * value it sets (a yield-range upper bound means the yield-range basis).
 */
export function applyWorksheetPrefill(form: WorksheetForm, prefill: WorksheetPrefill): WorksheetForm {
  const from = prefill.units
  const to = form.units
  const next: WorksheetForm = { ...form, basis: { ...form.basis } }
  if (prefill.basis) {
    for (const [key, value] of Object.entries(prefill.basis) as [keyof NonNullable<WorksheetPrefill['basis']>, unknown][]) {
      if (value === undefined) continue
      if ((STRESS_KEYS as readonly string[]).includes(key)) {
        ;(next.basis as unknown as Record<string, unknown>)[key] = convertValue('stress', value as number | null, from, to)
      } else {
        ;(next.basis as unknown as Record<string, unknown>)[key] = value
      }
    }
    if (prefill.basis.basisKind === undefined) {
      if (prefill.basis.fyscMax != null) next.basis.basisKind = 'yieldRange'
      else if (prefill.basis.fysc != null) next.basis.basisKind = 'coupon'
      else if (prefill.basis.ry != null) next.basis.basisKind = 'ry'
    }
  }
  if (prefill.label !== undefined) next.label = prefill.label
  if (prefill.configuration !== undefined) next.configuration = prefill.configuration
  if (prefill.bayWidth !== undefined) next.bayWidth = convertValue('dimension', prefill.bayWidth, from, to)
  if (prefill.bracedBays !== undefined) next.bracedBays = prefill.bracedBays
  if (prefill.levels) {
    next.levels = prefill.levels.map((l, i) =>
      createLevelRow(i, {
        name: l.name,
        storyHeight: convertValue('dimension', l.storyHeight, from, to),
        storyShear: convertValue('force', l.storyShear, from, to),
      }),
    )
  }
  return next
}

import { unitOf } from '@shared/units/systems'
import type { WorksheetForm } from './worksheet-form'

/** Human names of the choices, shared by the form, the printable page and the CSV. */
export const CONFIGURATION_LABELS = {
  single_diagonal: 'Single diagonal',
  inverted_v: 'Inverted-V (chevron)',
  v: 'V',
  two_story_x: 'Two-story X',
} as const

export const METHOD_LABELS = { lrfd: 'LRFD', asd: 'ASD' } as const

export const BASIS_LABELS = {
  ry: 'Ry × Fysc,min',
  yieldRange: 'Ordered yield window (Fysc,max)',
  coupon: 'Coupon-tested Fysc',
} as const

export interface InputLine {
  label: string
  value: string | number
  unit: string
}

/** The worksheet's inputs as label / value / unit lines (frame, then sizing basis; levels are listed separately). */
export function describeInputs(form: WorksheetForm): InputLine[] {
  const u = form.units
  const b = form.basis
  const v = (x: number | null) => (x === null ? '' : x)
  const lines: InputLine[] = [
    { label: 'Frame', value: form.label.trim(), unit: '' },
    { label: 'Units', value: u === 'us' ? 'US customary' : 'SI', unit: '' },
    { label: 'Configuration', value: CONFIGURATION_LABELS[form.configuration], unit: '' },
    { label: 'Bay width', value: v(form.bayWidth), unit: unitOf('dimension', u) },
    { label: 'Braced bays', value: v(form.bracedBays), unit: '' },
    { label: 'Design method', value: METHOD_LABELS[b.method], unit: '' },
    { label: 'Fysc,min', value: v(b.fyscMin), unit: unitOf('stress', u) },
    { label: 'Capacity basis', value: BASIS_LABELS[b.basisKind], unit: '' },
  ]
  if (b.basisKind === 'ry') lines.push({ label: 'Ry', value: v(b.ry), unit: '' })
  if (b.basisKind === 'yieldRange') lines.push({ label: 'Fysc,max', value: v(b.fyscMax), unit: unitOf('stress', u) })
  if (b.basisKind === 'coupon') lines.push({ label: 'Fysc (coupon)', value: v(b.fysc), unit: unitOf('stress', u) })
  lines.push(
    { label: 'β', value: v(b.beta), unit: '' },
    { label: 'ω', value: v(b.omega), unit: '' },
    { label: 'Stiffness factor KF', value: v(b.stiffnessFactor), unit: '' },
    { label: 'Ly/Lwp', value: v(b.yieldLengthRatio), unit: '' },
    {
      label: 'Core increments',
      value: b.useCoreSteps
        ? b.coreSteps.map(s => `${s.step ?? '?'} up to ${s.upTo === null ? 'any size' : s.upTo}`).join('; ')
        : 'engine default table',
      unit: unitOf('area', u),
    },
  )
  return lines
}

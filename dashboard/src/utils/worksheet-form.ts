import { z } from 'zod'
import type { DesignMethod } from '@shared/engineering/core-size'
import { BRACE_CONFIGURATIONS, type BraceConfiguration } from '@shared/engineering/geometry'
import type { SizeFrameRequest } from '@shared/engineering/size-frame-input'
import { FALLBACK_SIZING_DEFAULTS, type SizingDefaults } from '@shared/schemas/settings'
import { fromDisplay, toDisplay, UNIT_SYSTEMS, type QuantityKind, type UnitSystem } from '@shared/units/systems'

/**
 * The New frame worksheet as the form holds it: every number in the display units of `units`
 * (US ft / kip / ksi / in², SI m / kN / MPa / mm²), `null` where the field is empty.
 * Pure: no Vue, no DOM, so it is unit-tested in node and saved to the server as JSON.
 */

export type CapacityBasisKind = 'ry' | 'yieldRange' | 'coupon'
export const CAPACITY_BASIS_KINDS = ['ry', 'yieldRange', 'coupon'] as const satisfies readonly CapacityBasisKind[]

export interface LevelRow {
  /** Stable key for the table rows (not sent to the engine). */
  id: string
  name: string
  storyHeight: number | null
  storyShear: number | null
}

export interface CoreStepRow {
  upTo: number | null
  step: number | null
}

/** The sizing basis: the part of the worksheet that the firm's defaults set. */
export interface BasisForm {
  method: DesignMethod
  fyscMin: number | null
  basisKind: CapacityBasisKind
  /** The value of each capacity-basis kind is kept, so switching kinds back and forth loses nothing. */
  ry: number | null
  fyscMax: number | null
  fysc: number | null
  beta: number | null
  omega: number | null
  stiffnessFactor: number | null
  yieldLengthRatio: number | null
  /** Send our own core-increment table; off means the engine's default table. */
  useCoreSteps: boolean
  coreSteps: CoreStepRow[]
}

export interface WorksheetForm {
  version: 1
  units: UnitSystem
  label: string
  configuration: BraceConfiguration
  bayWidth: number | null
  bracedBays: number | null
  levels: LevelRow[]
  basis: BasisForm
}

const Num = z.number().nullable() // zod 4 numbers reject NaN and ±Infinity

/** Checks a saved worksheet before the screen trusts it; anything else falls back to a fresh one. */
export const WorksheetFormState = z.object({
  version: z.literal(1),
  units: z.enum(UNIT_SYSTEMS),
  label: z.string().max(200),
  configuration: z.enum(BRACE_CONFIGURATIONS),
  bayWidth: Num,
  bracedBays: Num,
  levels: z.array(z.object({ id: z.string().max(40), name: z.string().max(200), storyHeight: Num, storyShear: Num })).max(60),
  basis: z.object({
    method: z.enum(['lrfd', 'asd']),
    fyscMin: Num,
    basisKind: z.enum(CAPACITY_BASIS_KINDS),
    ry: Num,
    fyscMax: Num,
    fysc: Num,
    beta: Num,
    omega: Num,
    stiffnessFactor: Num,
    yieldLengthRatio: Num,
    useCoreSteps: z.boolean(),
    coreSteps: z.array(z.object({ upTo: Num, step: Num })).max(20),
  }),
})

/** The saved worksheet as a form, or `undefined` when it is missing or no longer fits the form. */
export function maybeWorksheetForm(state: unknown): WorksheetForm | undefined {
  const parsed = WorksheetFormState.safeParse(state)
  return parsed.success ? (parsed.data as WorksheetForm) : undefined
}

let nextId = 0
/** A fresh row key, unique within this page load (saved keys are re-used as they are). */
export function createRowId(): string {
  nextId += 1
  return `r${Date.now().toString(36)}${nextId}`
}

export function createLevelRow(index: number, values: Partial<Omit<LevelRow, 'id'>> = {}): LevelRow {
  return { id: createRowId(), name: `L${index + 1}`, storyHeight: null, storyShear: null, ...values }
}

/**
 * The shortest decimal within a relative `tolerance` of `value` (default 1e-9): removes the float
 * noise of a unit conversion (9.144000000000002 → 9.144, 38 ksi → 262.000777 MPa) while keeping the
 * physical value. Because the same rule runs both ways, a value typed with a few digits comes back
 * exactly after US → SI → US (38 → 262.000777 → 38), which a fixed digit count cannot promise.
 */
export function roundSignificant(value: number, tolerance = 1e-9): number {
  if (!Number.isFinite(value) || value === 0) return value
  for (let digits = 1; digits < 17; digits++) {
    const candidate = Number(value.toPrecision(digits))
    if (Math.abs(candidate - value) <= tolerance * Math.abs(value)) return candidate
  }
  return value
}

/** Convert one display value of `kind` from one unit system to the other (null stays null). */
export function convertValue(kind: QuantityKind, value: number | null, from: UnitSystem, to: UnitSystem): number | null {
  if (value === null || from === to) return value
  return roundSignificant(toDisplay(kind, fromDisplay(kind, value, from), to))
}

/** The sizing basis of the firm's defaults (stored in ksi and in²), in the display units of `units`. */
export function basisFromDefaults(defaults: SizingDefaults, units: UnitSystem): BasisForm {
  const stress = (v: number) => convertValue('stress', v, 'us', units)
  const area = (v: number | null) => convertValue('area', v, 'us', units)
  const b = defaults.capacityBasis
  return {
    method: defaults.method,
    fyscMin: stress(defaults.fyscMin),
    basisKind: b.kind,
    ry: b.kind === 'ry' ? b.ry : null,
    fyscMax: b.kind === 'yieldRange' ? stress(b.fyscMax) : null,
    fysc: b.kind === 'coupon' ? stress(b.fysc) : null,
    beta: defaults.beta,
    omega: defaults.omega,
    stiffnessFactor: defaults.stiffnessFactor,
    yieldLengthRatio: defaults.yieldLengthRatio,
    useCoreSteps: true,
    coreSteps: defaults.coreSteps.map(s => ({ upTo: area(s.upTo), step: area(s.step) })),
  }
}

/**
 * The firm's defaults from a basis form in `units`, back in ksi and in², ready for
 * `SizingDefaults.parse` (empty fields come out as `undefined`, which the schema reports).
 */
export function basisToDefaults(basis: BasisForm, units: UnitSystem, stiffnessTolerance: number | null): Record<string, unknown> {
  const stress = (v: number | null) => maybeNumber(convertValue('stress', v, units, 'us'))
  const area = (v: number | null) => convertValue('area', v, units, 'us')
  return {
    method: basis.method,
    fyscMin: stress(basis.fyscMin),
    capacityBasis: toCapacityBasis(basis, stress),
    beta: maybeNumber(basis.beta),
    omega: maybeNumber(basis.omega),
    stiffnessFactor: maybeNumber(basis.stiffnessFactor),
    yieldLengthRatio: maybeNumber(basis.yieldLengthRatio),
    // upTo null is meaningful (the open last band); an empty step is reported by the schema.
    coreSteps: basis.coreSteps.map(s => ({ upTo: area(s.upTo), step: maybeNumber(area(s.step)) })),
    stiffnessTolerance: maybeNumber(stiffnessTolerance),
  }
}

/** A fresh worksheet: an empty frame with the firm's sizing basis. */
export function createWorksheetForm(defaults: SizingDefaults = FALLBACK_SIZING_DEFAULTS, units: UnitSystem = 'us'): WorksheetForm {
  return {
    version: 1,
    units,
    label: '',
    configuration: 'inverted_v',
    bayWidth: null,
    bracedBays: 1,
    levels: [createLevelRow(0), createLevelRow(1), createLevelRow(2)],
    basis: basisFromDefaults(defaults, units),
  }
}

/** The basis form in another unit system: stresses and core-step areas convert, factors do not. */
export function convertBasis(basis: BasisForm, from: UnitSystem, to: UnitSystem): BasisForm {
  const stress = (v: number | null) => convertValue('stress', v, from, to)
  const area = (v: number | null) => convertValue('area', v, from, to)
  return {
    ...basis,
    fyscMin: stress(basis.fyscMin),
    fyscMax: stress(basis.fyscMax),
    fysc: stress(basis.fysc),
    coreSteps: basis.coreSteps.map(s => ({ upTo: area(s.upTo), step: area(s.step) })),
  }
}

/**
 * The same physical frame in another unit system: bay width and story heights (ft ↔ m),
 * shears (kip ↔ kN), stresses (ksi ↔ MPa) and core-step areas (in² ↔ mm²) convert;
 * names, counts and dimensionless factors stay as they are.
 */
export function convertWorksheetForm(form: WorksheetForm, to: UnitSystem): WorksheetForm {
  const from = form.units
  if (from === to) return form
  const dim = (v: number | null) => convertValue('dimension', v, from, to)
  return {
    ...form,
    units: to,
    bayWidth: dim(form.bayWidth),
    levels: form.levels.map(l => ({ ...l, storyHeight: dim(l.storyHeight), storyShear: convertValue('force', l.storyShear, from, to) })),
    basis: convertBasis(form.basis, from, to),
  }
}

/** Empty form fields go to the engine as "missing", so its message reads "got nothing; enter …". */
function maybeNumber(value: number | null): number {
  return (value ?? undefined) as number
}

function toCapacityBasis(basis: BasisForm, stress: (v: number | null) => number): SizeFrameRequest['capacityBasis'] {
  switch (basis.basisKind) {
    case 'ry':
      return { kind: 'ry', ry: maybeNumber(basis.ry) }
    case 'yieldRange':
      return { kind: 'yieldRange', fyscMax: stress(basis.fyscMax) }
    case 'coupon':
      return { kind: 'coupon', fysc: stress(basis.fysc) }
  }
}

/** The `sizeFrame` / `POST /api/sizing/frame` request of a worksheet, in the worksheet's units. */
export function toSizingRequest(form: WorksheetForm): SizeFrameRequest {
  const b = form.basis
  const request: SizeFrameRequest = {
    units: form.units,
    method: b.method,
    configuration: form.configuration,
    bayWidth: maybeNumber(form.bayWidth),
    bracedBays: maybeNumber(form.bracedBays),
    levels: form.levels.map(l => ({ name: l.name.trim(), storyHeight: maybeNumber(l.storyHeight), storyShear: maybeNumber(l.storyShear) })),
    fyscMin: maybeNumber(b.fyscMin),
    capacityBasis: toCapacityBasis(b, v => maybeNumber(v)),
    beta: maybeNumber(b.beta),
    omega: maybeNumber(b.omega),
    stiffnessFactor: maybeNumber(b.stiffnessFactor),
    yieldLengthRatio: maybeNumber(b.yieldLengthRatio),
  }
  if (b.useCoreSteps) request.coreSteps = b.coreSteps.map(s => ({ upTo: s.upTo, step: maybeNumber(s.step) }))
  return request
}

/** True while nothing of the frame itself has been entered (results and errors would only be noise). */
export function isFrameEmpty(form: WorksheetForm): boolean {
  return form.bayWidth === null && form.levels.every(l => l.storyHeight === null && l.storyShear === null)
}

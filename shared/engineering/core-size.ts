import { EngineeringInputError, isFiniteNumber, requirePositive, type InputIssue } from './errors'

/**
 * Required steel core area and rounding up to an available core size.
 * Areas in in², forces in kips, stresses in ksi.
 *
 * Sources: φ = 0.90 (LRFD) and Ω = 1.67 (ASD) for the steel core, AISC 341 F4.5b (from memory;
 * the same factors as AISC 360 tensile yielding). The increment table is common practice, no source.
 */

/** Design method of the core check. */
export type DesignMethod = 'lrfd' | 'asd'

/** All design methods, for validation and pickers. */
export const DESIGN_METHODS = ['lrfd', 'asd'] as const satisfies readonly DesignMethod[]

/** Resistance factor φ for the core, LRFD: 0.90 (AISC 341 F4.5b, from memory). */
export const CORE_RESISTANCE_FACTOR = 0.9

/** Safety factor Ω for the core, ASD: 1.67 (AISC 341 F4.5b, from memory). */
export const CORE_SAFETY_FACTOR = 1.67

/**
 * One band of a core-increment table: sizes step by `stepIn2` from the previous band's
 * upper bound (0 for the first band) up to and including `upToIn2`. `upToIn2: null` means
 * "no upper bound" and must be the last band.
 */
export interface CoreStepBand {
  upToIn2: number | null
  stepIn2: number
}

/**
 * Default core-increment table (common practice, no source): 0.25 in² steps up to 5 in²,
 * 0.5 in² steps above 5 up to and including 10 in², 1.0 in² steps above 10 in².
 * A firm can pass its own table (for example its supplier's plate sizes).
 */
export const DEFAULT_CORE_STEPS: readonly CoreStepBand[] = Object.freeze([
  Object.freeze({ upToIn2: 5, stepIn2: 0.25 }),
  Object.freeze({ upToIn2: 10, stepIn2: 0.5 }),
  Object.freeze({ upToIn2: null, stepIn2: 1 }),
])

const defaults = {
  /** Relative tolerance: a required area at most this fraction above a size stays on that size. */
  relativeTolerance: 1e-9,
}

/**
 * Problems with an increment table given as `{ upTo, step }` bands in any one unit.
 * Rules: at least one band; every step a finite number > 0; bounds finite, > 0 and strictly
 * increasing; only the last band has `upTo: null` (the table must cover every area); each
 * bounded band is a whole number of its steps wide, so sizes line up at band boundaries.
 * `names` gives the property names used in the issue paths. Returns [] when the table is valid.
 */
export function findStepBandIssues(
  bands: readonly { upTo: number | null; step: number }[],
  field: string,
  names: { upTo: string; step: string } = { upTo: 'upTo', step: 'step' },
): InputIssue[] {
  if (!Array.isArray(bands) || bands.length === 0) {
    return [{ field, message: 'must list at least one band, the last with no upper bound (null).' }]
  }
  const issues: InputIssue[] = []
  let previous = 0
  bands.forEach((band, i) => {
    const last = i === bands.length - 1
    const { upTo, step } = band ?? ({} as { upTo: unknown; step: unknown })
    if (!isFiniteNumber(step) || step <= 0) {
      issues.push({ field: `${field}.${i}.${names.step}`, message: 'must be a finite number greater than 0.' })
      return
    }
    if (upTo === null) {
      if (!last) issues.push({ field: `${field}.${i}.${names.upTo}`, message: 'only the last band may have no upper bound (null).' })
      return
    }
    if (!isFiniteNumber(upTo) || upTo <= previous) {
      issues.push({
        field: `${field}.${i}.${names.upTo}`,
        message: `must be a finite number greater than the previous bound (${previous}).`,
      })
      return
    }
    const stepsInBand = (upTo - previous) / step
    if (Math.abs(stepsInBand - Math.round(stepsInBand)) > 1e-9 * Math.max(1, stepsInBand)) {
      issues.push({
        field: `${field}.${i}.${names.step}`,
        message: `the band from ${previous} to ${upTo} must be a whole number of steps of ${step}.`,
      })
    }
    if (last) issues.push({ field: `${field}.${i}.${names.upTo}`, message: 'the last band must have no upper bound (null).' })
    previous = upTo
  })
  return issues
}

/** Throw `EngineeringInputError` (field `coreSteps.i.…`) unless `steps` is a valid increment table. */
export function validateCoreSteps(steps: readonly CoreStepBand[], field = 'coreSteps'): void {
  const bands = Array.isArray(steps) ? steps.map((band) => ({ upTo: band?.upToIn2, step: band?.stepIn2 })) : []
  const issues = findStepBandIssues(bands, field, { upTo: 'upToIn2', step: 'stepIn2' })
  if (issues.length > 0) throw EngineeringInputError.fromIssues(issues)
}

/**
 * Required core area, in²:
 * LRFD Asc,req = |Pu| / (φ · Fysc,min), φ = 0.90; ASD Asc,req = Ω · |Pa| / Fysc,min, Ω = 1.67
 * (AISC 341 F4.5b, from memory; derived in engineering reference §1.1 [D]).
 * Throws `EngineeringInputError` for a non-finite or zero demand or Fysc ≤ 0.
 */
export function computeRequiredCoreArea(options: { demandKip: number; fyscKsi: number; method: DesignMethod }): number {
  const demandKip = Math.abs(requirePositiveMagnitude(options.demandKip))
  const fyscKsi = requirePositive(options.fyscKsi, 'fyscKsi', 'the specified minimum core yield stress in ksi')
  return options.method === 'asd'
    ? (CORE_SAFETY_FACTOR * demandKip) / fyscKsi
    : demandKip / (CORE_RESISTANCE_FACTOR * fyscKsi)
}

function requirePositiveMagnitude(demandKip: number): number {
  if (!isFiniteNumber(demandKip) || demandKip === 0) {
    throw new EngineeringInputError('demandKip', `must be a finite, non-zero brace force in kips (got ${demandKip}).`)
  }
  return demandKip
}

/**
 * Demand/capacity ratio of the core: LRFD |Pu| / (φ · Fysc · Asc); ASD Ω · |Pa| / (Fysc · Asc)
 * (AISC 341 F4.5b, from memory). A ratio above 1 is a returned outcome, not an error.
 */
export function computeDemandCapacityRatio(options: {
  demandKip: number
  coreAreaIn2: number
  fyscKsi: number
  method: DesignMethod
}): number {
  const areaIn2 = requirePositive(options.coreAreaIn2, 'coreAreaIn2', 'the provided core area in in²')
  const fyscKsi = requirePositive(options.fyscKsi, 'fyscKsi', 'the specified minimum core yield stress in ksi')
  const demandKip = Math.abs(options.demandKip)
  return options.method === 'asd'
    ? (CORE_SAFETY_FACTOR * demandKip) / (fyscKsi * areaIn2)
    : demandKip / (CORE_RESISTANCE_FACTOR * fyscKsi * areaIn2)
}

/** Tidy float noise from step arithmetic (0.1 × 3 → 0.3) without moving a size by more than 1e-12 relative. */
const tidy = (value: number): number => Number(value.toPrecision(12))

/**
 * Round a required core area UP to the next available size of an increment table
 * (engineering reference §6.2 [C]; the default table is common practice, no source).
 * Never rounds down, except that a required area within `relativeTolerance` (default 1e-9)
 * above a size stays on that size, so 4.5000000001 in² gives 4.5 in², not 4.75.
 * Throws `EngineeringInputError` for a required area that is not a finite number > 0 or an invalid table.
 */
export function roundUpCoreArea(
  requiredIn2: number,
  options: { steps?: readonly CoreStepBand[]; relativeTolerance?: number } = {},
): number {
  const required = requirePositive(requiredIn2, 'requiredIn2', 'the required core area in in²')
  const { steps = DEFAULT_CORE_STEPS, relativeTolerance = defaults.relativeTolerance } = options
  validateCoreSteps(steps)
  const within = (size: number) => required <= size * (1 + relativeTolerance)
  let previous = 0
  for (const { upToIn2, stepIn2 } of steps) {
    if (upToIn2 === null || within(upToIn2)) {
      const k = Math.max(1, Math.ceil((required - previous) / stepIn2))
      const lower = previous + (k - 1) * stepIn2
      const size = k > 1 && within(lower) ? lower : previous + k * stepIn2
      return upToIn2 === null ? tidy(size) : Math.min(tidy(size), upToIn2)
    }
    previous = upToIn2
  }
  // Unreachable: validateCoreSteps guarantees a final unbounded band.
  throw new EngineeringInputError('coreSteps', 'the last band must have no upper bound (null).')
}

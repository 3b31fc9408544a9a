import { EngineeringInputError, isFiniteNumber, requirePositive } from './errors'

/**
 * Steel weights. Weights are pounds (mass), areas in², lengths inches, unit weight lb/ft³.
 * Source: unit weight of structural steel 490 lb/ft³ (AISC Manual / ASCE 7 dead load, from memory).
 */

/** Unit weight of structural steel, 490 lb/ft³ (AISC Manual, from memory). */
export const STEEL_DENSITY_LB_PER_FT3 = 490

/**
 * Default ratio of total brace steel weight to the weight of a core-area bar over the full
 * work-point length (490·Asc·Lwp/1728). It stands for casing and end-connection steel and is a
 * placeholder: common practice, no source. Replace it with a ratio fitted to the firm's own submittals.
 */
export const DEFAULT_BRACE_TO_CORE_WEIGHT_RATIO = 2.5

/** Weight per foot of a prismatic steel member: 490 · A / 144 lb/ft (≈ 3.40 lb/ft per in²; derived). */
export function computeWeightPerFoot(areaIn2: number): number {
  return (STEEL_DENSITY_LB_PER_FT3 * requirePositive(areaIn2, 'areaIn2', 'the steel area in in²')) / 144
}

/** Weight of the yielding core: 490 · Asc · Ly / 1728 lb (Ly in inches; derived from the unit weight). */
export function computeCoreWeight(options: { coreAreaIn2: number; yieldLengthIn: number }): number {
  const area = requirePositive(options.coreAreaIn2, 'coreAreaIn2', 'the core area in in²')
  const length = requirePositive(options.yieldLengthIn, 'yieldLengthIn', 'the yielding length in inches')
  return (STEEL_DENSITY_LB_PER_FT3 * area * length) / 1728
}

/** A firm's fitted brace-to-core weight ratio, from its history of submittals. */
export interface BraceWeightHistory {
  /** Fitted ratio: actual brace steel weight / (490·Asc·Lwp/1728). Must be ≥ 1. */
  ratio: number
  /** Number of braces the fit used (reported back, so screens can show n). */
  sampleCount: number
}

/** Result of `estimateBraceWeight`. */
export interface BraceWeightEstimate {
  /** Estimated steel weight of one brace, lb. */
  weightLb: number
  /** Ratio used. */
  ratio: number
  /** Where the ratio came from. */
  basis: 'history' | 'default'
  /** Human-readable label of the basis, for screens and reports. */
  label: string
}

/**
 * Estimated steel weight of one brace: ratio × 490 · Asc · Lwp / 1728 lb. Uses the firm's fitted
 * ratio when `history` is given, else `DEFAULT_BRACE_TO_CORE_WEIGHT_RATIO` (common practice, no source),
 * and says which in `basis` and `label`. Throws `EngineeringInputError` for a non-positive area or
 * length, or a history ratio below 1 or a sample count that is not a whole number ≥ 1.
 */
export function estimateBraceWeight(coreAreaIn2: number, lwpIn: number, history?: BraceWeightHistory): BraceWeightEstimate {
  const area = requirePositive(coreAreaIn2, 'coreAreaIn2', 'the core area in in²')
  const length = requirePositive(lwpIn, 'lwpIn', 'the work-point length in inches')
  if (history !== undefined) {
    if (!isFiniteNumber(history.ratio) || history.ratio < 1) {
      throw new EngineeringInputError('history.ratio', `must be a finite number of at least 1 (got ${history.ratio}); a brace weighs at least its core.`)
    }
    if (!Number.isInteger(history.sampleCount) || history.sampleCount < 1) {
      throw new EngineeringInputError('history.sampleCount', `must be a whole number of at least 1 (got ${history.sampleCount}).`)
    }
  }
  const ratio = history?.ratio ?? DEFAULT_BRACE_TO_CORE_WEIGHT_RATIO
  return {
    weightLb: (ratio * STEEL_DENSITY_LB_PER_FT3 * area * length) / 1728,
    ratio,
    basis: history ? 'history' : 'default',
    label: history
      ? `Firm history fit, ratio ${ratio} from ${history.sampleCount} braces`
      : `Default ratio ${ratio} (placeholder, common practice, no source)`,
  }
}

import { EngineeringInputError, requireFinite, requirePositive } from './errors'
import { degToRad } from './geometry'

/**
 * Brace axial stiffness, yield deformation, drift at yield and core strain.
 * Lengths in inches, forces in kips, stiffness in kip/in, E in ksi.
 * Source: K = KF·E·Asc/Lwp and Δby ≈ Pysc/K (engineering reference §5 and §6.3 [D]).
 */

/** Steel modulus of elasticity used by AISC: 29,000 ksi (from memory, standard AISC value). */
export const STEEL_MODULUS_KSI = 29_000

/**
 * Brace axial stiffness K = KF · E · Asc / Lwp, kip/in (engineering reference §5 [D]), E = 29,000 ksi.
 * Throws `EngineeringInputError` unless KF, Asc and Lwp are finite and > 0.
 */
export function computeBraceStiffness(options: { stiffnessFactor: number; coreAreaIn2: number; lengthIn: number }): number {
  const kf = requirePositive(options.stiffnessFactor, 'stiffnessFactor', 'KF, the stiffness modification factor (typically 1.2–1.7)')
  const area = requirePositive(options.coreAreaIn2, 'coreAreaIn2', 'the core area in in²')
  const length = requirePositive(options.lengthIn, 'lengthIn', 'the work-point length in inches')
  return (kf * STEEL_MODULUS_KSI * area) / length
}

/**
 * Stiffness modification factor of a brace whose yielding zone is r·Lwp long with area Asc and
 * whose remainder has average area m·Asc: KF = 1 / (r + (1 − r)/m) (series springs, engineering reference §5 [D]).
 * Example: r = 0.6, m = 3 → 1.3636. Throws `EngineeringInputError` unless 0 < r ≤ 1 and m > 0.
 */
export function computeStiffnessFactor(options: { yieldLengthRatio: number; areaRatio: number }): number {
  const r = requireYieldLengthRatio(options.yieldLengthRatio)
  const m = requirePositive(options.areaRatio, 'areaRatio', 'the ratio of the non-yielding area to the core area')
  return 1 / (r + (1 - r) / m)
}

/** Throws `EngineeringInputError` unless 0 < Ly/Lwp ≤ 1. */
export function requireYieldLengthRatio(value: number, field = 'yieldLengthRatio'): number {
  const r = requireFinite(value, field, 'Ly/Lwp, the yielding length over the work-point length (typically 0.5–0.7)')
  if (r <= 0 || r > 1) {
    throw new EngineeringInputError(field, `must be greater than 0 and at most 1 (got ${r}); the core cannot yield over more than Lwp.`)
  }
  return r
}

/** Brace axial deformation at yield Δby = Pysc / K, inches (engineering reference §6.3 [D]). */
export function computeYieldDeformation(yieldStrengthKip: number, stiffnessKipPerIn: number): number {
  return (
    requirePositive(yieldStrengthKip, 'yieldStrengthKip', 'the core yield strength in kips') /
    requirePositive(stiffnessKipPerIn, 'stiffnessKipPerIn', 'the brace stiffness in kip/in')
  )
}

/** Story drift at brace yield ≈ Δby / cos θ, inches (small-displacement statics, engineering reference §6.3 [D]). */
export function computeDriftAtYield(yieldDeformationIn: number, angleDeg: number): number {
  return requirePositive(yieldDeformationIn, 'yieldDeformationIn', 'the brace yield deformation in inches') / Math.cos(degToRad(angleDeg))
}

/**
 * Average core strain at a story drift: (drift · cos θ) / (r · Lwp), dimensionless
 * (brace deformation ≈ drift·cos θ, strain ≈ deformation / Ly; engineering reference §5 [D]).
 * Example: 5.40 in drift (2 × 1.5 % of 15 ft), θ = 26.565°, Lwp = 402.49 in, r = 0.6 → 0.0200.
 */
export function computeCoreStrain(options: { storyDriftIn: number; angleDeg: number; yieldLengthRatio: number; lengthIn: number }): number {
  const drift = requireFinite(options.storyDriftIn, 'storyDriftIn', 'the story drift in inches')
  const r = requireYieldLengthRatio(options.yieldLengthRatio)
  const length = requirePositive(options.lengthIn, 'lengthIn', 'the work-point length in inches')
  return (Math.abs(drift) * Math.cos(degToRad(options.angleDeg))) / (r * length)
}

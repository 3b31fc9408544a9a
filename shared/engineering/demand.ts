import { EngineeringInputError, requireFinite, requirePositive } from './errors'
import { degToRad } from './geometry'

/**
 * Story shear → brace axial force (engineering reference §6.2, statics [D]).
 * Forces in kips, stiffness in kip/in, angles in degrees from the horizontal.
 * Results are magnitudes: half the braces are in tension and half in compression and
 * the signs swap with the load direction, so design uses |P| and a negative shear gives the same answer.
 */

function requireAngle(angleDeg: unknown, field: string): number {
  const value = requireFinite(angleDeg, field, 'the brace angle from the horizontal in degrees')
  if (value <= 0 || value >= 90) {
    throw new EngineeringInputError(
      field,
      `must be strictly between 0° and 90° (got ${value}); a brace at 90° carries no story shear.`,
    )
  }
  return value
}

/**
 * Axial force in each of `braceCount` identical braces sharing a story shear:
 * Pu = |Vu| / (n · cos θ) (engineering reference §6.2 [D], statics).
 * Throws `EngineeringInputError` for non-finite shear, n not a whole number ≥ 1, or θ outside (0°, 90°).
 */
export function computeEqualBraceForce(options: { storyShearKip: number; braceCount: number; angleDeg: number }): number {
  const shearKip = requireFinite(options.storyShearKip, 'storyShearKip', 'the story shear in kips')
  const { braceCount } = options
  if (!Number.isInteger(braceCount) || braceCount < 1) {
    throw new EngineeringInputError('braceCount', `must be a whole number of at least 1 (got ${braceCount}).`)
  }
  const angleDeg = requireAngle(options.angleDeg, 'angleDeg')
  return Math.abs(shearKip) / (braceCount * Math.cos(degToRad(angleDeg)))
}

/** One brace of a story with unequal braces. */
export interface BraceStiffnessInput {
  /** Axial stiffness of the brace, kip/in. */
  stiffnessKipPerIn: number
  /** Brace angle from the horizontal, degrees. */
  angleDeg: number
}

/**
 * Axial forces in unequal braces sharing one story shear, by stiffness compatibility with
 * axially rigid columns: Pi = |Vu| · ki · cos θi / Σj (kj · cos² θj) (engineering reference §6.2 [D]).
 * The horizontal components Pi · cos θi add back to |Vu|.
 * Throws `EngineeringInputError` (field `braces.i.…`) for an empty list, stiffness ≤ 0 or θ outside (0°, 90°).
 */
export function computeStiffnessWeightedForces(storyShearKip: number, braces: readonly BraceStiffnessInput[]): number[] {
  const shearKip = requireFinite(storyShearKip, 'storyShearKip', 'the story shear in kips')
  if (braces.length === 0) throw new EngineeringInputError('braces', 'must list at least one brace.')
  const parts = braces.map((brace, i) => ({
    k: requirePositive(brace.stiffnessKipPerIn, `braces.${i}.stiffnessKipPerIn`, 'the brace axial stiffness in kip/in'),
    cos: Math.cos(degToRad(requireAngle(brace.angleDeg, `braces.${i}.angleDeg`))),
  }))
  const denominator = parts.reduce((sum, { k, cos }) => sum + k * cos * cos, 0)
  return parts.map(({ k, cos }) => (Math.abs(shearKip) * k * cos) / denominator)
}

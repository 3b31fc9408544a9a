import { EngineeringInputError, requirePositive } from './errors'

/**
 * Braced-bay geometry (statics, engineering reference §6.1 [D]).
 *
 * Lengths are inches, angles degrees from the horizontal. θ is measured at the work points:
 * bay width L is column centre to column centre, story height h is floor to floor.
 */

/** Brace configurations Backsight can size. K-bracing is not offered (not permitted in BRBF, AISC 341 F4.4b, from memory). */
export type BraceConfiguration = 'single_diagonal' | 'inverted_v' | 'v' | 'two_story_x'

/** All configurations, for validation and pickers. */
export const BRACE_CONFIGURATIONS = ['single_diagonal', 'inverted_v', 'v', 'two_story_x'] as const satisfies readonly BraceConfiguration[]

/** True when `value` is one of `BRACE_CONFIGURATIONS`. */
export const isBraceConfiguration = (value: unknown): value is BraceConfiguration =>
  typeof value === 'string' && (BRACE_CONFIGURATIONS as readonly string[]).includes(value)

/** Result of `computeBraceGeometry`. */
export interface BraceGeometry {
  /** Horizontal projection of one brace, in: L for a single diagonal, L/2 otherwise. */
  horizontalIn: number
  /** Brace angle from the horizontal, degrees: atan(h / projection). */
  angleDeg: number
  /** Work-point-to-work-point length Lwp = √(projection² + h²), in. */
  lengthIn: number
  /** Braces in one bay at one story: 1 (single diagonal) or 2 (chevron, V, two-story X). */
  bracesPerBay: 1 | 2
}

function requireConfiguration(configuration: unknown, field = 'configuration'): BraceConfiguration {
  if (!isBraceConfiguration(configuration)) {
    throw new EngineeringInputError(
      field,
      `must be one of ${BRACE_CONFIGURATIONS.join(', ')} (got ${JSON.stringify(configuration) ?? String(configuration)}).`,
    )
  }
  return configuration
}

/**
 * Braces in one bay at one story: 1 for `single_diagonal`, 2 for `inverted_v`, `v` and
 * `two_story_x` (engineering reference §6.1 [D]). Throws `EngineeringInputError` for an unknown configuration.
 */
export function bracesPerBay(configuration: BraceConfiguration): 1 | 2 {
  return requireConfiguration(configuration) === 'single_diagonal' ? 1 : 2
}

/**
 * Braces sharing the story shear in one frame line at one story: bracesPerBay × bracedBays.
 * `bracedBays` must be a whole number ≥ 1 (throws `EngineeringInputError` on field `bracedBays`).
 */
export function bracesAtStory(configuration: BraceConfiguration, bracedBays: number): number {
  if (!Number.isInteger(bracedBays) || bracedBays < 1) {
    throw new EngineeringInputError('bracedBays', `must be a whole number of at least 1 (got ${bracedBays}).`)
  }
  return bracesPerBay(configuration) * bracedBays
}

/**
 * Geometry of one brace in one story (engineering reference §6.1, statics [D]):
 * projection = L (single diagonal) or L/2 (inverted-V, V, two-story X); θ = atan(h / projection);
 * Lwp = √(projection² + h²).
 *
 * Throws `EngineeringInputError` when bay width or story height is not a finite number > 0
 * (θ would be 90° or undefined) or the configuration is unknown.
 */
export function computeBraceGeometry(options: {
  configuration: BraceConfiguration
  bayWidthIn: number
  storyHeightIn: number
}): BraceGeometry {
  const configuration = requireConfiguration(options.configuration)
  const bayWidthIn = requirePositive(options.bayWidthIn, 'bayWidthIn', 'the bay width (column to column) in inches')
  const storyHeightIn = requirePositive(options.storyHeightIn, 'storyHeightIn', 'the story height in inches')
  const horizontalIn = configuration === 'single_diagonal' ? bayWidthIn : bayWidthIn / 2
  return {
    horizontalIn,
    angleDeg: (Math.atan2(storyHeightIn, horizontalIn) * 180) / Math.PI,
    lengthIn: Math.hypot(horizontalIn, storyHeightIn),
    bracesPerBay: configuration === 'single_diagonal' ? 1 : 2,
  }
}

/** Degrees → radians. */
export const degToRad = (angleDeg: number): number => (angleDeg * Math.PI) / 180

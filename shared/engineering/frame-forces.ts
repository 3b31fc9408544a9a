import { EngineeringInputError, requirePositive } from './errors'
import { degToRad, type BraceConfiguration } from './geometry'

/**
 * Capacity-design forces that braces at their adjusted strengths put on beams, columns and
 * connections. Forces in kips, angles in degrees from the horizontal.
 *
 * Sources: statics (engineering reference §6.3 [D]); chevron/V beam rules AISC 341 F4.4a and
 * capacity-limited forces F4.3 (from memory); connections 1.1 × adjusted compression, AISC 341-16 F4.6c (from memory).
 */

/** Direction of a beam's unbalanced vertical load: 'up' on the beam above an inverted-V, 'down' on the beam below a V. */
export type UnbalancedDirection = 'up' | 'down'

/** Adjusted strengths and angle of the braces of one story (all braces alike). */
export interface StoryBraceForces {
  /** Adjusted compression strength Cmax, kips. */
  compressionKip: number
  /** Adjusted tension strength Tmax, kips. */
  tensionKip: number
  /** Brace angle from the horizontal, degrees. */
  angleDeg: number
}

/** Multiplier on Cmax for brace connection required strength: 1.1 (AISC 341-16 F4.6c, from memory). */
export const CONNECTION_STRENGTH_FACTOR = 1.1

/**
 * How the braces of a story meet a beam at midspan: an inverted-V (chevron, meeting the beam above)
 * or a V (meeting the beam below); `null` for a single diagonal. In a two-story X, stories pair up
 * from the bottom: the lower story of each pair (index 0, 2, 4, …) is a chevron and the upper (1, 3, 5, …)
 * a V, so both meet the shared beam between them (engineering reference §6.1 [C]).
 */
export function midspanPattern(configuration: BraceConfiguration, storyIndex: number): 'inverted_v' | 'v' | null {
  switch (configuration) {
    case 'single_diagonal':
      return null
    case 'inverted_v':
    case 'v':
      return configuration
    case 'two_story_x':
      return storyIndex % 2 === 0 ? 'inverted_v' : 'v'
    default:
      throw new EngineeringInputError('configuration', `unknown configuration ${JSON.stringify(configuration)}.`)
  }
}

/**
 * Unbalanced vertical load on the beam where the two braces of a chevron or V meet:
 * Pub = (Cmax − Tmax) · sin θ (AISC 341 F4.4a, from memory; statics, engineering reference §6.3 [D]),
 * 'up' on the beam above an inverted-V and 'down' on the beam below a V. For a single diagonal
 * there is no midspan intersection and both are `null`.
 */
export function computeBeamUnbalancedLoad(
  configuration: BraceConfiguration,
  storyIndex: number,
  forces: StoryBraceForces,
): { loadKip: number | null; direction: UnbalancedDirection | null } {
  const pattern = midspanPattern(configuration, storyIndex)
  if (pattern === null) return { loadKip: null, direction: null }
  const loadKip = (forces.compressionKip - forces.tensionKip) * Math.sin(degToRad(forces.angleDeg))
  return { loadKip, direction: pattern === 'inverted_v' ? 'up' : 'down' }
}

/**
 * Horizontal force the braces of one bay deliver to the beam at one level, kips (statics, §6.3 [D]):
 * (Cmax + Tmax) · cos θ where two braces meet at midspan; Cmax · cos θ for a single diagonal
 * (one brace per bay, the compression case governs). How it splits between the beam segments
 * depends on where the collector delivers the load (common practice, no source).
 */
export function computeBeamHorizontalForce(configuration: BraceConfiguration, forces: StoryBraceForces): number {
  const cos = Math.cos(degToRad(forces.angleDeg))
  return configuration === 'single_diagonal'
    ? forces.compressionKip * cos
    : (forces.compressionKip + forces.tensionKip) * cos
}

/** The cases of the beam shared by the two stories of a two-story X. */
export interface SharedBeamCases {
  /** Upward load from the lower-story chevron alone, kips. */
  upwardKip: number
  /** Downward load from the upper-story V alone, kips. */
  downwardKip: number
  /** |up − down| with both stories at their adjusted strengths together, kips. */
  combinedKip: number
  /** Direction of the combined load; `null` when the two cancel exactly. */
  combinedDirection: UnbalancedDirection | null
  /** Largest of the three cases, kips. */
  governingKip: number
}

/**
 * Unbalanced-load cases of the beam shared by a two-story X: the lower-story chevron pushes up,
 * the upper-story V pushes down, each (C − T)·sin θ of its own story. Designers check each on
 * its own and the combined case (common practice, engineering reference §6.3 [C]).
 */
export function computeSharedBeamCases(lower: StoryBraceForces, upper: StoryBraceForces): SharedBeamCases {
  const upwardKip = (lower.compressionKip - lower.tensionKip) * Math.sin(degToRad(lower.angleDeg))
  const downwardKip = (upper.compressionKip - upper.tensionKip) * Math.sin(degToRad(upper.angleDeg))
  const net = upwardKip - downwardKip
  const combinedKip = Math.abs(net)
  return {
    upwardKip,
    downwardKip,
    combinedKip,
    combinedDirection: net > 0 ? 'up' : net < 0 ? 'down' : null,
    governingKip: Math.max(upwardKip, downwardKip, combinedKip),
  }
}

/** Seismic axial force in one column of a braced bay at one story, from the braces above. */
export interface ColumnAxial {
  /** Compression-side column: Σ Cmax · sin θ over this story and all stories above, kips. */
  compressionKip: number
  /** Tension-side column: Σ Tmax · sin θ over this story and all stories above, kips. */
  tensionKip: number
}

/**
 * Capacity-design seismic axial force per column of one braced bay, story by story
 * (stories bottom first; result in the same order). At each story the sum runs over that story
 * and every story above: compression column Σ Cmax·sin θ, tension column Σ Tmax·sin θ, using the
 * adjusted strength of ONE brace per story per column (common practice, follows the AISC 341 F4.3 method, from memory).
 *
 * Assumptions, stated so the engineer can judge them: gravity is excluded (add it); the "need not
 * exceed" limits of F4.3 (foundation uplift, nonlinear analysis) are not applied; adjacent braced
 * bays are taken not to share a column. It is an envelope shortcut, not a free-body of every case:
 * in a chevron or V bay half of the beam's unbalanced load also reaches each column, and stacked
 * single diagonals of one orientation put Cmax·sin θ (not Tmax) into the tension-side column when
 * the load reverses. Check column forces in the analysis model.
 */
export function computeColumnAxialForces(stories: readonly StoryBraceForces[]): ColumnAxial[] {
  const result: ColumnAxial[] = new Array(stories.length)
  let compressionKip = 0
  let tensionKip = 0
  for (let i = stories.length - 1; i >= 0; i--) {
    const story = stories[i]!
    const sin = Math.sin(degToRad(story.angleDeg))
    compressionKip += story.compressionKip * sin
    tensionKip += story.tensionKip * sin
    result[i] = { compressionKip, tensionKip }
  }
  return result
}

/**
 * Required strength of brace connections in tension and compression: 1.1 × Cmax, kips
 * (AISC 341-16 F4.6c, from memory). Throws `EngineeringInputError` unless Cmax is finite and > 0.
 */
export function computeConnectionRequiredStrength(compressionKip: number): number {
  return CONNECTION_STRENGTH_FACTOR * requirePositive(compressionKip, 'compressionKip', 'the adjusted compression strength in kips')
}

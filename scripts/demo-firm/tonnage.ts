import {
  computeBeamHorizontalForce,
  computeBeamUnbalancedLoad,
  computeColumnAxialForces,
  computeConnectionRequiredStrength,
  type StoryBraceForces,
} from '@shared/engineering/frame-forces'
import { computeWeightPerFoot, estimateBraceWeight, DEFAULT_BRACE_TO_CORE_WEIGHT_RATIO } from '@shared/engineering/weight'
import { ftToIn } from '@shared/units/length'
import type { LineDesign } from './frames'

/**
 * Steel take-off estimate of one braced frame line from its brace cores and capacity-design forces
 * (engine `frame-forces`): braces, braced-frame beams, braced-frame columns and connections, in lb.
 * Member sizing here is a DEMO ESTIMATE (common practice, no source), only meant to move with the
 * adjusted brace strengths the way a real take-off does:
 * - braces: ratio × 490·Asc·Lwp/1728 (engine `estimateBraceWeight`); preliminary ratio
 *   `DEFAULT_BRACE_TO_CORE_WEIGHT_RATIO` (2.5), final ratio the supplier's own;
 * - columns: 2 per braced bay, area = (Σ Cmax·sin θ above + factored gravity) / 33.75 ksi
 *   (φ·Fcr ≈ 0.9 × 0.75 × 50 ksi), at least 10 in²;
 * - beams: one per bay per floor, the heavier of a gravity section and Z = Mu/(0.9·50) with
 *   Mu = Pub·L/4 from the unbalanced load, mapped to weight by w ≈ 1.2·Z^0.8 lb/ft (a rough fit to
 *   W-shapes), plus half the brace horizontal force over 0.9·50 ksi as axial area;
 * - connections: two gussets per brace of 60 lb + 0.3 lb per kip of 1.1·Cmax (AISC 341-16 F4.6c, from
 *   memory), plus a 7 % misc allowance on beams and columns (5–10 %, engineering reference §8 [C]).
 */

export interface FrameSteelLb {
  braces: number
  beams: number
  columns: number
  connections: number
}

/** Per story of a line: core area, adjusted strengths and angle (from the sd or the governing snapshot). */
export interface StoryState {
  coreAreaIn2: number
  forces: StoryBraceForces
}

/** Factored gravity on a braced-frame column per floor, ksf (1.2·90 psf + 0.5·50 psf; demo value, no source). */
const GRAVITY_KSF = 0.133
/** Tributary depth perpendicular to the frame, ft (demo value). */
const TRIBUTARY_DEPTH_FT = 15

export function frameSteel(line: LineDesign, stories: readonly StoryState[], braceWeightRatio = DEFAULT_BRACE_TO_CORE_WEIGHT_RATIO, gravityBeamLbPerFt = 35): FrameSteelLb {
  const cfg = line.configuration
  const columnsAxial = computeColumnAxialForces(stories.map((s) => s.forces))
  const n = line.levels.length
  let braces = 0
  let columns = 0
  let beams = 0
  let gussets = 0
  const unbalanced = stories.map((s, i) => computeBeamUnbalancedLoad(cfg, i, s.forces).loadKip ?? 0)
  for (let i = 0; i < n; i++) {
    const level = line.levels[i]!
    const s = stories[i]!
    braces += level.braceCount * estimateBraceWeight(s.coreAreaIn2, ftToIn(level.lwpFt), { ratio: braceWeightRatio, sampleCount: 1 }).weightLb
    gussets += level.braceCount * 2 * (60 + 0.3 * computeConnectionRequiredStrength(s.forces.compressionKip))
    const gravityKip = GRAVITY_KSF * line.bayWidthFt * TRIBUTARY_DEPTH_FT * (n - i)
    const columnAreaIn2 = Math.max(10, (columnsAxial[i]!.compressionKip + gravityKip) / 33.75)
    columns += 2 * line.bays * computeWeightPerFoot(columnAreaIn2) * level.storyHeightFt
    // Beam at the top of story i: loaded by an inverted-V of story i and a V of story i+1.
    const pattern = (j: number) => (j < n ? (cfg === 'two_story_x' ? (j % 2 === 0 ? 'inverted_v' : 'v') : cfg) : null)
    const pub = Math.max(pattern(i) === 'inverted_v' ? unbalanced[i]! : 0, pattern(i + 1) === 'v' ? unbalanced[i + 1]! : 0)
    const zIn3 = (pub * line.bayWidthFt * 12) / 4 / (0.9 * 50)
    const flexureLbPerFt = Math.max(gravityBeamLbPerFt, zIn3 > 0 ? 1.2 * zIn3 ** 0.8 : 0)
    const axialIn2 = (0.5 * computeBeamHorizontalForce(cfg, s.forces)) / (0.9 * 50)
    beams += line.bays * (flexureLbPerFt + computeWeightPerFoot(Math.max(axialIn2, 1e-6))) * line.bayWidthFt
  }
  return { braces, beams, columns, connections: gussets + 0.07 * (beams + columns) }
}

/** Sum of several take-offs. */
export function addSteel(a: FrameSteelLb, b: FrameSteelLb): FrameSteelLb {
  return { braces: a.braces + b.braces, beams: a.beams + b.beams, columns: a.columns + b.columns, connections: a.connections + b.connections }
}

export const NO_STEEL: FrameSteelLb = { braces: 0, beams: 0, columns: 0, connections: 0 }

import { fromDisplay, toDisplay, unitOf, type QuantityKind } from '../units/systems'
import { computeAdjustedStrength, checkFactorRanges } from './adjusted-strength'
import { type CapacityBasis } from './capacity-basis'
import {
  CORE_RESISTANCE_FACTOR,
  CORE_SAFETY_FACTOR,
  DEFAULT_CORE_STEPS,
  computeDemandCapacityRatio,
  computeRequiredCoreArea,
  roundUpCoreArea,
  type CoreStepBand,
} from './core-size'
import { computeEqualBraceForce } from './demand'
import { EngineeringInputError, type EngineeringWarning } from './errors'
import {
  computeBeamHorizontalForce,
  computeBeamUnbalancedLoad,
  computeColumnAxialForces,
  computeConnectionRequiredStrength,
  computeSharedBeamCases,
} from './frame-forces'
import { bracesAtStory, computeBraceGeometry } from './geometry'
import { SIZE_FRAME_DEFAULTS, findSizeFrameIssues, type SizeFrameRequest } from './size-frame-input'
import {
  SIZE_FRAME_CAUTIONS,
  SIZE_FRAME_FIELD_KINDS,
  type SharedBeamResult,
  type SizeFrameLevelResult,
  type SizeFrameResult,
} from './size-frame-result'
import { STEEL_MODULUS_KSI, computeBraceStiffness, computeDriftAtYield, computeYieldDeformation } from './stiffness'
import { STEEL_DENSITY_LB_PER_FT3, computeCoreWeight, estimateBraceWeight } from './weight'

/**
 * Whole-frame preliminary BRB sizing: `sizeFrame(request)`. Converts the request to the canonical
 * units (kip, in, ksi, in²), runs the one-topic functions of `shared/engineering`, and answers in the
 * request's unit system with a `units` map naming the unit of every quantity field.
 */

const FYSC_USUAL_RANGE = 'usual 30–60 ksi (207–414 MPa) range of BRB core plate (common practice, no source)'

/**
 * Size the BRB cores of one braced frame line and derive the capacity-design forces.
 * See `SizeFrameRequest` for the input and `SizeFrameResult` for the output; everything is in the
 * request's unit system. Formula sources are named on each function used (AISC 341 F4, statics).
 * Throws `EngineeringInputError` naming the field (e.g. `levels.2.storyHeight`) for invalid input;
 * unusual but valid values come back as `warnings`.
 */
export function sizeFrame(request: SizeFrameRequest): SizeFrameResult {
  const issues = findSizeFrameIssues(request)
  if (issues.length > 0) throw EngineeringInputError.fromIssues(issues)

  const sys = request.units
  const inCanon = (kind: QuantityKind, v: number) => fromDisplay(kind, v, sys)
  const out = (kind: QuantityKind, v: number) => toDisplay(kind, v, sys)
  const { method, configuration, beta, omega } = request
  const bracedBays = request.bracedBays ?? SIZE_FRAME_DEFAULTS.bracedBays
  const stiffnessFactor = request.stiffnessFactor ?? SIZE_FRAME_DEFAULTS.stiffnessFactor
  const yieldLengthRatio = request.yieldLengthRatio ?? SIZE_FRAME_DEFAULTS.yieldLengthRatio
  const bayWidthIn = inCanon('dimension', request.bayWidth)
  const fyscMinKsi = inCanon('stress', request.fyscMin)
  const basis = toCanonicalBasis(request.capacityBasis, (v) => inCanon('stress', v))
  const steps: readonly CoreStepBand[] = request.coreSteps
    ? request.coreSteps.map(({ upTo, step }) => ({ upToIn2: upTo === null ? null : inCanon('area', upTo), stepIn2: inCanon('area', step) }))
    : DEFAULT_CORE_STEPS
  const angleWarnings: EngineeringWarning[] = []

  const stories = request.levels.map((level, index) => {
    const storyHeightIn = inCanon('dimension', level.storyHeight)
    const geometry = computeBraceGeometry({ configuration, bayWidthIn, storyHeightIn })
    const braceCount = bracesAtStory(configuration, bracedBays)
    const demandKip = computeEqualBraceForce({ storyShearKip: inCanon('force', level.storyShear), braceCount, angleDeg: geometry.angleDeg })
    const requiredIn2 = computeRequiredCoreArea({ demandKip, fyscKsi: fyscMinKsi, method })
    const coreAreaIn2 = roundUpCoreArea(requiredIn2, { steps })
    const strength = computeAdjustedStrength({ coreAreaIn2, fyscMinKsi, basis, beta, omega })
    const forces = { compressionKip: strength.compressionKip, tensionKip: strength.tensionKip, angleDeg: geometry.angleDeg }
    const stiffnessKipPerIn = computeBraceStiffness({ stiffnessFactor, coreAreaIn2, lengthIn: geometry.lengthIn })
    const yieldDeformationIn = computeYieldDeformation(strength.yieldStrengthKip, stiffnessKipPerIn)
    const driftAtYieldIn = computeDriftAtYield(yieldDeformationIn, geometry.angleDeg)
    if (geometry.angleDeg < 30 || geometry.angleDeg > 60) {
      angleWarnings.push({
        field: `levels.${index}.storyHeight`,
        message: `brace angle ${geometry.angleDeg.toFixed(1)}° is outside the usual 30°–60° (common practice, no source); check the bay width and configuration.`,
      })
    }
    return { level, index, geometry, braceCount, demandKip, requiredIn2, coreAreaIn2, strength, forces, stiffnessKipPerIn, yieldDeformationIn, driftAtYieldIn, storyHeightIn }
  })
  const warnings: EngineeringWarning[] = [
    ...stories[0]!.strength.warnings, // β, ω and Ry are the same at every story
    ...checkFactorRanges({ stiffnessFactor, yieldLengthRatio }),
    ...materialWarnings(request, fyscMinKsi),
    ...angleWarnings,
  ]
  if (configuration === 'two_story_x' && stories.length % 2 === 1) {
    warnings.push({ field: 'levels', message: 'a two-story X needs an even number of stories; the top story is treated as an inverted-V under the roof beam.' })
  }

  const columns = computeColumnAxialForces(stories.map((s) => s.forces))
  const levels: SizeFrameLevelResult[] = stories.map((s) => {
    const unbalanced = computeBeamUnbalancedLoad(configuration, s.index, s.forces)
    const column = columns[s.index]!
    return {
      name: s.level.name,
      storyHeight: s.level.storyHeight,
      storyShear: s.level.storyShear,
      angleDeg: s.geometry.angleDeg,
      bracesAtLevel: s.braceCount,
      braceLength: out('dimension', s.geometry.lengthIn),
      braceAxialDemand: out('force', s.demandKip),
      requiredCoreArea: out('area', s.requiredIn2),
      coreArea: out('area', s.coreAreaIn2),
      demandCapacityRatio: computeDemandCapacityRatio({ demandKip: s.demandKip, coreAreaIn2: s.coreAreaIn2, fyscKsi: fyscMinKsi, method }),
      yieldStrength: out('force', s.strength.yieldStrengthKip),
      expectedYieldStrength: out('force', s.strength.expectedYieldStrengthKip),
      adjustedTension: out('force', s.strength.tensionKip),
      adjustedCompression: out('force', s.strength.compressionKip),
      beamUnbalancedLoad: unbalanced.loadKip === null ? null : out('force', unbalanced.loadKip),
      beamUnbalancedDirection: unbalanced.direction,
      beamHorizontalForce: out('force', computeBeamHorizontalForce(configuration, s.forces)),
      columnAxial: out('force', column.compressionKip),
      columnAxialTension: out('force', column.tensionKip),
      connectionRequiredStrength: out('force', computeConnectionRequiredStrength(s.strength.compressionKip)),
      stiffness: out('stiffness', s.stiffnessKipPerIn),
      yieldDeformation: out('length', s.yieldDeformationIn),
      driftAtYield: out('length', s.driftAtYieldIn),
      driftRatioAtYield: s.driftAtYieldIn / s.storyHeightIn,
      coreWeight: out('weight', s.braceCount * computeCoreWeight({ coreAreaIn2: s.coreAreaIn2, yieldLengthIn: yieldLengthRatio * s.geometry.lengthIn })),
    }
  })

  const sharedBeams: SharedBeamResult[] = []
  if (configuration === 'two_story_x') {
    for (let i = 0; i + 1 < stories.length; i += 2) {
      const cases = computeSharedBeamCases(stories[i]!.forces, stories[i + 1]!.forces)
      sharedBeams.push({
        lowerLevel: stories[i]!.level.name,
        upperLevel: stories[i + 1]!.level.name,
        upwardLoad: out('force', cases.upwardKip),
        downwardLoad: out('force', cases.downwardKip),
        combinedLoad: out('force', cases.combinedKip),
        combinedDirection: cases.combinedDirection,
        governingLoad: out('force', cases.governingKip),
      })
    }
  }

  const braceWeightLb = stories.reduce((sum, s) => sum + s.braceCount * estimateBraceWeight(s.coreAreaIn2, s.geometry.lengthIn).weightLb, 0)
  const strength0 = stories[0]!.strength
  return {
    unitSystem: sys,
    method,
    configuration,
    units: Object.fromEntries(Object.entries(SIZE_FRAME_FIELD_KINDS).map(([field, kind]) => [field, unitOf(kind, sys)])),
    assumptions: {
      bayWidth: request.bayWidth,
      bracedBays,
      fyscMin: request.fyscMin,
      expectedYieldStress: out('stress', strength0.expectedYieldKsi),
      ryApplied: strength0.ryApplied,
      beta,
      omega,
      stiffnessFactor,
      yieldLengthRatio,
      resistanceFactor: method === 'lrfd' ? CORE_RESISTANCE_FACTOR : null,
      safetyFactor: method === 'asd' ? CORE_SAFETY_FACTOR : null,
      steelModulus: out('stress', STEEL_MODULUS_KSI),
      steelDensity: out('density', STEEL_DENSITY_LB_PER_FT3),
      braceToCoreWeightRatio: estimateBraceWeight(1, 1).ratio,
      coreSteps: steps.map(({ upToIn2, stepIn2 }) => ({ upTo: upToIn2 === null ? null : out('area', upToIn2), step: out('area', stepIn2) })),
    },
    levels,
    sharedBeams,
    totals: {
      braceCount: stories.reduce((sum, s) => sum + s.braceCount, 0),
      coreWeight: levels.reduce((sum, l) => sum + l.coreWeight, 0),
      estimatedBraceWeight: out('weight', braceWeightLb),
      braceWeightBasis: 'default',
      maxDemandCapacityRatio: Math.max(...levels.map((l) => l.demandCapacityRatio)),
    },
    warnings,
    cautions: [...SIZE_FRAME_CAUTIONS],
  }
}

function toCanonicalBasis(basis: SizeFrameRequest['capacityBasis'], stress: (v: number) => number): CapacityBasis {
  switch (basis.kind) {
    case 'ry':
      return { kind: 'ry', ry: basis.ry }
    case 'yieldRange':
      return { kind: 'yieldRange', fyscMaxKsi: stress(basis.fyscMax) }
    case 'coupon':
      return { kind: 'coupon', fyscKsi: stress(basis.fysc) }
  }
}

function materialWarnings(request: SizeFrameRequest, fyscMinKsi: number): EngineeringWarning[] {
  const warnings: EngineeringWarning[] = []
  if (fyscMinKsi < 30 || fyscMinKsi > 60) {
    warnings.push({ field: 'fyscMin', message: `${request.fyscMin} ${unitOf('stress', request.units)} is outside the ${FYSC_USUAL_RANGE}; check the value and the unit system.` })
  }
  const basis = request.capacityBasis
  if (basis.kind === 'coupon' && basis.fysc < request.fyscMin) {
    warnings.push({ field: 'capacityBasis.fysc', message: `the coupon yield ${basis.fysc} is below the specified minimum ${request.fyscMin}; the core material does not meet its specification.` })
  }
  return warnings
}

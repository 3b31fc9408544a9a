import type { QuantityKind, UnitSystem } from '../units/systems'
import type { DesignMethod } from './core-size'
import type { EngineeringWarning } from './errors'
import type { UnbalancedDirection } from './frame-forces'
import type { BraceConfiguration } from './geometry'
import type { CoreStepInput } from './size-frame-input'

/**
 * The result of `sizeFrame` (the `POST /api/sizing/frame` response body), the unit kind of each
 * of its fields, and the cautions it always carries. Values are in the request's unit system.
 */

/** Result for one story (in the request's unit system; see `SizeFrameResult.units`). */
export interface SizeFrameLevelResult {
  name: string
  storyHeight: number
  storyShear: number
  /** Brace angle from the horizontal, degrees. */
  angleDeg: number
  /** Braces at this story in the frame line (braces per bay × braced bays). */
  bracesAtLevel: number
  /** Work-point length Lwp of one brace. */
  braceLength: number
  /** Axial demand per brace, Vu/(n·cos θ): factored (LRFD) or service (ASD). */
  braceAxialDemand: number
  requiredCoreArea: number
  /** Provided core area, rounded up on the increment table. */
  coreArea: number
  demandCapacityRatio: number
  /** Pysc = Fysc,min · Asc (provided). */
  yieldStrength: number
  /** Expected yield stress (Ry·Fysc,min, Fysc,max or coupon Fysc) × Asc. */
  expectedYieldStrength: number
  /** Tmax = ω·Ry·Pysc. */
  adjustedTension: number
  /** Cmax = β·ω·Ry·Pysc. */
  adjustedCompression: number
  /** (Cmax − Tmax)·sin θ per bay on the midspan beam; null for a single diagonal. */
  beamUnbalancedLoad: number | null
  beamUnbalancedDirection: UnbalancedDirection | null
  /** Brace horizontal force into the beam per bay. */
  beamHorizontalForce: number
  /** Compression-side column seismic axial per column, Σ Cmax·sin θ from this story up. */
  columnAxial: number
  /** Tension-side column seismic axial per column, Σ Tmax·sin θ from this story up. */
  columnAxialTension: number
  /** 1.1 · Cmax. */
  connectionRequiredStrength: number
  /** KF·E·Asc/Lwp of one brace. */
  stiffness: number
  /** Δby = Pysc / K. */
  yieldDeformation: number
  /** Story drift at brace yield ≈ Δby / cos θ. */
  driftAtYield: number
  /** driftAtYield / storyHeight. */
  driftRatioAtYield: number
  /** Weight of the yielding cores of all braces at this story, 490·Asc·Ly/1728 each. */
  coreWeight: number
}

/** Unbalanced-load cases of the beam shared by one pair of stories of a two-story X (per bay). */
export interface SharedBeamResult {
  lowerLevel: string
  upperLevel: string
  upwardLoad: number
  downwardLoad: number
  combinedLoad: number
  combinedDirection: UnbalancedDirection | null
  governingLoad: number
}

/** Output of `sizeFrame`. */
export interface SizeFrameResult {
  unitSystem: UnitSystem
  method: DesignMethod
  configuration: BraceConfiguration
  /** Unit string of every quantity field of the result, e.g. `{ coreArea: 'in²', … }`. */
  units: Record<string, string>
  /** The values actually used, defaults included. */
  assumptions: {
    bayWidth: number
    bracedBays: number
    fyscMin: number
    expectedYieldStress: number
    ryApplied: number
    beta: number
    omega: number
    stiffnessFactor: number
    yieldLengthRatio: number
    resistanceFactor: number | null
    safetyFactor: number | null
    steelModulus: number
    steelDensity: number
    braceToCoreWeightRatio: number
    coreSteps: CoreStepInput[]
  }
  levels: SizeFrameLevelResult[]
  /** Two-story X only: one entry per pair of stories sharing a beam; [] otherwise. */
  sharedBeams: SharedBeamResult[]
  totals: {
    braceCount: number
    coreWeight: number
    /** Estimated steel weight of all braces, default brace-to-core ratio (placeholder, no source). */
    estimatedBraceWeight: number
    braceWeightBasis: 'default'
    maxDemandCapacityRatio: number
  }
  warnings: EngineeringWarning[]
  cautions: string[]
}

/** Quantity kind of every unit-carrying field of the result; the `units` map is built from this. */
export const SIZE_FRAME_FIELD_KINDS = Object.freeze({
  bayWidth: 'dimension', storyHeight: 'dimension', braceLength: 'dimension',
  storyShear: 'force', braceAxialDemand: 'force', yieldStrength: 'force', expectedYieldStrength: 'force',
  adjustedTension: 'force', adjustedCompression: 'force', beamUnbalancedLoad: 'force', beamHorizontalForce: 'force',
  columnAxial: 'force', columnAxialTension: 'force', connectionRequiredStrength: 'force',
  upwardLoad: 'force', downwardLoad: 'force', combinedLoad: 'force', governingLoad: 'force',
  fyscMin: 'stress', expectedYieldStress: 'stress', steelModulus: 'stress',
  requiredCoreArea: 'area', coreArea: 'area', coreSteps: 'area',
  stiffness: 'stiffness', yieldDeformation: 'length', driftAtYield: 'length',
  coreWeight: 'weight', estimatedBraceWeight: 'weight', steelDensity: 'density',
  angleDeg: 'angle', demandCapacityRatio: 'ratio', driftRatioAtYield: 'ratio', maxDemandCapacityRatio: 'ratio',
} satisfies Record<string, QuantityKind>)

/** Cautions returned with every result (customary in the trade; engineering practice reference §e). */
export const SIZE_FRAME_CAUTIONS: readonly string[] = Object.freeze([
  'This is a preliminary design aid, not for construction.',
  'Verify core areas, stiffness, β, ω, yield length and weights with the selected brace supplier’s qualified values, and check every result against the governing code and edition (with local amendments) before relying on it.',
  'The engineer of record decides: these numbers do not replace the engineer’s own independent check and judgement.',
  'Code factors used here (φ = 0.90, Ω = 1.67, connection factor 1.1, E = 29,000 ksi, Ry table values) await sign-off against the standard text; confirm them for the edition you use.',
  'Column axial forces are Σ Cmax·sin θ (compression column) and Σ Tmax·sin θ (tension column) of one brace per story from the stories above, per column of one bay, gravity excluded. They leave out the share of a chevron or V beam’s unbalanced load and the load reversal of stacked single diagonals; check columns in the analysis model.',
  'Adjusted strengths, beam, column and connection forces are capacity-limited (expected-strength) forces in both LRFD and ASD; apply the load-combination factors of the governing code to them.',
  'Estimated brace weight uses a placeholder brace-to-core weight ratio; replace it with the firm’s own history.',
])

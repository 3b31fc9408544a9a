import { computeAdjustedStrength } from '@shared/engineering/adjusted-strength'
import type { CapacityBasis } from '@shared/engineering/capacity-basis'
import { computeRequiredCoreArea, roundUpCoreArea } from '@shared/engineering/core-size'
import type { BraceConfiguration } from '@shared/engineering/geometry'
import { sizeFrame } from '@shared/engineering/size-frame'
import type { SizeFrameRequest } from '@shared/engineering/size-frame-input'
import { computeCoreStrain } from '@shared/engineering/stiffness'
import { ftToIn } from '@shared/units/length'
import { FIRM_CORE_STEPS, type FirmAssumption, type SupplierProfile } from './catalog'
import { roundTo, type Random } from './random'

/**
 * One frame line of a demo project: sized with the engine's `sizeFrame` from the firm's assumed
 * factors, then given the supplier's final snapshots (submittal, approved, coupon).
 * Units: ft (geometry), in (drift), kip, ksi, in².
 */

/** Column-flexibility allowance on the brace-only elastic drift (common practice, no source). */
export const DRIFT_FLEXIBILITY_ALLOWANCE = 1.35

/** One story of a sized frame line. */
export interface LevelDesign {
  name: string
  index: number
  storyHeightFt: number
  storyShearKip: number
  /** Design story drift Δ = Cd·δxe/Ie (ASCE 7-16 Eq. 12.8-15), in. */
  driftIn: number
  braceCount: number
  angleDeg: number
  lwpFt: number
  requiredStrengthKip: number
  sd: Snapshot
  sdStrength: Strength
  finals: Snapshot[]
  finalStrengths: Strength[]
}

/** One brace_values snapshot, in file units. */
export interface Snapshot {
  phase: 'sd' | 'submittal' | 'approved' | 'coupon'
  revision: number | null
  date: string
  source: string
  requiredCoreArea: number
  coreArea: number
  fysc: number
  fyscBasis: 'specified_min' | 'yield_range' | 'coupon'
  fyscMax: number | null
  ry: number | null
  beta: number
  omega: number
  factorDriftMultiple: number
  stiffnessFactor: number
  yieldLengthRatio: number
  governing: boolean
}

/** Adjusted strengths of a snapshot from the engine, kip / ksi. */
export interface Strength {
  expectedYieldKsi: number
  ryApplied: number
  tensionKip: number
  compressionKip: number
}

/** A sized frame line. */
export interface LineDesign {
  frameLine: string
  configuration: BraceConfiguration
  bays: number
  bayWidthFt: number
  levels: LevelDesign[]
}

/** Project-level plan of the supplier's final values (same test set and dates for every line). */
export interface FinalPlan {
  supplier: SupplierProfile
  rev0Date: string | null
  rev1Date: string | null
  approvedDate: string | null
  couponDate: string | null
  betaOffset: number
  omegaOffset: number
  rev1Beta: number
  rev1Omega: number
  heats: number[]
  stiffnessFactor: number
  yieldLengthRatio: number
}

const capacityBasisOf = (a: FirmAssumption): SizeFrameRequest['capacityBasis'] =>
  a.basis === 'specified_min' ? { kind: 'ry', ry: a.ry ?? 1 } : { kind: 'yieldRange', fyscMax: a.fyscMax ?? a.fyscMin }

/** Engine adjusted strengths of a snapshot (AISC 341-16 F4.2a via `computeAdjustedStrength`). */
export function strengthOf(s: Snapshot, fyscMinKsi: number): Strength {
  const basis: CapacityBasis =
    s.fyscBasis === 'coupon' ? { kind: 'coupon', fyscKsi: s.fysc }
      : s.fyscBasis === 'yield_range' ? { kind: 'yieldRange', fyscMaxKsi: s.fyscMax ?? s.fysc }
        : { kind: 'ry', ry: s.ry ?? 1 }
  const r = computeAdjustedStrength({ coreAreaIn2: s.coreArea, fyscMinKsi: s.fyscBasis === 'coupon' ? fyscMinKsi : s.fysc, basis, beta: s.beta, omega: s.omega })
  return { expectedYieldKsi: r.expectedYieldKsi, ryApplied: r.ryApplied, tensionKip: r.tensionKip, compressionKip: r.compressionKip }
}

/** Size one frame line with `sizeFrame` from the firm's assumption; story shears already rounded to 0.1 kip. */
export function designLine(input: {
  frameLine: string
  configuration: BraceConfiguration
  bays: number
  bayWidthFt: number
  storyHeightsFt: readonly number[]
  storyShearsKip: readonly number[]
  cd: number
  ie: number
  assumption: FirmAssumption
  sdDate: string
}): LineDesign {
  const a = input.assumption
  const names = input.storyHeightsFt.map((_, i) => `L${i + 2}`)
  const result = sizeFrame({
    units: 'us',
    method: 'lrfd',
    configuration: input.configuration,
    bayWidth: input.bayWidthFt,
    bracedBays: input.bays,
    levels: input.storyHeightsFt.map((h, i) => ({ name: names[i]!, storyHeight: h, storyShear: input.storyShearsKip[i]! })),
    fyscMin: a.fyscMin,
    capacityBasis: capacityBasisOf(a),
    beta: a.beta,
    omega: a.omega,
    stiffnessFactor: a.stiffnessFactor,
    yieldLengthRatio: a.yieldLengthRatio,
    coreSteps: FIRM_CORE_STEPS.map(({ upToIn2, stepIn2 }) => ({ upTo: upToIn2, step: stepIn2 })),
  })
  const levels = result.levels.map((l, i): LevelDesign => {
    // Elastic drift at the design force: drift at brace yield × Pu/Pysc; Δ = Cd·δxe/Ie (ASCE 7-16 Eq. 12.8-15),
    // with a column-flexibility allowance (common practice, no source).
    const deltaXe = (l.driftAtYield * l.braceAxialDemand) / l.yieldStrength
    const sd: Snapshot = {
      phase: 'sd', revision: null, date: input.sdDate, source: 'SD basis of design',
      requiredCoreArea: roundTo(l.requiredCoreArea, 3), coreArea: l.coreArea,
      fysc: a.fyscMin, fyscBasis: a.basis, fyscMax: a.fyscMax, ry: a.ry,
      beta: a.beta, omega: a.omega, factorDriftMultiple: 2, stiffnessFactor: a.stiffnessFactor, yieldLengthRatio: a.yieldLengthRatio,
      governing: false,
    }
    return {
      name: l.name,
      index: i + 1,
      storyHeightFt: l.storyHeight,
      storyShearKip: l.storyShear,
      driftIn: roundTo((input.cd * deltaXe * DRIFT_FLEXIBILITY_ALLOWANCE) / input.ie, 2),
      braceCount: l.bracesAtLevel,
      angleDeg: l.angleDeg,
      lwpFt: l.braceLength,
      requiredStrengthKip: roundTo(l.braceAxialDemand, 1),
      sd,
      sdStrength: { expectedYieldKsi: result.assumptions.expectedYieldStress, ryApplied: result.assumptions.ryApplied, tensionKip: l.adjustedTension, compressionKip: l.adjustedCompression },
      finals: [],
      finalStrengths: [],
    }
  })
  return { frameLine: input.frameLine, configuration: input.configuration, bays: input.bays, bayWidthFt: input.bayWidthFt, levels }
}

const clamp = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v))

/**
 * The supplier's final snapshots for every story of a line: β and ω read off the supplier's test
 * curve at the core strain of 2.0 × the design story drift (AISC 341-16 F4.2b basis, from memory;
 * ranges engineering reference §5), the core re-sized by the supplier from the required strength
 * with its own plate yield and increments (AISC 341 F4.5b via the engine), and the coupon yield
 * from the project's heats. Exactly one snapshot is governing: coupon, else approved, else the
 * latest submittal; none when nothing was submitted yet.
 */
export function addFinals(line: LineDesign, plan: FinalPlan, rng: Random): void {
  const s = plan.supplier
  const heatOf = (i: number) => plan.heats[Math.min(plan.heats.length - 1, Math.floor(((i - 1) / line.levels.length) * plan.heats.length))]!
  for (const level of line.levels) {
    const stiffnessFactor = roundTo(plan.stiffnessFactor + rng.normal(0, 0.02), 2)
    const yieldLengthRatio = roundTo(plan.yieldLengthRatio + rng.normal(0, 0.01), 2)
    const strain = computeCoreStrain({ storyDriftIn: 2 * level.driftIn, angleDeg: level.angleDeg, yieldLengthRatio, lengthIn: ftToIn(level.lwpFt) })
    const over = strain * 100 - 2
    const beta = roundTo(clamp(s.beta2 + s.betaSlope * over + plan.betaOffset + rng.normal(0, s.betaSd / 3), 1, 1.3), 2)
    const omega = roundTo(clamp(s.omega2 + s.omegaSlope * over + plan.omegaOffset + rng.normal(0, s.omegaSd / 3), 1.15, 1.75), 2)
    if (plan.rev0Date === null) continue
    const required = computeRequiredCoreArea({ demandKip: level.requiredStrengthKip, fyscKsi: s.fyscMin, method: 'lrfd' })
    const base: Snapshot = {
      phase: 'submittal', revision: 0, date: plan.rev0Date, source: 'BRB delegated-design submittal rev 0',
      requiredCoreArea: roundTo(required, 3), coreArea: roundUpCoreArea(required, { steps: s.steps }),
      fysc: s.fyscMin, fyscBasis: 'yield_range', fyscMax: s.fyscMax, ry: 1,
      beta, omega, factorDriftMultiple: 2, stiffnessFactor, yieldLengthRatio, governing: false,
    }
    const finals: Snapshot[] = [base]
    let latest = base
    if (plan.rev1Date !== null) {
      latest = {
        ...base, revision: 1, date: plan.rev1Date, source: 'BRB delegated-design submittal rev 1',
        beta: roundTo(clamp(beta + plan.rev1Beta, 1, 1.3), 2), omega: roundTo(clamp(omega + plan.rev1Omega, 1.15, 1.75), 2),
      }
      finals.push(latest)
    }
    if (plan.approvedDate !== null) {
      latest = { ...latest, phase: 'approved', date: plan.approvedDate, source: `Reviewed submittal rev ${latest.revision}, no exceptions taken` }
      finals.push(latest)
      if (plan.couponDate !== null) {
        const k = heatOf(level.index)
        latest = {
          ...latest, phase: 'coupon', revision: null, date: plan.couponDate, source: `Core coupon test report, heat ${plan.heats.indexOf(k) + 1}`,
          fysc: k, fyscBasis: 'coupon', fyscMax: null, ry: null,
        }
        finals.push(latest)
      }
    }
    latest.governing = true
    level.finals = finals
    level.finalStrengths = finals.map((f) => strengthOf(f, s.fyscMin))
  }
}

import { computeExpectedYield, type CapacityBasis } from './capacity-basis'
import { requirePositive, type EngineeringWarning } from './errors'

/**
 * Yield and adjusted (capacity-design) strengths of a BRB core, and plausibility checks
 * of the adjustment factors. Forces in kips, stresses in ksi, areas in in².
 *
 * Sources: Pysc = Fysc·Asc; Tmax = ω·Ry·Pysc; Cmax = β·ω·Ry·Pysc (AISC 341 F4.2a, from memory;
 * form partly verified, engineering reference §1.2). For a `yieldRange` or `coupon` basis the
 * expected stress replaces Ry·Fysc (§1.2 Ry exception and §1.6, common practice).
 */

/** A plausibility band for a factor, with where it comes from. */
export interface FactorRange {
  min: number
  max: number
  source: string
}

/**
 * Bands outside which a factor draws a returned warning (never an error):
 * β 1.0–1.3 (β ≥ 1.0 by definition and the 1.3 qualification limit, AISC 341 F4.2b / K3.8, from memory);
 * ω 1.0–1.6 and KF 1.0–2.0 (published BRB test ranges, engineering reference §5, from memory, widened);
 * Ly/Lwp 0.4–0.8 (§5, from memory); Ry 1.0–1.6 (span of Table A3.1, from memory).
 */
export const FACTOR_RANGES = {
  beta: { min: 1.0, max: 1.3, source: 'AISC 341 F4.2b and K3.8 (from memory)' },
  omega: { min: 1.0, max: 1.6, source: 'BRB test literature ranges, engineering reference §5 (from memory)' },
  stiffnessFactor: { min: 1.0, max: 2.0, source: 'BRB test literature ranges, engineering reference §5 (from memory)' },
  yieldLengthRatio: { min: 0.4, max: 0.8, source: 'BRB test literature ranges, engineering reference §5 (from memory)' },
  ry: { min: 1.0, max: 1.6, source: 'AISC 341 Table A3.1 span of values (from memory)' },
} as const satisfies Record<string, FactorRange>

/**
 * Warnings for factors outside `FACTOR_RANGES`. Pass only the factors you have; each warning's
 * `field` is the request field name (`beta`, `omega`, `stiffnessFactor`, `yieldLengthRatio`, `capacityBasis.ry`).
 * Returns [] when all are inside their bands. Does not validate (see `computeAdjustedStrength`).
 */
export function checkFactorRanges(factors: {
  beta?: number
  omega?: number
  stiffnessFactor?: number
  yieldLengthRatio?: number
  ry?: number
}): EngineeringWarning[] {
  const labels = {
    beta: ['beta', 'β (compression adjustment)'],
    omega: ['omega', 'ω (strain-hardening adjustment)'],
    stiffnessFactor: ['stiffnessFactor', 'KF (stiffness modification)'],
    yieldLengthRatio: ['yieldLengthRatio', 'Ly/Lwp (yield-length ratio)'],
    ry: ['capacityBasis.ry', 'Ry'],
  } as const
  const warnings: EngineeringWarning[] = []
  for (const key of Object.keys(labels) as (keyof typeof labels)[]) {
    const value = factors[key]
    if (value === undefined) continue
    const { min, max, source } = FACTOR_RANGES[key]
    if (value < min || value > max) {
      const [field, label] = labels[key]
      warnings.push({ field, message: `${label} = ${value} is outside the usual ${min}–${max} (${source}); confirm it with the supplier's qualified values.` })
    }
  }
  return warnings
}

/** Result of `computeAdjustedStrength`. */
export interface AdjustedStrength {
  /** Pysc = Fysc,min · Asc on the provided core, kips (used for the design check). */
  yieldStrengthKip: number
  /** Stress replacing Ry·Fysc, ksi. */
  expectedYieldKsi: number
  /** Expected yield force = expected stress × Asc, kips. */
  expectedYieldStrengthKip: number
  /** Ry used (1.0 for yield-range and coupon bases). */
  ryApplied: number
  /** Adjusted tension strength Tmax = ω · (Ry·Fysc) · Asc, kips. */
  tensionKip: number
  /** Adjusted compression strength Cmax = β · Tmax, kips. */
  compressionKip: number
  /** Returned notes for factors outside their usual bands. */
  warnings: EngineeringWarning[]
}

/**
 * Adjusted brace strengths on the PROVIDED core (AISC 341 F4.2a, from memory):
 * Pysc = Fysc,min·Asc; Tmax = ω·Ry·Pysc; Cmax = β·ω·Ry·Pysc, with Ry·Fysc replaced by the
 * expected stress for `yieldRange` (Fysc,max) and `coupon` (measured Fysc) bases.
 * Throws `EngineeringInputError` for Asc, Fysc, β, ω or Ry not finite and > 0.
 * Returns warnings (not errors) for β, ω or Ry outside `FACTOR_RANGES`.
 */
export function computeAdjustedStrength(options: {
  coreAreaIn2: number
  fyscMinKsi: number
  basis: CapacityBasis
  beta: number
  omega: number
}): AdjustedStrength {
  const areaIn2 = requirePositive(options.coreAreaIn2, 'coreAreaIn2', 'the provided core area in in²')
  const beta = requirePositive(options.beta, 'beta', 'β from the supplier’s qualification tests (typically 1.0–1.3)')
  const omega = requirePositive(options.omega, 'omega', 'ω from the supplier’s qualification tests (typically 1.2–1.5)')
  const { expectedYieldKsi, ryApplied } = computeExpectedYield(options.basis, options.fyscMinKsi)
  const tensionKip = omega * expectedYieldKsi * areaIn2
  return {
    yieldStrengthKip: options.fyscMinKsi * areaIn2,
    expectedYieldKsi,
    expectedYieldStrengthKip: expectedYieldKsi * areaIn2,
    ryApplied,
    tensionKip,
    compressionKip: beta * tensionKip,
    warnings: checkFactorRanges({ beta, omega, ...(options.basis.kind === 'ry' ? { ry: options.basis.ry } : {}) }),
  }
}

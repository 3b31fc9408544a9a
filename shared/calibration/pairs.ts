import type { CalibrationQuantity } from '../schemas/calibration'

/**
 * One brace snapshot's values as the calibration review reads them, in stored units
 * (in², ksi, kip). Nulls where the record had no value.
 */
export interface PairSnapshot {
  coreAreaIn2: number | null
  fyscKsi: number | null
  fyscBasis: 'specified_min' | 'yield_range' | 'mill_cert' | 'coupon' | null
  fyscMaxKsi: number | null
  ry: number | null
  beta: number | null
  omega: number | null
  /** Deformation at which β and ω were taken, as a multiple of the design story drift. */
  factorDriftMultiple: number | null
  stiffnessFactor: number | null
  /** Adjusted tension strength Tmax = ω·Ry·Fysc·Asc, kip (AISC 341-16 F4.2a), as stored. */
  tmaxKip: number | null
  /** Adjusted compression strength Cmax = β·ω·Ry·Fysc·Asc, kip (AISC 341-16 F4.2a), as stored. */
  cmaxKip: number | null
}

/** A brace's assumed snapshot (an early phase) and its final (governing) one, with the project's AISC 341 edition. */
export interface PairInput {
  assumed: PairSnapshot
  final: PairSnapshot
  /** AISC 341 edition of the project as stored, e.g. "341-16"; null when not stated. */
  codeEdition: string | null
}

/** The value of one quantity on both sides of a pair, and the basis it was taken on. */
export interface PairValue {
  assumed: number
  final: number
  basis: string
}

const ok = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v) && v > 0

/** "AISC 341-16", or a plain statement that the edition is missing. */
export function editionLabel(edition: string | null): string {
  if (!edition || !edition.trim()) return 'AISC 341 edition not stated'
  const e = edition.trim()
  return /^aisc/i.test(e) ? e : `AISC ${e}`
}

/** The final's deformation basis of β and ω, e.g. "2.0×Δbm" (a multiple of the brace deformation at the design story drift). */
export function deformationLabel(multiple: number | null): string {
  return ok(multiple) ? `${multiple.toFixed(1)}×Δbm` : 'deformation basis not stated'
}

/** Name of a snapshot's expected-yield basis, as used in overstrength basis labels. */
export function yieldBasisLabel(s: PairSnapshot): string {
  switch (s.fyscBasis) {
    case 'coupon':
      return 'coupon Fysc'
    case 'mill_cert':
      return 'mill-cert Fysc'
    case 'yield_range':
      return 'yield-range upper bound'
    default:
      return 'Ry·Fysc (specified minimum)'
  }
}

/**
 * Expected core yield stress of a snapshot, ksi: the measured Fysc for a coupon or mill
 * certificate (no Ry on measured values, AISC 341-16 F4.2a, from memory), the yield-range upper
 * bound Fysc,max for a yield-range basis, Ry·Fysc for a specified-minimum basis. Null when the
 * basis lacks what it needs.
 */
export function expectedYieldKsi(s: PairSnapshot): number | null {
  switch (s.fyscBasis) {
    case 'coupon':
    case 'mill_cert':
      return ok(s.fyscKsi) ? s.fyscKsi : null
    case 'yield_range':
      return ok(s.fyscMaxKsi) ? s.fyscMaxKsi : null
    default:
      return ok(s.fyscKsi) && ok(s.ry) ? s.ry * s.fyscKsi : null
  }
}

/**
 * The assumed and final values of `quantity` for one pair and the basis label that keeps values
 * on different bases apart; null when either side lacks the value (or it is not positive).
 * Bases: β, ω, Tmax and Cmax carry the final's deformation basis (they all contain the supplier's
 * ω, and Cmax β); overstrength carries "assumed basis → final basis"; every label ends with the
 * project's AISC 341 edition.
 */
export function pairValue(pair: PairInput, quantity: CalibrationQuantity): PairValue | null {
  const { assumed: a, final: f } = pair
  const edition = editionLabel(pair.codeEdition)
  const deformation = `${deformationLabel(f.factorDriftMultiple)} · ${edition}`
  let av: number | null
  let fv: number | null
  let basis: string
  switch (quantity) {
    case 'beta':
      ;[av, fv, basis] = [a.beta, f.beta, deformation]
      break
    case 'omega':
      ;[av, fv, basis] = [a.omega, f.omega, deformation]
      break
    case 'tmax':
      ;[av, fv, basis] = [a.tmaxKip, f.tmaxKip, deformation]
      break
    case 'cmax':
      ;[av, fv, basis] = [a.cmaxKip, f.cmaxKip, deformation]
      break
    case 'overstrength':
      ;[av, fv, basis] = [expectedYieldKsi(a), expectedYieldKsi(f), `${yieldBasisLabel(a)} → ${yieldBasisLabel(f)} · ${edition}`]
      break
    case 'stiffness':
      ;[av, fv, basis] = [a.stiffnessFactor, f.stiffnessFactor, edition]
      break
    case 'coreArea':
      ;[av, fv, basis] = [a.coreAreaIn2, f.coreAreaIn2, edition]
      break
  }
  return ok(av) && ok(fv) ? { assumed: av, final: fv, basis } : null
}

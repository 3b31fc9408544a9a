import { adjustedStrengthsOf, type SnapshotStrengthInput } from '../history/snapshot'
import type { BraceCheck, CheckItem, SupplierPhase } from '../schemas/projects'

/**
 * Submittal check: brace by brace, the supplier's recorded values against what the frame was
 * designed for (the *design* snapshot = the latest of sd/dd/cd). Pure; stored units (in², ksi, kip).
 *
 * Items
 * - `coreArea`, `stiffnessFactor`: supplier / design − 1 inside the two-sided band ±tolerance
 *   (the firm's `stiffnessTolerance`, ±10 % common practice, no source). Outside either way "exceeds".
 * - `tmax`, `cmax`: the supplier's Tmax = ω·Ry·Fysc·Asc and Cmax = β·Tmax (AISC 341-16 F4.2a),
 *   computed by the engine (`adjustedStrengthsOf`) from the supplier's values, must not be above the
 *   design Tmax/Cmax the beams, columns and connections were sized for (one-sided).
 * - `deformationBasis`: the deformation β and ω were taken at (multiple of the design story drift)
 *   must be stated, else `missing` (AISC 341-16 F4.2a: adjustment factors at 2.0 × design story drift, from memory).
 * - `ryBasis`: Ry must match the yield basis — a coupon, mill-certificate or yield-range stress takes
 *   Ry = 1 (an Ry above 1 "exceeds" by Ry − 1, the overstatement of the expected yield); a specified
 *   minimum needs Ry (`missing` without it).
 * Expected "does not pass" outcomes are returned, never thrown.
 */

/** What the check reads of a snapshot. */
export interface CheckSnapshot extends SnapshotStrengthInput {
  phase: 'sd' | 'dd' | 'cd' | 'submittal' | 'approved' | 'coupon'
  revision: number
  stiffnessFactor: number | null
  factorDriftMultiple: number | null
}

const DESIGN_ORDER = { sd: 0, dd: 1, cd: 2 } as const
const SUPPLIER_ORDER = { submittal: 0, approved: 1, coupon: 2 } as const
/** Relative slack for floating-point comparisons (1e-9). */
const EPS = 1e-9

/** The latest of the sd/dd/cd snapshots (highest phase, then revision), or null. */
export function designSnapshotOf<T extends CheckSnapshot>(snaps: readonly T[]): T | null {
  let best: T | null = null
  for (const s of snaps) {
    if (!(s.phase in DESIGN_ORDER)) continue
    const k = DESIGN_ORDER[s.phase as keyof typeof DESIGN_ORDER]
    if (!best || k > DESIGN_ORDER[best.phase as keyof typeof DESIGN_ORDER] || (k === DESIGN_ORDER[best.phase as keyof typeof DESIGN_ORDER] && s.revision > best.revision)) best = s
  }
  return best
}

/** The latest supplier (submittal / approved / coupon) phase and revision among `snaps`: submittal rev 0 < rev 1 < … < approved < coupon. */
export function latestSupplierKey(snaps: readonly { phase: string; revision: number }[]): { phase: SupplierPhase; revision: number } | null {
  let best: { phase: SupplierPhase; revision: number } | null = null
  for (const s of snaps) {
    if (!(s.phase in SUPPLIER_ORDER)) continue
    const phase = s.phase as SupplierPhase
    if (!best || SUPPLIER_ORDER[phase] > SUPPLIER_ORDER[best.phase] || (phase === best.phase && s.revision > best.revision)) best = { phase, revision: s.revision }
  }
  return best
}

const pct = (r: number) => `${r >= 0 ? '+' : '−'}${Math.abs(r * 100).toFixed(1)} %`

function bandItem(item: 'coreArea' | 'stiffnessFactor', design: number | null, supplier: number | null, tolerance: number, unit: string, label: string): CheckItem {
  if (!design || !supplier) return { item, status: 'missing', design, supplier, unit, excess: null, excessRatio: null, message: `${label}: not recorded on ${!design ? 'the design' : 'the supplier'} snapshot.` }
  const ratio = supplier / design - 1
  const pass = Math.abs(ratio) <= tolerance + EPS
  return {
    item,
    status: pass ? 'pass' : 'exceeds',
    design,
    supplier,
    unit,
    excess: supplier - design,
    excessRatio: ratio,
    message: `${label} ${pct(ratio)} against the design, ${pass ? 'inside' : 'outside'} the ±${(tolerance * 100).toFixed(1)} % band.`,
  }
}

function forceItem(item: 'tmax' | 'cmax', design: number | null, supplier: number | null, label: string): CheckItem {
  if (design === null || supplier === null) {
    return { item, status: 'missing', design, supplier, unit: 'kip', excess: null, excessRatio: null, message: `${label}: cannot be computed from the ${design === null ? 'design' : 'supplier'} values (core area, Fysc, yield basis, β or ω missing).` }
  }
  const over = supplier > design * (1 + EPS)
  return {
    item,
    status: over ? 'exceeds' : 'pass',
    design,
    supplier,
    unit: 'kip',
    excess: supplier - design,
    excessRatio: supplier / design - 1,
    message: over
      ? `${label} ${supplier.toFixed(1)} kip exceeds the ${design.toFixed(1)} kip the frame was designed for by ${(supplier - design).toFixed(1)} kip (${pct(supplier / design - 1)}).`
      : `${label} ${supplier.toFixed(1)} kip is within the ${design.toFixed(1)} kip designed for.`,
  }
}

function deformationItem(design: CheckSnapshot, supplier: CheckSnapshot): CheckItem {
  const stated = supplier.factorDriftMultiple
  return {
    item: 'deformationBasis',
    status: stated ? 'pass' : 'missing',
    design: design.factorDriftMultiple,
    supplier: stated,
    unit: '× design story drift',
    excess: null,
    excessRatio: null,
    message: stated ? `β and ω stated at ${stated} × the design story drift.` : 'The deformation β and ω were taken at is not stated; ask the supplier for it.',
  }
}

function ryItem(s: CheckSnapshot): CheckItem {
  const base = { item: 'ryBasis' as const, design: null, supplier: s.ry, unit: 'Ry' }
  const basis = s.fyscBasis ?? 'specified_min'
  if (basis === 'specified_min') {
    return s.ry
      ? { ...base, status: 'pass', excess: null, excessRatio: null, message: `Specified minimum yield with Ry = ${s.ry}.` }
      : { ...base, status: 'missing', excess: null, excessRatio: null, message: 'A specified-minimum yield needs Ry (AISC 341 Table A3.1); none is recorded.' }
  }
  const measured = basis === 'coupon' || basis === 'mill_cert'
  if (s.ry !== null && s.ry > 1 + EPS) {
    return {
      ...base,
      status: 'exceeds',
      excess: s.ry - 1,
      excessRatio: s.ry - 1,
      message: `Ry = ${s.ry} recorded on a ${measured ? 'measured (coupon or mill-certificate)' : 'yield-range'} value: Ry is not applied to it (AISC 341-16 F4.2a, from memory); the expected yield would be overstated by ${pct(s.ry - 1)}.`,
    }
  }
  return { ...base, status: 'pass', excess: null, excessRatio: null, message: `${measured ? 'Measured' : 'Yield-range'} yield, no Ry applied.` }
}

/**
 * Checks one brace's supplier snapshot against its design snapshot. `tolerance` is a fraction
 * (0.10 = ±10 %). Status: `exceeds` if any item exceeds, else `missing` if any item lacks a value, else `pass`.
 */
export function checkBrace(
  where: { frameLine: string; level: string; levelIndex: number },
  design: CheckSnapshot | null,
  supplier: CheckSnapshot | null,
  tolerance: number,
): BraceCheck {
  if (!(tolerance >= 0)) throw new RangeError('tolerance: must be a fraction ≥ 0 (0.10 = ±10 %).')
  const designKey = design ? { phase: design.phase as 'sd' | 'dd' | 'cd', revision: design.revision } : null
  const supplierKey = supplier ? { phase: supplier.phase as SupplierPhase, revision: supplier.revision } : null
  if (!design || !supplier) return { ...where, design: designKey, supplier: supplierKey, status: 'missing', items: [] }
  const d = adjustedStrengthsOf(design)
  const s = adjustedStrengthsOf(supplier)
  const items: CheckItem[] = [
    bandItem('coreArea', design.coreAreaIn2, supplier.coreAreaIn2, tolerance, 'in²', 'Core area'),
    bandItem('stiffnessFactor', design.stiffnessFactor, supplier.stiffnessFactor, tolerance, 'ratio', 'Stiffness factor'),
    forceItem('tmax', d.tensionKip, s.tensionKip, 'Tmax'),
    forceItem('cmax', d.compressionKip, s.compressionKip, 'Cmax'),
    deformationItem(design, supplier),
    ryItem(supplier),
  ]
  const status = items.some(i => i.status === 'exceeds') ? 'exceeds' : items.some(i => i.status === 'missing') ? 'missing' : 'pass'
  return { ...where, design: designKey, supplier: supplierKey, status, items }
}

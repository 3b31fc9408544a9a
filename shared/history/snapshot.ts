import { computeAdjustedStrength } from '../engineering/adjusted-strength'
import type { CapacityBasis } from '../engineering/capacity-basis'
import type { SnapshotRecord } from './types'

/** The values of a brace snapshot that decide its adjusted strengths (stored units: in², ksi). */
export type SnapshotStrengthInput = Pick<SnapshotRecord, 'coreAreaIn2' | 'fyscKsi' | 'fyscBasis' | 'fyscMaxKsi' | 'ry' | 'beta' | 'omega'>

/**
 * The expected-yield basis of a snapshot as the engine takes it. Measured yield (coupon or mill
 * certificate) takes Ry = 1.0 (AISC 341-16 F4.2a, from memory); a yield range uses its upper
 * bound; a specified minimum needs Ry. Undefined when the snapshot lacks what its basis needs.
 */
export function capacityBasisOf(s: SnapshotStrengthInput): CapacityBasis | undefined {
  if (!s.fyscKsi) return undefined
  switch (s.fyscBasis) {
    case 'coupon':
    case 'mill_cert':
      return { kind: 'coupon', fyscKsi: s.fyscKsi }
    case 'yield_range':
      return s.fyscMaxKsi ? { kind: 'yieldRange', fyscMaxKsi: s.fyscMaxKsi } : undefined
    case 'specified_min':
    case null:
      return s.ry ? { kind: 'ry', ry: s.ry } : undefined
  }
}

/**
 * Tmax = ω·Ry·Fysc·Asc and Cmax = β·Tmax (AISC 341-16 F4.2a) for a snapshot, in kip;
 * nulls when a needed value is missing or not positive.
 */
export function adjustedStrengthsOf(s: SnapshotStrengthInput): { tensionKip: number | null; compressionKip: number | null } {
  const basis = capacityBasisOf(s)
  if (!basis || !s.coreAreaIn2 || !s.fyscKsi || !s.beta || !s.omega || s.beta <= 0 || s.omega <= 0) return { tensionKip: null, compressionKip: null }
  try {
    const a = computeAdjustedStrength({ coreAreaIn2: s.coreAreaIn2, fyscMinKsi: s.fyscKsi, basis, beta: s.beta, omega: s.omega })
    return { tensionKip: a.tensionKip, compressionKip: a.compressionKip }
  } catch {
    return { tensionKip: null, compressionKip: null }
  }
}

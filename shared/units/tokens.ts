import { IN_PER_FT, KG_PER_LB, KG_PER_TONNE, KN_PER_KIP, LB_PER_SHORT_TON, MM_PER_IN, M_PER_FT } from './constants'
import { MPA_PER_KSI } from './stress'

/**
 * Unit tokens of the history import format (docs/import-format.md) and their factor to the
 * stored canonical unit: length in, force kip, stress ksi, area in², floor area ft², steel weight
 * short ton. Exact bases (NIST SP 811): 1 ft = 0.3048 m, 1 lb = 0.45359237 kg.
 */
export type ImportQuantity = 'length' | 'drift' | 'force' | 'stress' | 'area' | 'floorArea' | 'weight'

const M2_PER_FT2 = M_PER_FT * M_PER_FT
const TONNE_PER_SHORT_TON = (LB_PER_SHORT_TON * KG_PER_LB) / KG_PER_TONNE

/** Multiply a value in the token's unit by this to get the stored unit. */
export const IMPORT_UNIT_FACTORS: Record<ImportQuantity, Record<string, number>> = {
  length: { ft: IN_PER_FT, in: 1, m: 1000 / MM_PER_IN, mm: 1 / MM_PER_IN },
  drift: { in: 1, mm: 1 / MM_PER_IN },
  force: { kip: 1, kN: 1 / KN_PER_KIP },
  stress: { ksi: 1, MPa: 1 / MPA_PER_KSI },
  area: { in2: 1, mm2: 1 / (MM_PER_IN * MM_PER_IN) },
  floorArea: { ft2: 1, m2: 1 / M2_PER_FT2 },
  weight: { ton: 1, tonne: 1 / TONNE_PER_SHORT_TON },
}

/** The unit each quantity takes when a file declares `units: us` or `units: si`. */
export const IMPORT_SYSTEM_UNITS: Record<'us' | 'si', Record<ImportQuantity, string>> = {
  us: { length: 'ft', drift: 'in', force: 'kip', stress: 'ksi', area: 'in2', floorArea: 'ft2', weight: 'ton' },
  si: { length: 'm', drift: 'mm', force: 'kN', stress: 'MPa', area: 'mm2', floorArea: 'm2', weight: 'tonne' },
}

/** Accepts common spellings (`in²`, `mm^2`, `KN`, `tons`) and returns the canonical token, or undefined. */
export function normalizeUnitToken(quantity: ImportQuantity, raw: string): string | undefined {
  const t = raw.trim().replace(/²/g, '2').replace(/\^2/g, '2').replace(/\s+/g, '')
  const table = IMPORT_UNIT_FACTORS[quantity]
  const alias: Record<string, string> = { tons: 'ton', tonnes: 'tonne', t: 'tonne', kips: 'kip', sqft: 'ft2', sqm: 'm2' }
  const candidates = [t, alias[t.toLowerCase()] ?? '']
  for (const c of candidates) {
    const hit = Object.keys(table).find(k => k.toLowerCase() === c.toLowerCase())
    if (hit) return hit
  }
  return undefined
}

/** Converts `value` in `token` (already normalized) to the stored unit of `quantity`. */
export function toStoredUnit(quantity: ImportQuantity, value: number, token: string): number {
  const f = IMPORT_UNIT_FACTORS[quantity][token]
  if (f === undefined) throw new RangeError(`Unknown ${quantity} unit "${token}"; expected one of ${Object.keys(IMPORT_UNIT_FACTORS[quantity]).join(', ')}.`)
  return value * f
}

/** The unit each quantity is stored in. */
export const STORED_UNITS: Record<ImportQuantity, string> = { length: 'in', drift: 'in', force: 'kip', stress: 'ksi', area: 'in2', floorArea: 'ft2', weight: 'ton' }

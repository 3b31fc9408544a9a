import type { SizingLevelResult, SizingResponse } from '@shared/schemas/sizing'
import type { UnitSystem } from '@shared/units/systems'

/**
 * What the New frame screen shows per level, in one list read by the results table, the CSV
 * and the printable page, so the three cannot disagree. Pure, no Vue.
 */

export type NumericLevelField = {
  [K in keyof SizingLevelResult]: SizingLevelResult[K] extends number | null ? K : never
}[keyof SizingLevelResult]

export interface ResultColumn {
  field: NumericLevelField
  /** Short heading; `Pu` becomes `Pa` under ASD. */
  label: (method: SizingResponse['method']) => string
  /** What the heading means, for the tooltip and the CSV header block. */
  description: string
  /** Decimals shown, per unit system. */
  digits: Record<UnitSystem, number>
}

export const RESULT_COLUMNS: readonly ResultColumn[] = [
  { field: 'braceAxialDemand', label: m => (m === 'asd' ? 'Pa' : 'Pu'), description: 'Axial demand per brace, V/(n·cos θ)', digits: { us: 1, si: 0 } },
  { field: 'requiredCoreArea', label: () => 'Asc,req', description: 'Required core area', digits: { us: 2, si: 0 } },
  { field: 'coreArea', label: () => 'Asc', description: 'Chosen core area, rounded up on the increment table', digits: { us: 2, si: 0 } },
  { field: 'demandCapacityRatio', label: () => 'DCR', description: 'Demand / design strength of the chosen core', digits: { us: 2, si: 2 } },
  { field: 'adjustedTension', label: () => 'Tmax', description: 'Adjusted brace strength in tension', digits: { us: 1, si: 0 } },
  { field: 'adjustedCompression', label: () => 'Cmax', description: 'Adjusted brace strength in compression', digits: { us: 1, si: 0 } },
  { field: 'beamUnbalancedLoad', label: () => 'Beam unbal.', description: 'Unbalanced load on the beam where the braces meet, per bay', digits: { us: 1, si: 0 } },
  { field: 'columnAxial', label: () => 'Column C', description: 'Compression-side column axial, per column, gravity excluded', digits: { us: 1, si: 0 } },
  { field: 'columnAxialTension', label: () => 'Column T', description: 'Tension-side column axial, per column, gravity excluded', digits: { us: 1, si: 0 } },
  { field: 'connectionRequiredStrength', label: () => 'Connection', description: 'Connection required strength, 1.1·Cmax', digits: { us: 1, si: 0 } },
  { field: 'stiffness', label: () => 'K', description: 'Axial stiffness of one brace', digits: { us: 0, si: 1 } },
]

/** A number with fixed decimals and grouping ("1,234.5"); "—" for null or non-finite. */
export function formatNumber(value: number | null | undefined, digits: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—'
  return value.toLocaleString('en-US', { minimumFractionDigits: digits, maximumFractionDigits: digits })
}

/** The unit of a result field from the response's own `units` map ("" for ratios). */
export function unitLabel(result: Pick<SizingResponse, 'units'>, field: string): string {
  const unit = result.units[field]
  return !unit || unit === '1' ? '' : unit
}

/** "↑ up" / "↓ down" for the beam unbalanced load, "" when there is none. */
export function directionLabel(direction: SizingLevelResult['beamUnbalancedDirection']): string {
  return direction === 'up' ? '↑ up' : direction === 'down' ? '↓ down' : ''
}

export interface ResultDifference {
  /** Dotted path in the response, e.g. `levels.1.coreArea`. */
  path: string
  local: unknown
  server: unknown
}

/**
 * Where the browser's result and the server's differ. Numbers agree within a relative 1e-9
 * (both run the same engine; only float noise is tolerated); strings, nulls and array
 * lengths must match exactly. `cautions` and `units` are compared too.
 */
export function compareResults(local: unknown, server: unknown, path = ''): ResultDifference[] {
  if (typeof local === 'number' && typeof server === 'number') {
    const scale = Math.max(1, Math.abs(local), Math.abs(server))
    return Math.abs(local - server) <= 1e-9 * scale ? [] : [{ path, local, server }]
  }
  if (Array.isArray(local) && Array.isArray(server)) {
    if (local.length !== server.length) return [{ path: `${path}.length`.replace(/^\./, ''), local: local.length, server: server.length }]
    return local.flatMap((v, i) => compareResults(v, server[i], join(path, String(i))))
  }
  if (isRecord(local) && isRecord(server)) {
    const keys = [...new Set([...Object.keys(local), ...Object.keys(server)])].sort()
    return keys.flatMap(k => compareResults(local[k], server[k], join(path, k)))
  }
  return Object.is(local, server) ? [] : [{ path, local, server }]
}

const join = (path: string, key: string) => (path ? `${path}.${key}` : key)
const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v)

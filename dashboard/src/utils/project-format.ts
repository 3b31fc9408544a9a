import type { CheckItem, CheckItemKey } from '@shared/schemas/projects'
import { M_PER_FT } from '@shared/units/constants'
import { ftToIn } from '@shared/units/length'
import { shortTonToTonne } from '@shared/units/mass'
import { toDisplay, unitOf, type QuantityKind, type UnitSystem } from '@shared/units/systems'

/**
 * Display of project records: names of the stored codes, and stored US quantities (kip, in, ksi,
 * in², ft, ft², short tons) in the user's unit system through `shared/units`. Pure, no Vue.
 */

/** Building-use names, one table with the proposal sheet's. */
export { USE_LABELS } from '@shared/benchmarks/proposal-sheet'
export const CONFIG_SHORT: Record<string, string> = { single_diagonal: 'Single diagonal', inverted_v: 'Inverted-V', v: 'V', two_story_x: 'Two-story X' }
export const PHASE_LABELS: Record<string, string> = { sd: 'Schematic (SD)', dd: 'Design development (DD)', cd: 'Construction documents (CD)', submittal: 'Supplier submittal', approved: 'Approved submittal', coupon: 'Coupon test' }
export const PHASE_SHORT: Record<string, string> = { sd: 'SD', dd: 'DD', cd: 'CD', submittal: 'Submittal', approved: 'Approved', coupon: 'Coupon' }
export const PHASE_REACHED_LABELS: Record<string, string> = { sd: 'Schematic design', dd: 'Design development', cd: 'Construction documents', construction: 'In construction', complete: 'Complete' }
export const YIELD_BASIS_LABELS: Record<string, string> = { specified_min: 'Specified min. × Ry', yield_range: 'Yield range (upper bound)', mill_cert: 'Mill certificate', coupon: 'Coupon test' }
export const TONNAGE_LABELS: Record<string, string> = { braces: 'Braces', beams: 'Braced-frame beams', columns: 'Braced-frame columns', connections: 'Connections', lateral_total: 'Lateral system total', structural_total: 'Structural steel total' }
export const CHECK_ITEM_LABELS: Record<CheckItemKey, string> = { coreArea: 'Core area', stiffnessFactor: 'Stiffness factor KF', tmax: 'Tmax', cmax: 'Cmax', deformationBasis: 'Deformation basis', ryBasis: 'Ry basis' }

/** "Submittal rev. 1"; revision 0 of a design phase is just the phase. */
export function snapshotName(phase: string, revision: number): string {
  return `${PHASE_SHORT[phase] ?? phase} rev. ${revision}`
}

/** A number with fixed digits, or "—". Negative values use a true minus sign. */
export function fmt(value: number | null | undefined, digits: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—'
  const s = value.toFixed(digits)
  return s.startsWith('-') && Number(s) !== 0 ? `−${s.slice(1)}` : s.replace(/^-/, '')
}

/** A fraction as a signed percentage: 0.1008 → "+10.1 %". */
export function signedPercent(fraction: number | null | undefined, digits = 1): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return '—'
  const s = (Math.abs(fraction) * 100).toFixed(digits)
  if (Number(s) === 0) return `±${s} %`
  return `${fraction > 0 ? '+' : '−'}${s} %`
}

/** Digits shown per kind and system (US: 2 for in², 1 for kip; SI: whole mm², kN). */
const DIGITS: Record<UnitSystem, Partial<Record<QuantityKind, number>>> = {
  us: { area: 2, force: 1, stress: 1, length: 2, dimension: 1 },
  si: { area: 0, force: 0, stress: 0, length: 0, dimension: 2 },
}

/** A stored (canonical US) quantity in the user's system: `quantity('area', 6.5, 'si')` → "4194 mm²". */
export function quantity(kind: QuantityKind, canonical: number | null | undefined, system: UnitSystem, digits?: number): string {
  if (canonical === null || canonical === undefined) return '—'
  return `${fmt(toDisplay(kind, canonical, system), digits ?? DIGITS[system][kind] ?? 2)} ${unitOf(kind, system)}`
}

/** The number alone (no unit), for table cells whose header names the unit. */
export function quantityValue(kind: QuantityKind, canonical: number | null | undefined, system: UnitSystem, digits?: number): string {
  if (canonical === null || canonical === undefined) return '—'
  return fmt(toDisplay(kind, canonical, system), digits ?? DIGITS[system][kind] ?? 2)
}

/** A building dimension stored in ft, shown in ft or m. */
export function feet(valueFt: number | null | undefined, system: UnitSystem): string {
  if (valueFt === null || valueFt === undefined) return '—'
  return quantity('dimension', ftToIn(valueFt), system)
}

/** Floor area stored in ft², shown in ft² or m² (thousands separated). */
export function floorArea(valueFt2: number | null | undefined, system: UnitSystem): string {
  if (valueFt2 === null || valueFt2 === undefined) return '—'
  const v = system === 'us' ? valueFt2 : valueFt2 * M_PER_FT * M_PER_FT
  return `${Math.round(v).toLocaleString('en-US')} ${system === 'us' ? 'ft²' : 'm²'}`
}

/** Short tons in short tons (US) or tonnes (SI). */
export function tons(shortTons: number | null | undefined, system: UnitSystem): string {
  if (shortTons === null || shortTons === undefined) return '—'
  return system === 'us' ? `${fmt(shortTons, 1)} tons` : `${fmt(shortTonToTonne(shortTons), 1)} t`
}

/** Floor area and height typed in the user's system, back to the stored ft / ft². */
export function toStoredFeet(display: number, system: UnitSystem): number {
  return system === 'us' ? display : display / M_PER_FT
}
export function toStoredFt2(display: number, system: UnitSystem): number {
  return system === 'us' ? display : display / (M_PER_FT * M_PER_FT)
}
export function fromStoredFeet(ft: number, system: UnitSystem): number {
  return system === 'us' ? ft : ft * M_PER_FT
}
export function fromStoredFt2(ft2: number, system: UnitSystem): number {
  return system === 'us' ? ft2 : ft2 * M_PER_FT * M_PER_FT
}

const ITEM_KIND: Partial<Record<CheckItemKey, QuantityKind>> = { coreArea: 'area', tmax: 'force', cmax: 'force' }

/**
 * One check item in words, never by colour alone: a mark, the verdict and by how much, in the
 * user's units. E.g. `{ mark: '✗', verdict: 'Exceeds', detail: '+58.4 kip (+10.1 %)' }`.
 */
export function checkItemText(item: CheckItem, system: UnitSystem): { mark: '✓' | '✗' | '?'; verdict: string; detail: string } {
  if (item.status === 'missing') return { mark: '?', verdict: 'Missing', detail: 'value not recorded' }
  const kind = ITEM_KIND[item.item]
  const mark = item.status === 'pass' ? '✓' : '✗'
  const verdict = item.status === 'pass' ? 'Passes' : 'Exceeds'
  if (item.item === 'ryBasis') return { mark, verdict, detail: item.supplier === null ? 'no Ry' : `Ry = ${fmt(item.supplier, 2)}` }
  if (item.item === 'deformationBasis') return { mark, verdict, detail: `at ${fmt(item.supplier, 1)} × design drift` }
  if (item.excess === null) return { mark, verdict, detail: '' }
  const amount = kind ? quantity(kind, Math.abs(item.excess), system) : fmt(Math.abs(item.excess), 2)
  const sign = item.excess > 0 ? '+' : item.excess < 0 ? '−' : '±'
  return { mark, verdict, detail: `${sign}${amount} (${signedPercent(item.excessRatio)})` }
}

import { ftToIn, inToFt, inToM, inToMm, mToIn, mmToIn } from './length'
import { kipToKn, knToKip } from './force'
import { ksiToMpa, mpaToKsi } from './stress'
import { in2ToMm2, mm2ToIn2 } from './area'
import { kipPerInToKnPerMm, knPerMmToKipPerIn } from './stiffness'
import {
  kgPerM2ToLbPerFt2,
  kgPerM3ToLbPerFt3,
  kgPerMToLbPerFt,
  kgToLb,
  lbPerFt2ToKgPerM2,
  lbPerFt3ToKgPerM3,
  lbPerFtToKgPerM,
  lbToKg,
} from './mass'
import { kipFtToKnM, kipInToKipFt, kipFtToKipIn, knMToKipFt } from './moment'

/** The two unit systems a request or a screen can use: US customary or SI. */
export type UnitSystem = 'us' | 'si'

/** All unit systems, for validation and pickers. */
export const UNIT_SYSTEMS = ['us', 'si'] as const satisfies readonly UnitSystem[]

/**
 * Kinds of physical quantity the engineering code exchanges with users.
 *
 * - `length`: short lengths and deformations (in | mm)
 * - `dimension`: frame dimensions such as bay width, story height, brace length (ft | m)
 * - `force`, `stress`, `area`, `stiffness` (axial), `moment`
 * - `weight` (mass), `weightPerLength`, `massPerArea` (tonnage per floor area), `density`
 * - `angle` (degrees in both systems) and `ratio` (dimensionless, unit "1")
 */
export type QuantityKind =
  | 'length'
  | 'dimension'
  | 'force'
  | 'stress'
  | 'area'
  | 'stiffness'
  | 'moment'
  | 'weight'
  | 'weightPerLength'
  | 'massPerArea'
  | 'density'
  | 'angle'
  | 'ratio'

/**
 * Canonical unit of each kind inside the engine. All computation happens in these units:
 * kip, inch, ksi, in², kip/in, kip·in, lb (mass), lb/ft, lb/ft², lb/ft³, degrees.
 * Frame dimensions are carried in inches internally even though US users enter feet.
 */
export const CANONICAL_UNITS = {
  length: 'in',
  dimension: 'in',
  force: 'kip',
  stress: 'ksi',
  area: 'in²',
  stiffness: 'kip/in',
  moment: 'kip·in',
  weight: 'lb',
  weightPerLength: 'lb/ft',
  massPerArea: 'lb/ft²',
  density: 'lb/ft³',
  angle: 'deg',
  ratio: '1',
} as const satisfies Record<QuantityKind, string>

/**
 * Display unit of each quantity kind in each unit system. Requests and responses of
 * the sizing API use exactly these units (e.g. force: 'kip' in US, 'kN' in SI).
 */
export const DISPLAY_UNITS = {
  us: {
    length: 'in',
    dimension: 'ft',
    force: 'kip',
    stress: 'ksi',
    area: 'in²',
    stiffness: 'kip/in',
    moment: 'kip·ft',
    weight: 'lb',
    weightPerLength: 'lb/ft',
    massPerArea: 'lb/ft²',
    density: 'lb/ft³',
    angle: 'deg',
    ratio: '1',
  },
  si: {
    length: 'mm',
    dimension: 'm',
    force: 'kN',
    stress: 'MPa',
    area: 'mm²',
    stiffness: 'kN/mm',
    moment: 'kN·m',
    weight: 'kg',
    weightPerLength: 'kg/m',
    massPerArea: 'kg/m²',
    density: 'kg/m³',
    angle: 'deg',
    ratio: '1',
  },
} as const satisfies Record<UnitSystem, Record<QuantityKind, string>>

/** The display unit string of a quantity kind in a unit system, e.g. `unitOf('force', 'si') === 'kN'`. */
export function unitOf(kind: QuantityKind, system: UnitSystem): string {
  return DISPLAY_UNITS[system][kind]
}

type Pair = readonly [toDisplay: (canonical: number) => number, fromDisplay: (display: number) => number]
const same = (v: number) => v

const PAIRS: Record<UnitSystem, Record<QuantityKind, Pair>> = {
  us: {
    length: [same, same],
    dimension: [inToFt, ftToIn],
    force: [same, same],
    stress: [same, same],
    area: [same, same],
    stiffness: [same, same],
    moment: [kipInToKipFt, kipFtToKipIn],
    weight: [same, same],
    weightPerLength: [same, same],
    massPerArea: [same, same],
    density: [same, same],
    angle: [same, same],
    ratio: [same, same],
  },
  si: {
    length: [inToMm, mmToIn],
    dimension: [inToM, mToIn],
    force: [kipToKn, knToKip],
    stress: [ksiToMpa, mpaToKsi],
    area: [in2ToMm2, mm2ToIn2],
    stiffness: [kipPerInToKnPerMm, knPerMmToKipPerIn],
    moment: [(v) => kipFtToKnM(kipInToKipFt(v)), (v) => kipFtToKipIn(knMToKipFt(v))],
    weight: [lbToKg, kgToLb],
    weightPerLength: [lbPerFtToKgPerM, kgPerMToLbPerFt],
    massPerArea: [lbPerFt2ToKgPerM2, kgPerM2ToLbPerFt2],
    density: [lbPerFt3ToKgPerM3, kgPerM3ToLbPerFt3],
    angle: [same, same],
    ratio: [same, same],
  },
}

/**
 * Convert a value from the canonical unit of its kind (see `CANONICAL_UNITS`) to the
 * display unit of `system` (see `DISPLAY_UNITS`). Example: `toDisplay('dimension', 180, 'us') === 15` (ft).
 * Non-finite values pass through unchanged (NaN stays NaN); callers validate input first.
 */
export function toDisplay(kind: QuantityKind, canonicalValue: number, system: UnitSystem): number {
  return PAIRS[system][kind][0](canonicalValue)
}

/**
 * Convert a value given in the display unit of `system` to the canonical unit of its kind.
 * Example: `fromDisplay('force', 4.4482216152605, 'si') === 1` (kip).
 */
export function fromDisplay(kind: QuantityKind, displayValue: number, system: UnitSystem): number {
  return PAIRS[system][kind][1](displayValue)
}

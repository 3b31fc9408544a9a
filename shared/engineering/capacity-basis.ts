import { EngineeringInputError, mustBe, requirePositive } from './errors'

/**
 * How the expected core yield stress for the adjusted strengths is obtained.
 * Stresses in ksi. Sources: AISC 341 F4.2a and the Ry exception for coupon-based Fysc
 * (from memory, engineering reference §1.2), and the yield-range recommendation of §1.6 (common practice).
 *
 * - `ry`: Fysc is the specified minimum; expected yield = Ry × Fysc,min (Ry from Table A3.1).
 * - `yieldRange`: the core plate is bought to a min–max window; the upper bound `fyscMaxKsi`
 *   is the expected yield and Ry = 1.0.
 * - `coupon`: `fyscKsi` was measured on coupons of the core material; Ry = 1.0. Ry is never
 *   applied to a coupon value.
 */
export type CapacityBasis =
  | { kind: 'ry'; ry: number }
  | { kind: 'yieldRange'; fyscMaxKsi: number }
  | { kind: 'coupon'; fyscKsi: number }

/** The three kinds of capacity basis. */
export const CAPACITY_BASIS_KINDS = ['ry', 'yieldRange', 'coupon'] as const

/** Result of `computeExpectedYield`. */
export interface ExpectedYield {
  /** Stress that replaces Ry·Fysc in the adjusted strengths, ksi. */
  expectedYieldKsi: number
  /** The Ry factor applied: the given Ry for `ry`, 1.0 for `yieldRange` and `coupon`. */
  ryApplied: number
}

/**
 * Expected core yield stress for the adjusted strengths (AISC 341 F4.2a, from memory):
 * `ry` → Ry × Fysc,min; `yieldRange` → Fysc,max with Ry = 1.0; `coupon` → measured Fysc with Ry = 1.0.
 * Throws `EngineeringInputError` (fields `fyscMinKsi`, `capacityBasis.…`) for values that are not
 * finite and > 0, an unknown kind, or a yield range whose maximum is below the minimum.
 * A coupon value below the specified minimum is allowed here (it is a returned warning in `sizeFrame`).
 */
export function computeExpectedYield(basis: CapacityBasis, fyscMinKsi: number): ExpectedYield {
  const fyMin = requirePositive(fyscMinKsi, 'fyscMinKsi', 'the specified minimum core yield stress in ksi')
  switch (basis?.kind) {
    case 'ry':
      return { expectedYieldKsi: requirePositive(basis.ry, 'capacityBasis.ry', 'Ry from AISC 341 Table A3.1') * fyMin, ryApplied: basis.ry }
    case 'yieldRange': {
      const fyMax = requirePositive(basis.fyscMaxKsi, 'capacityBasis.fyscMax', 'the upper bound of the ordered core yield window')
      if (fyMax < fyMin) {
        throw new EngineeringInputError('capacityBasis.fyscMax', mustBe(`at least the minimum yield ${fyMin}`, fyMax, 'the upper bound of the yield window'))
      }
      return { expectedYieldKsi: fyMax, ryApplied: 1 }
    }
    case 'coupon':
      return { expectedYieldKsi: requirePositive(basis.fyscKsi, 'capacityBasis.fysc', 'the measured coupon yield stress'), ryApplied: 1 }
    default:
      throw new EngineeringInputError('capacityBasis.kind', `must be one of ${CAPACITY_BASIS_KINDS.join(', ')}.`)
  }
}

/** Product forms of AISC 341 Table A3.1 rows. */
export type ProductForm = 'shape' | 'hss' | 'pipe' | 'plate' | 'sheet'

/** One row of AISC 341 Table A3.1 (Ry and Rt). */
export interface RyRtRow {
  productForm: ProductForm
  /** ASTM designation as printed, e.g. 'A572 Gr 50'. */
  grade: string
  ry: number
  rt: number
  /** Status tag of the engineering reference: 'M' from memory, 'P' partly verified. */
  status: 'M' | 'P'
  source: string
  note?: string
}

const A31 = 'AISC 341-10/-16 Table A3.1'

/**
 * Ry and Rt rows of AISC 341 Table A3.1 as recalled for the 2010/2016 editions
 * (engineering reference §3, all from memory [M]; shape rows partly corroborated [P] by an open-source
 * library). Plate rows are the ones that matter for BRB cores. Have someone with the standard sign
 * these off, and check the 2022 table, before they become product defaults.
 */
export const RY_RT_TABLE: readonly RyRtRow[] = Object.freeze([
  { productForm: 'shape', grade: 'A36', ry: 1.5, rt: 1.2, status: 'P', source: A31 },
  { productForm: 'shape', grade: 'A1043 Gr 36', ry: 1.3, rt: 1.1, status: 'M', source: A31 },
  { productForm: 'shape', grade: 'A1043 Gr 50', ry: 1.2, rt: 1.1, status: 'M', source: A31 },
  { productForm: 'shape', grade: 'A572 Gr 50', ry: 1.1, rt: 1.1, status: 'P', source: A31 },
  { productForm: 'shape', grade: 'A572 Gr 55', ry: 1.1, rt: 1.1, status: 'P', source: A31 },
  { productForm: 'shape', grade: 'A588', ry: 1.1, rt: 1.1, status: 'M', source: A31 },
  { productForm: 'shape', grade: 'A992', ry: 1.1, rt: 1.1, status: 'P', source: A31 },
  { productForm: 'shape', grade: 'A913 Gr 50', ry: 1.1, rt: 1.1, status: 'M', source: A31 },
  { productForm: 'shape', grade: 'A913 Gr 60', ry: 1.1, rt: 1.1, status: 'M', source: A31 },
  { productForm: 'shape', grade: 'A913 Gr 65', ry: 1.1, rt: 1.1, status: 'M', source: A31 },
  { productForm: 'shape', grade: 'A913 Gr 70', ry: 1.1, rt: 1.1, status: 'M', source: A31 },
  { productForm: 'shape', grade: 'A529 Gr 50', ry: 1.2, rt: 1.2, status: 'P', source: A31 },
  { productForm: 'shape', grade: 'A529 Gr 55', ry: 1.1, rt: 1.2, status: 'M', source: A31 },
  { productForm: 'hss', grade: 'A500 Gr B', ry: 1.4, rt: 1.3, status: 'P', source: A31 },
  { productForm: 'hss', grade: 'A500 Gr C', ry: 1.3, rt: 1.2, status: 'M', source: A31 },
  { productForm: 'hss', grade: 'A501', ry: 1.4, rt: 1.3, status: 'M', source: A31 },
  { productForm: 'hss', grade: 'A1085', ry: 1.25, rt: 1.15, status: 'M', source: A31 },
  { productForm: 'pipe', grade: 'A53', ry: 1.6, rt: 1.2, status: 'M', source: A31, note: 'Unsettled: another source gives Ry = 1.5.' },
  { productForm: 'plate', grade: 'A36', ry: 1.3, rt: 1.2, status: 'M', source: A31 },
  { productForm: 'plate', grade: 'A1043 Gr 36', ry: 1.3, rt: 1.1, status: 'M', source: A31 },
  { productForm: 'plate', grade: 'A1043 Gr 50', ry: 1.2, rt: 1.1, status: 'M', source: A31 },
  { productForm: 'plate', grade: 'A572 Gr 42', ry: 1.3, rt: 1.0, status: 'M', source: A31 },
  { productForm: 'plate', grade: 'A572 Gr 50', ry: 1.1, rt: 1.2, status: 'M', source: A31 },
  { productForm: 'plate', grade: 'A572 Gr 55', ry: 1.1, rt: 1.2, status: 'M', source: A31 },
  { productForm: 'plate', grade: 'A588', ry: 1.1, rt: 1.2, status: 'M', source: A31 },
  { productForm: 'sheet', grade: 'A1011 HSLAS Gr 55', ry: 1.1, rt: 1.1, status: 'M', source: A31 },
].map((row) => Object.freeze(row as RyRtRow)))

/** Normalise an ASTM grade for lookup: case, spaces, "Gr." / "Grade" spelling. */
const normaliseGrade = (grade: string): string =>
  grade.toUpperCase().replace(/GRADE|GR\.?/g, 'GR').replace(/\s+/g, ' ').trim()

/**
 * Look up the Table A3.1 row for a grade and product form, e.g. `findRyRt('A36', 'plate')` → Ry 1.3.
 * Matching ignores case and spacing and accepts "Gr", "Gr." or "Grade". Returns `undefined`
 * when the table has no such row (a returned outcome, not an error).
 */
export function findRyRt(grade: string, productForm: ProductForm, table: readonly RyRtRow[] = RY_RT_TABLE): RyRtRow | undefined {
  if (typeof grade !== 'string') return undefined
  const wanted = normaliseGrade(grade)
  return table.find((row) => row.productForm === productForm && normaliseGrade(row.grade) === wanted)
}

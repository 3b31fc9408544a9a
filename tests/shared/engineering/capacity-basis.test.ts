import { describe, expect, it } from 'vitest'
import { RY_RT_TABLE, computeExpectedYield, findRyRt, type CapacityBasis, type ProductForm } from '@shared/engineering'

describe('computeExpectedYield(basis, fyscMinKsi)', () => {
  it.each([
    // AISC 341 F4.2a (from memory): expected yield = Ry × Fysc,min
    [{ kind: 'ry', ry: 1.3 }, 36, 46.8, 1.3], // engineering reference §3 [D]: A36 plate 1.3 × 36 = 46.8 ksi
    [{ kind: 'ry', ry: 1.2 }, 40, 48, 1.2], // derived: 1.2 × 40
    // engineering reference §1.6 (common practice): upper bound of the yield window, Ry = 1.0
    [{ kind: 'yieldRange', fyscMaxKsi: 46 }, 38, 46, 1],
    // AISC 341 F4.2a Ry exception (from memory): coupon value, Ry = 1.0 — never Ry × coupon
    [{ kind: 'coupon', fyscKsi: 45 }, 40, 45, 1],
  ] as const)('%o with Fysc,min = %d ksi → %d ksi', (basis, fyMin, expected, ry) => {
    const result = computeExpectedYield(basis as CapacityBasis, fyMin)
    expect(result.expectedYieldKsi).toBeCloseTo(expected, 9) // AISC 341 F4.2a (from memory); arithmetic in the row comment
    expect(result.ryApplied).toBe(ry) // AISC 341 F4.2a Ry exception (from memory): 1.0 unless basis is ry
  })

  it.each([
    [{ kind: 'ry', ry: 0 }, 'capacityBasis.ry'],
    [{ kind: 'ry', ry: -1.1 }, 'capacityBasis.ry'],
    [{ kind: 'yieldRange', fyscMaxKsi: 36 }, 'capacityBasis.fyscMax'], // derived: window max below the minimum 38
    [{ kind: 'coupon', fyscKsi: Number.NaN }, 'capacityBasis.fysc'],
    [{ kind: 'nominal' }, 'capacityBasis.kind'],
  ])('throws EngineeringInputError for %o', (basis, field) => {
    expect(() => computeExpectedYield(basis as unknown as CapacityBasis, 38)).toThrowError(expect.objectContaining({ field })) // derived: invalid input
  })
})

describe('RY_RT_TABLE and findRyRt(grade, productForm)', () => {
  // Every row: AISC 341-10/-16 Table A3.1, from memory (engineering reference §3 [M]).
  it.each([
    ['A36', 'plate', 1.3, 1.2], // from memory
    ['A1043 Gr 36', 'plate', 1.3, 1.1], // from memory
    ['A1043 Gr 50', 'plate', 1.2, 1.1], // from memory
    ['A572 Gr 42', 'plate', 1.3, 1.0], // from memory
    ['A572 Gr 50', 'plate', 1.1, 1.2], // from memory
    ['A572 Gr 55', 'plate', 1.1, 1.2], // from memory
    ['A588', 'plate', 1.1, 1.2], // from memory
    ['A36', 'shape', 1.5, 1.2], // from memory; partly verified by an open-source library
    ['A992', 'shape', 1.1, 1.1], // from memory; partly verified
    ['A572 Gr 50', 'shape', 1.1, 1.1], // from memory; partly verified
    ['A500 Gr B', 'hss', 1.4, 1.3], // from memory; partly verified
    ['A500 Gr C', 'hss', 1.3, 1.2], // from memory
    ['A1085', 'hss', 1.25, 1.15], // from memory
    ['A53', 'pipe', 1.6, 1.2], // from memory; unsettled (another source gives 1.5)
  ] as const)('findRyRt(%s, %s) → Ry %d, Rt %d', (grade, form, ry, rt) => {
    const row = findRyRt(grade, form as ProductForm)
    expect(row?.ry).toBe(ry) // AISC 341 Table A3.1, from memory
    expect(row?.rt).toBe(rt) // AISC 341 Table A3.1, from memory
  })

  it('matches grades regardless of case, spacing and "Gr." / "Grade" spelling', () => {
    expect(findRyRt('a572 grade 50', 'plate')?.ry).toBe(1.1) // from memory (Table A3.1)
    expect(findRyRt('A1043  Gr. 36', 'plate')?.ry).toBe(1.3) // from memory (Table A3.1)
  })

  it('returns undefined for a row the table does not have', () => {
    expect(findRyRt('A709 Gr 50', 'plate')).toBeUndefined() // derived: not in the recalled table
    expect(findRyRt('A992', 'plate')).toBeUndefined() // derived: A992 is a shape grade
  })

  it('tags every row with a status and source', () => {
    for (const row of RY_RT_TABLE) {
      expect(['M', 'P']).toContain(row.status) // engineering reference §3: all from memory or partly verified
      expect(row.source).toMatch(/Table A3\.1/) // engineering reference §3: AISC 341 Table A3.1
    }
  })
})

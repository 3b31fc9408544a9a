import { describe, expect, it } from 'vitest'
import {
  DEFAULT_CORE_STEPS, computeDemandCapacityRatio, computeRequiredCoreArea, findStepBandIssues, roundUpCoreArea, validateCoreSteps,
} from '@shared/engineering'

describe('computeRequiredCoreArea({demandKip, fyscKsi, method})', () => {
  it.each([
    // LRFD Asc,req = Pu / (0.90 Fysc), AISC 341 F4.5b (from memory), engineering reference §1.1 [D]
    [180, 40, 'lrfd', 5], // derived: 180 / (0.9 × 40) = 180 / 36 = 5.0
    [120, 40, 'lrfd', 3.333333], // derived: 120 / 36
    [180, 38, 'lrfd', 5.263158], // derived: 180 / 34.2
    [-180, 40, 'lrfd', 5], // derived: design uses |Pu|
    // ASD Asc,req = 1.67 Pa / Fysc, AISC 341 F4.5b (from memory)
    [100, 38, 'asd', 4.394737], // derived: 167 / 38
    [180, 40, 'asd', 7.515], // derived: 1.67 × 180 / 40 = 300.6 / 40
  ] as const)('Pu=%d kip, Fysc=%d ksi, %s → %d in²', (demandKip, fyscKsi, method, expected) => {
    expect(computeRequiredCoreArea({ demandKip, fyscKsi, method })).toBeCloseTo(expected, 6) // AISC 341 F4.5b (from memory); arithmetic in the row comment
  })

  it.each([
    [{ demandKip: 0, fyscKsi: 38 }, 'demandKip'],
    [{ demandKip: 100, fyscKsi: 0 }, 'fyscKsi'],
    [{ demandKip: 100, fyscKsi: Number.NaN }, 'fyscKsi'],
  ])('throws EngineeringInputError for %o', (options, field) => {
    expect(() => computeRequiredCoreArea({ ...options, method: 'lrfd' })).toThrowError(expect.objectContaining({ field })) // derived: invalid input
  })
})

describe('computeDemandCapacityRatio({demandKip, coreAreaIn2, fyscKsi, method})', () => {
  it.each([
    [180, 5, 40, 'lrfd', 1], // AISC 341 F4.5b (from memory): 180 / (0.9 × 40 × 5) = 180 / 180
    [120, 3.5, 40, 'lrfd', 0.952381], // derived: 120 / 126
    [100, 4.5, 38, 'asd', 0.976608], // derived: 1.67 × 100 / (38 × 4.5) = 167 / 171
    [200, 4, 38, 'lrfd', 1.461988], // derived: 200 / 136.8 — over 1 is a returned value, not an error (STYLE 4.8)
  ] as const)('Pu=%d, Asc=%d, Fysc=%d, %s → %d', (demandKip, coreAreaIn2, fyscKsi, method, expected) => {
    expect(computeDemandCapacityRatio({ demandKip, coreAreaIn2, fyscKsi, method })).toBeCloseTo(expected, 6) // AISC 341 F4.5b (from memory); arithmetic in the row comment
  })
})

describe('roundUpCoreArea(requiredIn2) with DEFAULT_CORE_STEPS', () => {
  // All rows: the default increment table is common practice, no source
  // (0.25 in² to 5, 0.5 in² above 5 up to 10, 1.0 in² above 10).
  it.each([
    [0.01, 0.25],
    [0.25, 0.25],
    [0.2500000001, 0.25], // within 1e-9 relative of 0.25: stays
    [0.26, 0.5],
    [4.49, 4.5],
    [4.5, 4.5],
    [4.5000000001, 4.5], // engineering reference §6.2 [C]: does not jump to 4.75
    [4.501, 4.75],
    [4.75, 4.75],
    [4.76, 5],
    [4.99, 5],
    [5, 5], // boundary: top of the 0.25 band
    [5.0000000001, 5], // within tolerance of 5: stays
    [5.001, 5.5], // first size of the 0.5 band
    [5.263158, 5.5],
    [5.5, 5.5],
    [5.51, 6],
    [9.6, 10],
    [10, 10], // boundary: top of the 0.5 band
    [10.0000000001, 10],
    [10.01, 11], // first size of the 1.0 band
    [11, 11],
    [11.2, 12],
    [23.5, 24],
  ])('roundUpCoreArea(%d) = %d', (required, expected) => {
    expect(roundUpCoreArea(required)).toBe(expected) // common practice, no source
  })

  it('never rounds down beyond the tolerance', () => {
    expect(roundUpCoreArea(4.50001)).toBe(4.75) // common practice, no source: 4.50001 is 2.2e-6 above 4.5 (> 1e-9)
  })

  it.each([0, -1, Number.NaN, Number.POSITIVE_INFINITY])('throws for requiredIn2 = %d', (required) => {
    expect(() => roundUpCoreArea(required)).toThrowError(expect.objectContaining({ field: 'requiredIn2' })) // derived: invalid input
  })
})

describe('roundUpCoreArea(requiredIn2, {steps}) with a firm table', () => {
  const steps = [
    { upToIn2: 2, stepIn2: 0.1 },
    { upToIn2: null, stepIn2: 0.5 },
  ]
  it.each([
    [0.3, 0.3], // derived: 3 × 0.1 tidied to 0.3, not 0.30000000000000004
    [0.25, 0.3],
    [1.99, 2],
    [2.05, 2.5],
    [7.2, 7.5],
  ])('roundUpCoreArea(%d) = %d', (required, expected) => {
    expect(roundUpCoreArea(required, { steps })).toBe(expected) // invented firm table, no source
  })
})

describe('validateCoreSteps(steps) and findStepBandIssues(bands, field)', () => {
  it('accepts DEFAULT_CORE_STEPS', () => {
    expect(() => validateCoreSteps(DEFAULT_CORE_STEPS)).not.toThrow() // common practice, no source
  })
  it.each([
    [[], 'coreSteps'],
    [[{ upTo: 5, step: 0.25 }], 'coreSteps.0.upTo'], // last band must be unbounded
    [[{ upTo: null, step: 0.25 }, { upTo: null, step: 1 }], 'coreSteps.0.upTo'], // null only on the last band
    [[{ upTo: 5, step: 0.25 }, { upTo: 4, step: 0.5 }, { upTo: null, step: 1 }], 'coreSteps.1.upTo'], // bounds must increase
    [[{ upTo: 5, step: 0 }, { upTo: null, step: 1 }], 'coreSteps.0.step'], // steps must be > 0
    [[{ upTo: 5, step: 0.3 }, { upTo: null, step: 1 }], 'coreSteps.0.step'], // 5 / 0.3 is not whole: sizes would not line up
  ])('reports %j at %s', (bands, field) => {
    const issues = findStepBandIssues(bands as { upTo: number | null; step: number }[], 'coreSteps')
    expect(issues.map((i) => i.field)).toContain(field) // derived: table rules
  })
  it('validateCoreSteps names the in² fields', () => {
    expect(() => validateCoreSteps([{ upToIn2: 5, stepIn2: -1 }, { upToIn2: null, stepIn2: 1 }])).toThrowError( // derived: table rules
      expect.objectContaining({ field: 'coreSteps.0.stepIn2' }),
    ) // derived: table rules
  })
})

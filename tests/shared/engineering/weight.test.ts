import { describe, expect, it } from 'vitest'
import {
  DEFAULT_BRACE_TO_CORE_WEIGHT_RATIO, STEEL_DENSITY_LB_PER_FT3, computeCoreWeight, computeWeightPerFoot, estimateBraceWeight,
} from '@shared/engineering'

describe('STEEL_DENSITY_LB_PER_FT3 and computeWeightPerFoot(areaIn2)', () => {
  it('is 490 lb/ft³', () => {
    expect(STEEL_DENSITY_LB_PER_FT3).toBe(490) // AISC Manual unit weight of steel, from memory
  })

  // AISC Shapes Database v15.0 (engineering reference §4 [V]): designation, nominal lb/ft, A in².
  // Area × 490/144 vs nominal weight within 1.5 % (both are rounded; engineering reference §4 test guidance).
  it.each([
    ['W8X31', 31, 9.13],
    ['W10X33', 33, 9.71],
    ['W12X50', 50, 14.6],
    ['W14X22', 22, 6.49],
    ['W14X90', 90, 26.5],
    ['W16X26', 26, 7.68],
    ['W18X35', 35, 10.3],
    ['W21X44', 44, 13.0],
    ['W24X68', 68, 20.1],
  ])('%s: 490 × A / 144 matches %d lb/ft within 1.5 %%', (_designation, nominal, area) => {
    const w = computeWeightPerFoot(area) // AISC Shapes Database v15.0
    expect(Math.abs(w - nominal) / nominal).toBeLessThan(0.015) // AISC Shapes Database v15.0, engineering reference §4 tolerance
  })

  it('a 1 in × 12 in plate weighs 40.83 lb/ft', () => {
    expect(computeWeightPerFoot(12)).toBeCloseTo(40.8333, 4) // derived: 490 × 12 / 144 (engineering reference §4 [D])
  })
})

describe('computeCoreWeight({coreAreaIn2, yieldLengthIn})', () => {
  it('is 490 Asc Ly / 1728', () => {
    // derived: 490 × 5 × 216 / 1728 = 529200 / 1728 = 306.25 lb
    expect(computeCoreWeight({ coreAreaIn2: 5, yieldLengthIn: 216 })).toBeCloseTo(306.25, 9)
  })
})

describe('estimateBraceWeight(coreAreaIn2, lwpIn, history?)', () => {
  it('uses the labelled default ratio without history', () => {
    // common practice, no source: 2.5 × 490 × 5 × 360 / 1728 = 2205000 / 1728 = 1276.04 lb
    const e = estimateBraceWeight(5, 360)
    expect(DEFAULT_BRACE_TO_CORE_WEIGHT_RATIO).toBe(2.5) // common practice, no source (placeholder)
    expect(e.weightLb).toBeCloseTo(1276.0417, 4) // common practice, no source (placeholder ratio)
    expect(e.basis).toBe('default') // contract: labelled default
    expect(e.label).toMatch(/placeholder/) // contract: labelled default
  })
  it("uses the firm's fitted ratio when given", () => {
    // derived: 3.1 × 490 × 5 × 360 / 1728 = 2734200 / 1728 = 1582.29 lb
    const e = estimateBraceWeight(5, 360, { ratio: 3.1, sampleCount: 42 })
    expect(e.weightLb).toBeCloseTo(1582.2917, 4) // derived: 3.1 × 490 × 5 × 360 / 1728
    expect(e.basis).toBe('history') // contract: labelled history basis
    expect(e.label).toMatch(/42 braces/) // contract: label reports n
  })
  it.each([
    [{ ratio: 0.8, sampleCount: 10 }, 'history.ratio'],
    [{ ratio: 3, sampleCount: 0 }, 'history.sampleCount'],
  ])('throws for history %o', (history, field) => {
    expect(() => estimateBraceWeight(5, 360, history)).toThrowError(expect.objectContaining({ field })) // derived: a brace weighs at least its core
  })
})

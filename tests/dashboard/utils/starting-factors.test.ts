import { describe, expect, it } from 'vitest'
import type { StartingFactors } from '@shared/schemas/calibration'
import { describeStartingQuery, editionYear, ordinal, roundFactor, startingFactorsPrefill, suggestionsByQuantity } from '../../../dashboard/src/utils/starting-factors'

const suggestion = (quantity: 'beta' | 'omega' | 'overstrength' | 'stiffness', suggested: number, basis = 'b', groupSize = 30) => ({
  quantity,
  basis,
  suggested,
  groupValue: suggested,
  firmValue: suggested,
  groupSize,
  shrunk: false,
  weight: 1,
  habit: null,
  underestimateRateSuggested: 0.1,
  underestimateRateHabit: null,
  meanConservatismSuggested: 1.02,
  meanConservatismHabit: null,
  rule: 'r',
})

const result: StartingFactors = {
  quantile: 0.9,
  minGroupSize: 10,
  habitYears: 3,
  suggestions: [suggestion('beta', 1.13468), suggestion('omega', 1.4), suggestion('overstrength', 47.3), suggestion('stiffness', 1.3999)],
  capacityBasis: { kind: 'yieldRange', fyscMax: 47.3 },
  backtest: { beta: [], omega: [], overstrength: [], stiffness: [] },
  cautions: [],
}

const chosenOf = (r: StartingFactors) => Object.fromEntries(suggestionsByQuantity(r).flatMap(g => (g.chosen ? [[g.quantity, g.chosen]] : [])))

describe('suggestionsByQuantity', () => {
  it('groups the per-basis suggestions by quantity and starts from the largest group, then the newer edition', () => {
    const r = {
      ...result,
      suggestions: [
        suggestion('beta', 1.17, '2.0×Δbm · AISC 341-22', 8),
        suggestion('beta', 1.19, '2.0×Δbm · AISC 341-16', 81),
        suggestion('beta', 1.18, '2.0×Δbm · AISC 341-10', 81),
        suggestion('omega', 1.5, 'x', 3),
      ],
    }
    const g = suggestionsByQuantity(r)
    expect(g.map(x => x.quantity)).toEqual(['beta', 'omega', 'overstrength', 'stiffness'])
    // n 81 twice: 341-16 is newer than 341-10; then the n = 8 one.
    expect(g[0]!.options.map(o => o.suggested)).toEqual([1.19, 1.18, 1.17])
    expect(g[0]!.chosen?.suggested).toBe(1.19)
    expect(g[2]!.chosen).toBeUndefined()
  })
  it('reads the AISC 341 edition from a basis label', () => {
    expect(editionYear('2.0×Δbm · AISC 341-05')).toBe(2005)
    expect(editionYear('coupon Fysc')).toBe(0)
  })
})

describe('startingFactorsPrefill', () => {
  it('carries β, ω, the stiffness factor and the yield-range Fysc,max (ksi, so US units)', () => {
    const p = startingFactorsPrefill(result, chosenOf(result), { supplier: 'SUP-A', quantile: 0.9 }, { supplierName: 'Alpha Braces' })
    expect(p.units).toBe('us')
    expect(p.basis).toEqual({ basisKind: 'yieldRange', fyscMax: 47.3, beta: 1.135, omega: 1.4, stiffnessFactor: 1.4 })
    expect(p.what).toBe('Starting factors')
    expect(p.source).toBe('the 90th percentile of Alpha Braces’s braces')
  })
  it('leaves out what was not suggested, and falls back on the API’s capacity basis for Fysc,max', () => {
    const r = { ...result, suggestions: [suggestion('omega', 1.3)], capacityBasis: { kind: 'yieldRange' as const, fyscMax: 45.1 } }
    const p = startingFactorsPrefill(r, chosenOf(r), { quantile: 0.9 })
    expect(p.basis).toEqual({ basisKind: 'yieldRange', fyscMax: 45.1, omega: 1.3 })
  })
})

describe('wording', () => {
  it('names the suppliers and configuration drawn from', () => {
    expect(describeStartingQuery(0.75, {})).toBe('the 75th percentile of all suppliers’ braces')
    expect(describeStartingQuery(0.5, { configuration: 'v' }, { configurationName: 'V' })).toBe('the 50th percentile of all suppliers’ V braces')
  })
  it('writes English ordinals', () => {
    expect([1, 2, 3, 4, 11, 12, 13, 21, 52, 93, 99].map(ordinal)).toEqual(['1st', '2nd', '3rd', '4th', '11th', '12th', '13th', '21st', '52nd', '93rd', '99th'])
  })
  it('rounds a factor to three decimals', () => {
    expect(roundFactor(1.13468)).toBe(1.135)
    expect(roundFactor(0.9995)).toBe(1)
  })
})

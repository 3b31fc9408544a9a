import { describe, expect, it } from 'vitest'
import { expectedYieldKsi, pairValue, type PairSnapshot } from '@shared/calibration'

const base: PairSnapshot = { coreAreaIn2: 6.5, fyscKsi: 38, fyscBasis: 'yield_range', fyscMaxKsi: 46, ry: null, beta: 1.1, omega: 1.4, factorDriftMultiple: null, stiffnessFactor: 1.4, tmaxKip: 418.6, cmaxKip: 460.46 }
const coupon: PairSnapshot = { coreAreaIn2: 6.5, fyscKsi: 42.5, fyscBasis: 'coupon', fyscMaxKsi: null, ry: null, beta: 1.12, omega: 1.45, factorDriftMultiple: 2, stiffnessFactor: 1.35, tmaxKip: 400.5625, cmaxKip: 448.63 }

describe('expected core yield stress', () => {
  it('takes Ry·Fysc, the yield-range upper bound, or the measured value without Ry', () => {
    // AISC 341-16 F4.2a (from memory): expected yield Ry·Fysc; a coupon-tested Fysc is used with Ry = 1.0.
    expect(expectedYieldKsi({ ...base, fyscBasis: 'specified_min', fyscKsi: 36, ry: 1.3 })).toBeCloseTo(46.8, 12) // 1.3 × 36 = 46.8 ksi
    expect(expectedYieldKsi(base)).toBe(46)
    expect(expectedYieldKsi({ ...coupon, ry: 1.1 })).toBe(42.5) // no Ry on a measured value
    expect(expectedYieldKsi({ ...base, fyscBasis: 'mill_cert', fyscKsi: 44 })).toBe(44)
    expect(expectedYieldKsi({ ...base, fyscBasis: 'specified_min', ry: null })).toBeNull()
  })
})

describe('pair values and bases', () => {
  const pair = { assumed: base, final: coupon, codeEdition: '341-16' }

  it('β and ω carry the final deformation basis and the edition', () => {
    expect(pairValue(pair, 'beta')).toEqual({ assumed: 1.1, final: 1.12, basis: '2.0×Δbm · AISC 341-16' })
    expect(pairValue({ ...pair, final: { ...coupon, factorDriftMultiple: null } }, 'omega')?.basis).toBe('deformation basis not stated · AISC 341-16')
    expect(pairValue({ ...pair, codeEdition: null }, 'beta')?.basis).toBe('2.0×Δbm · AISC 341 edition not stated')
  })

  it('overstrength compares assumed basis → final basis', () => {
    expect(pairValue(pair, 'overstrength')).toEqual({ assumed: 46, final: 42.5, basis: 'yield-range upper bound → coupon Fysc · AISC 341-16' })
    const ry = pairValue({ ...pair, assumed: { ...base, fyscBasis: 'specified_min', fyscKsi: 36, ry: 1.3 }, codeEdition: '341-05' }, 'overstrength')
    expect(ry?.basis).toBe('Ry·Fysc (specified minimum) → coupon Fysc · AISC 341-05')
    expect(ry?.assumed).toBeCloseTo(46.8, 12)
  })

  it('Tmax and Cmax are the stored adjusted strengths; stiffness and core area are plain', () => {
    // AISC 341-16 F4.2a: Cmax = β·ω·Fysc,max·Asc = 1.1 · 1.4 · 46 · 6.5 = 460.46 kip (assumed); final 1.12 · 1.45 · 42.5 · 6.5 = 448.63 kip.
    expect(pairValue(pair, 'cmax')).toEqual({ assumed: 460.46, final: 448.63, basis: '2.0×Δbm · AISC 341-16' })
    expect(pairValue(pair, 'stiffness')).toEqual({ assumed: 1.4, final: 1.35, basis: 'AISC 341-16' })
    expect(pairValue(pair, 'coreArea')).toEqual({ assumed: 6.5, final: 6.5, basis: 'AISC 341-16' })
  })

  it('no value when a side is missing or not positive', () => {
    expect(pairValue({ ...pair, final: { ...coupon, beta: null } }, 'beta')).toBeNull()
    expect(pairValue({ ...pair, assumed: { ...base, stiffnessFactor: 0 } }, 'stiffness')).toBeNull()
  })
})

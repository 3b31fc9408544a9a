import { readFileSync } from 'node:fs'
import { describe as suite, expect, it } from 'vitest'
import { describe, histogramBins, quantileOf, summarizeRatios } from '@shared/calibration'

const michelso = readFileSync(new URL('../../fixtures/nist-strd/Michelso.dat', import.meta.url), 'utf8')
  .split('\n')
  .filter(l => l.trim() && !l.startsWith('#'))
  .map(Number)

suite('statistics path against NIST StRD', () => {
  it('Michelso: 100 observations, certified mean and sample standard deviation', () => {
    expect(michelso).toHaveLength(100) // NIST StRD Michelso: number of observations 100
    const d = describe(michelso)
    expect(d.mean).toBeCloseTo(299.8524, 10) // NIST StRD Michelso certified sample mean 299.852400000000
    expect(d.sd).toBeCloseTo(0.0790105478190518, 12) // NIST StRD Michelso certified sample standard deviation (n − 1)
  })

  it('the summary of a ratio sample reports the same certified mean', () => {
    // Michelso values / 300 as "ratios": the mean scales by 1/300 exactly (299.8524 / 300 = 0.99950800).
    const ratios = michelso.map(v => v / 300)
    const s = summarizeRatios(ratios, { group: 'g', basis: 'b', tolerance: 0.1, bins: histogramBins(Math.min(...ratios), Math.max(...ratios)) })
    expect(s.mean).toBeCloseTo(299.8524 / 300, 10) // NIST StRD Michelso certified mean, scaled
    expect(s.n).toBe(100)
    expect(s.histogram.reduce((a, b) => a + b.count, 0)).toBe(100)
  })
})

suite('quantile definition (type 7, linear interpolation; Hyndman & Fan 1996)', () => {
  it('matches a hand computation', () => {
    // Sorted 1, 2, 4, 7, 11 (n = 5). p = 0.9: h = (5 − 1)·0.9 = 3.6 → x[3] + 0.6·(x[4] − x[3]) = 7 + 0.6·4 = 9.4.
    expect(quantileOf([11, 4, 1, 7, 2], 0.9)).toBeCloseTo(9.4, 12)
    // p = 0.25: h = 1 → x[1] = 2; p = 0.5: h = 2 → 4.
    expect(quantileOf([11, 4, 1, 7, 2], 0.25)).toBe(2)
    expect(quantileOf([11, 4, 1, 7, 2], 0.5)).toBe(4)
    // Four values 1, 2, 3, 4: median h = 1.5 → 2.5 (same as R quantile(type = 7) and numpy percentile default).
    expect(quantileOf([4, 3, 2, 1], 0.5)).toBe(2.5)
  })
})

suite('ratio summary', () => {
  it('quartiles, Tukey whiskers, underestimate and outside-band rates on a hand-made sample', () => {
    // Ratios sorted: 0.85, 0.95, 1.00, 1.02, 1.05, 1.08, 1.50 (n = 7).
    // Q1: h = 6·0.25 = 1.5 → 0.95 + 0.5·0.05 = 0.975; median h = 3 → 1.02; Q3 h = 4.5 → 1.05 + 0.5·0.03 = 1.065.
    // IQR = 0.09; fences 0.975 − 0.135 = 0.84 and 1.065 + 0.135 = 1.20 → whiskers 0.85 and 1.08 (1.50 is an outlier).
    // Underestimates (ratio < 1): 0.85, 0.95 → 2/7. Outside ±10 %: 0.85 and 1.50 → 2/7.
    const r = [1.05, 0.85, 1.5, 1.0, 1.02, 0.95, 1.08]
    const s = summarizeRatios(r, { group: 'SUP-A', basis: '2.0×Δbm · AISC 341-16', tolerance: 0.1, bins: histogramBins(0.85, 1.5) })
    expect(s.q1).toBeCloseTo(0.975, 12)
    expect(s.median).toBeCloseTo(1.02, 12)
    expect(s.q3).toBeCloseTo(1.065, 12)
    expect(s.whiskerLow).toBe(0.85)
    expect(s.whiskerHigh).toBe(1.08)
    expect(s.min).toBe(0.85)
    expect(s.max).toBe(1.5)
    expect(s.mean).toBeCloseTo(7.45 / 7, 12) // sum = 7.45
    expect(s.underestimateRate).toBeCloseTo(2 / 7, 12)
    expect(s.outsideBandRate).toBeCloseTo(2 / 7, 12)
    // Bins: span 0.65 / 20 → the first nice width with ≤ 20 bins is 0.05; edges from 0.85, 14 bins to 1.50.
    expect(s.histogram[0]).toEqual({ x0: 0.85, x1: 0.9, count: 1 })
    expect(s.histogram).toHaveLength(14)
    expect(s.histogram.at(-1)).toEqual({ x0: 1.5, x1: 1.55, count: 1 })
  })

  it('a value exactly on the band edge is inside it', () => {
    const s = summarizeRatios([1.1, 0.9, 1], { group: 'g', basis: 'b', tolerance: 0.1, bins: histogramBins(0.9, 1.1) })
    expect(s.outsideBandRate).toBe(0)
  })
})

import { describe, expect, it } from 'vitest'
import { percentileBand } from '@shared/benchmarks/percentiles'

// Quantile definition: Hyndman & Fan (1996) type 7 (R `quantile` default, numpy.percentile default):
// sorted x₀…x₍ₙ₋₁₎, h = (n − 1)·p, Q = x⌊h⌋ + (h − ⌊h⌋)(x⌊h⌋₊₁ − x⌊h⌋). Expected values worked by hand.
describe('percentileBand', () => {
  it('gives P10/P25/P50/P75/P90 of 1…10 by linear interpolation (type 7)', () => {
    // n = 10, h = 9p: P10 h=0.9 → 1 + 0.9 = 1.9; P25 h=2.25 → 3.25; P50 h=4.5 → 5.5; P75 h=6.75 → 7.75; P90 h=8.1 → 9.1
    const b = percentileBand([10, 9, 8, 7, 6, 5, 4, 3, 2, 1])!
    expect(b.n).toBe(10)
    expect(b.p10).toBeCloseTo(1.9, 12)
    expect(b.p25).toBeCloseTo(3.25, 12)
    expect(b.p50).toBeCloseTo(5.5, 12)
    expect(b.p75).toBeCloseTo(7.75, 12)
    expect(b.p90).toBeCloseTo(9.1, 12)
  })

  it('drops missing and non-finite values before ranking', () => {
    // [10, 20, 30, 40], h = 3p: P10 h=0.3 → 13; P25 h=0.75 → 17.5 (R: quantile(c(10,20,30,40), .25) = 17.5, from memory);
    // P50 h=1.5 → 25; P75 h=2.25 → 32.5; P90 h=2.7 → 37
    const b = percentileBand([40, 10, null, 30, Number.NaN, 20, undefined, Number.POSITIVE_INFINITY])!
    expect(b).toEqual({ n: 4, p10: expect.closeTo(13, 10), p25: expect.closeTo(17.5, 10), p50: expect.closeTo(25, 10), p75: expect.closeTo(32.5, 10), p90: expect.closeTo(37, 10) })
  })

  it('takes a single value for every percentile, and null for no value', () => {
    expect(percentileBand([4.2])).toEqual({ n: 1, p10: 4.2, p25: 4.2, p50: 4.2, p75: 4.2, p90: 4.2 })
    expect(percentileBand([null, Number.NaN])).toBeNull()
    expect(percentileBand([])).toBeNull()
  })
})

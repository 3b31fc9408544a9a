import { describe, expect, it } from 'vitest'
import type { RatioSummary } from '@shared/schemas/calibration'
import { createDistribution, orderRows, ratioDomain } from '../../../dashboard/src/charts/ratio-distribution'

function summary(group: string, basis: string, over: Partial<RatioSummary> = {}): RatioSummary {
  return {
    group,
    basis,
    n: 20,
    min: 0.8,
    q1: 0.95,
    median: 1.02,
    q3: 1.1,
    max: 1.4,
    mean: 1.03,
    whiskerLow: 0.8,
    whiskerHigh: 1.3,
    underestimateRate: 0.25,
    outsideBandRate: 0.3,
    histogram: [
      { x0: 0.8, x1: 1.0, count: 6 },
      { x0: 1.0, x1: 1.2, count: 12 },
      { x0: 1.2, x1: 1.4, count: 2 },
    ],
    ...over,
  }
}

describe('ratioDomain', () => {
  it('covers the extremes, the histogram and the band, padded 4 %', () => {
    // lo = min(0.9, 0.8) = 0.8, hi = max(1.1, 1.4) = 1.4; pad = 0.6 × 0.04 = 0.024
    const [lo, hi] = ratioDomain([summary('A', 'x')], 0.1)
    expect(lo).toBeCloseTo(0.776, 9)
    expect(hi).toBeCloseTo(1.424, 9)
    // With nothing but the band: [0.9, 1.1] padded 0.008
    const [l2, h2] = ratioDomain([], 0.1)
    expect(l2).toBeCloseTo(0.892, 9)
    expect(h2).toBeCloseTo(1.108, 9)
  })
})

describe('createDistribution', () => {
  const rows = [summary('A', 'x'), summary('B', 'x', { min: 0.9, whiskerLow: 0.9, max: 1.2, whiskerHigh: 1.2 })]
  const geo = createDistribution({ rows, tolerance: 0.1, width: 500, rowHeight: 60 })

  it('puts the box edges, the median and the whiskers at their ratios', () => {
    const a = geo.rows[0]!
    expect(geo.x.invert(a.q1)).toBeCloseTo(0.95, 9)
    expect(geo.x.invert(a.median)).toBeCloseTo(1.02, 9)
    expect(geo.x.invert(a.q3)).toBeCloseTo(1.1, 9)
    expect(geo.x.invert(a.whiskerLow)).toBeCloseTo(0.8, 9)
    expect(geo.x.invert(a.whiskerHigh)).toBeCloseTo(1.3, 9)
    expect(geo.x.invert(geo.one)).toBeCloseTo(1, 9)
    expect(geo.x.invert(geo.bandLeft)).toBeCloseTo(0.9, 9)
  })

  it('marks an extreme only when it lies beyond its whisker (Tukey outliers)', () => {
    expect(geo.rows[0]!.min).toBeUndefined() // min 0.8 = whisker
    expect(geo.x.invert(geo.rows[0]!.max!)).toBeCloseTo(1.4, 9) // max 1.4 > whisker 1.3
    expect(geo.rows[1]!.max).toBeUndefined()
  })

  it('scales histogram bars to the tallest bin of their row', () => {
    const bars = geo.rows[0]!.bars
    // Counts 6, 12, 2 → heights in the ratio 0.5 : 1 : 1/6
    expect(bars[0]!.height / bars[1]!.height).toBeCloseTo(0.5, 9)
    expect(bars[2]!.height / bars[1]!.height).toBeCloseTo(2 / 12, 9)
    // All bars of a row share its baseline.
    expect(bars[0]!.y + bars[0]!.height).toBeCloseTo(bars[1]!.y + bars[1]!.height, 9)
  })

  it('stacks the rows and grows the chart with them', () => {
    expect(geo.rows[1]!.top - geo.rows[0]!.top).toBe(60)
    // margins 8 + 36 and 2 rows × 60
    expect(geo.height).toBe(8 + 36 + 120)
  })
})

describe('orderRows', () => {
  it('orders by group then basis and names the groups on more than one basis', () => {
    const { rows, multiBasis } = orderRows([summary('B', 'AISC 341-16'), summary('A', 'yield: mill'), summary('B', 'AISC 341-10'), summary('A10', 'x'), summary('A2', 'x')])
    expect(rows.map(r => `${r.group}/${r.basis}`)).toEqual(['A/yield: mill', 'A2/x', 'A10/x', 'B/AISC 341-10', 'B/AISC 341-16'])
    expect(multiBasis).toEqual(['B'])
  })
})

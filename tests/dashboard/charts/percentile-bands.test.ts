import { describe, expect, it } from 'vitest'
import { bandGeometry, createBandScale, describeBands, type BandRow } from '../../../dashboard/src/charts/percentile-bands'

const band = (p10: number, p25: number, p50: number, p75: number, p90: number, n = 6) => ({ n, p10, p25, p50, p75, p90 })
const rows: BandRow[] = [
  { key: 'office', label: 'Office', band: band(1.25, 1.625, 2.25, 2.875, 3.25), suppressed: false },
  { key: 'school', label: 'School', band: band(2, 2.5, 3, 3.6, 4.4), suppressed: false },
  { key: 'parking', label: 'Parking', band: null, suppressed: true },
]

describe('createBandScale(rows, range)', () => {
  it('starts at 0 for positive figures and ends at the largest P90, rounded outward (d3 nice)', () => {
    const x = createBandScale(rows, [100, 500])
    // Domain [0, 4.4] → nice → [0, 4.5]: d3-array tickIncrement picks 1, 2 or 5 × 10^k for ~10 ticks:
    // 4.4 / 10 = 0.44 → 0.5, and 4.4 rounds up to the next multiple of 0.5.
    expect(x.domain()).toEqual([0, 4.5])
    expect(x(0)).toBe(100)
    expect(x(4.5)).toBe(500)
  })

  it('reaches below 0 for spreads that are negative, and ignores suppressed groups', () => {
    const spread: BandRow[] = [
      { key: 'a', label: 'A', band: band(-12, -5, 2, 8, 14), suppressed: false },
      { key: 'b', label: 'B', band: band(-80, -80, -80, -80, -80), suppressed: true },
    ]
    // [-12, 14]: 26 / 10 = 2.6 → step 2 (2.6 lies between √2 and √10 times 1), so -12 and 14 stay.
    expect(createBandScale(spread, [0, 100]).domain()).toEqual([-12, 14])
  })

  it('falls back to [0, 1] with nothing to draw', () => {
    expect(createBandScale([rows[2]!], [0, 10]).domain()).toEqual([0, 1])
  })
})

describe('bandGeometry(band, x)', () => {
  it('places the five percentiles on the scale', () => {
    const x = createBandScale(rows, [100, 500]) // domain [0, 4.5]: 400 / 4.5 px per unit
    const g = bandGeometry(rows[0]!.band!, x)
    const px = (v: number) => 100 + (v * 400) / 4.5
    const expected = { p10: px(1.25), p25: px(1.625), p50: px(2.25), p75: px(2.875), p90: px(3.25) }
    expect(expected.p50).toBeCloseTo(300, 9) // 2.25 is half of 4.5: the middle of the range
    for (const [k, v] of Object.entries(expected)) expect(g[k as keyof typeof g]).toBeCloseTo(v, 9)
  })
})

describe('describeBands(rows, unit, format)', () => {
  it('reads each group as a sentence, suppressed ones as “too few projects to publish”', () => {
    const text = describeBands(rows, 'lb/ft²', v => v.toFixed(2))
    expect(text).toBe(
      'Office (6 projects): median 2.25 lb/ft², P25–P75 1.63–2.88, P10–P90 1.25–3.25. ' +
        'School (6 projects): median 3.00 lb/ft², P25–P75 2.50–3.60, P10–P90 2.00–4.40. ' +
        'Parking: too few projects to publish.',
    )
  })
})

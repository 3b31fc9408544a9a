import { describe, expect, it } from 'vitest'
import { bandSide, circlesMarkup, createPointFinder, createScatter, sharedDomain } from '../../../dashboard/src/charts/calibration-scatter'

const colors = new Map([
  ['A', '#111111'],
  ['B', '#222222'],
])
// Hand-made braces: assumed / final for three groups (C has no colour → fallback).
const points = [
  { assumed: 100, final: 120, group: 'A' },
  { assumed: 150, final: 140, group: 'B' },
  { assumed: 200, final: 200, group: 'C' },
]

describe('createScatter', () => {
  const geo = createScatter({ points, tolerance: 0.1, colors, width: 460, height: 400, margin: { top: 0, right: 0, bottom: 60, left: 60 } })

  it('shares one domain on both axes, so final = assumed runs at 45°', () => {
    expect(geo.x.domain()).toEqual(geo.y.domain())
    const { x1, y1, x2, y2 } = geo.diagonal
    // Plot box 400 × 340 px: the same data step moves x by 400/Δ and y by 340/Δ; the slope in data units is 1.
    expect(geo.x.invert(x1)).toBeCloseTo(geo.y.invert(y1), 9)
    expect(geo.x.invert(x2)).toBeCloseTo(geo.y.invert(y2), 9)
  })

  it('places each point at (assumed, final) and colours it by group', () => {
    const a = geo.points[0]!
    expect(geo.x.invert(a.cx)).toBeCloseTo(100, 9)
    expect(geo.y.invert(a.cy)).toBeCloseTo(120, 9)
    expect(a.color).toBe('#111111')
    expect(geo.points[2]!.color).toBe('#6B7A82')
  })

  it('draws the band as the ratio band: final from assumed/1.1 to assumed/0.9', () => {
    // Path: M(d0, d0/1.1) L(d1, d1/1.1) L(d1, d1/0.9) L(d0, d0/0.9) Z, in pixels.
    const nums = geo.bandPath.match(/-?\d+(\.\d+)?(e-?\d+)?/g)!.map(Number)
    const [d0, d1] = geo.x.domain() as [number, number]
    expect(geo.y.invert(nums[1]!)).toBeCloseTo(d0 / 1.1, 6)
    expect(geo.y.invert(nums[3]!)).toBeCloseTo(d1 / 1.1, 6)
    expect(geo.y.invert(nums[5]!)).toBeCloseTo(d1 / 0.9, 6)
    expect(geo.y.invert(nums[7]!)).toBeCloseTo(d0 / 0.9, 6)
  })

  it('skips points that are not finite', () => {
    const g = createScatter({ points: [...points, { assumed: Number.NaN, final: 1, group: 'A' }], tolerance: 0.1, colors, width: 400, height: 300 })
    expect(g.points).toHaveLength(3)
  })
})

describe('sharedDomain', () => {
  it('pads 5 % of the span on each side, never below 0 for positive data', () => {
    // lo 100, hi 200 → span 100 → [95, 205]
    expect(sharedDomain(points)).toEqual([95, 205])
    // lo 1, hi 100: pad 4.95 would go negative → clamped at 0
    expect(sharedDomain([{ assumed: 1, final: 100, group: 'A' }])).toEqual([0, 104.95])
    expect(sharedDomain([])).toEqual([0, 1])
  })
})

describe('bandSide', () => {
  it('judges assumed / final against 1 ± tolerance', () => {
    expect(bandSide(100, 120, 0.1)).toBe('under') // 0.833 < 0.9
    expect(bandSide(100, 105, 0.1)).toBe('within') // 0.952
    expect(bandSide(120, 100, 0.1)).toBe('over') // 1.2 > 1.1
  })
})

describe('createPointFinder', () => {
  it('finds the nearest point within the radius, and none beyond it', () => {
    const pts = [
      { cx: 10, cy: 10, color: '#000', datum: 'a' },
      { cx: 50, cy: 50, color: '#000', datum: 'b' },
    ]
    const find = createPointFinder(pts)
    expect(find(12, 11, 5)?.datum).toBe('a')
    expect(find(46, 47, 6)?.datum).toBe('b') // distance 5
    expect(find(30, 30, 5)).toBeUndefined()
  })
})

describe('circlesMarkup', () => {
  it('writes one SVG circle per point, rounded to 0.1 px', () => {
    expect(circlesMarkup([{ cx: 1.234, cy: 5.67, color: '#abc' }], 2, 0.5)).toBe('<circle cx="1.2" cy="5.7" r="2" fill="#abc" fill-opacity="0.5"/>')
  })
})

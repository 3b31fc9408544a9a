import { describe, expect, it } from 'vitest'
import { createCostScatter, tonnageChange, type CostProject } from '../../../dashboard/src/charts/cost-scatter'

const project = (code: string, conservatism: number, pre: number | null, fin: number | null, unconservativeBraces = 0): CostProject => ({
  code,
  name: `Project ${code}`,
  yearDesigned: 2015,
  conservatism,
  preliminaryLateralTons: pre,
  finalLateralTons: fin,
  attributableTons: 0,
  unconservativeBraces,
  braces: 10,
})

describe('createCostScatter', () => {
  const geo = createCostScatter([project('P1', 1.12, 100, 90), project('P2', 0.95, 80, 86, 2), project('P3', 1.05, null, 50)], 500, 300)

  it('places projects at (conservatism, final − preliminary tons) and counts those it cannot place', () => {
    expect(geo.points).toHaveLength(2)
    expect(geo.missing).toBe(1)
    const p1 = geo.points[0]!
    expect(p1.delta).toBe(-10) // 90 − 100
    expect(geo.x.invert(p1.cx)).toBeCloseTo(1.12, 9)
    expect(geo.y.invert(p1.cy)).toBeCloseTo(-10, 9)
  })

  it('marks a project unconservative when its conservatism is below 1 or a brace was underestimated', () => {
    expect(geo.points.map(p => p.unconservative)).toEqual([false, true])
  })

  it('always shows conservatism 1 and no change in tons', () => {
    expect(geo.x.invert(geo.one)).toBeCloseTo(1, 9)
    expect(geo.y.invert(geo.zero)).toBeCloseTo(0, 9)
    expect(geo.one).toBeGreaterThan(geo.box.left)
    expect(geo.zero).toBeLessThan(geo.box.top + geo.box.height)
  })
})

describe('tonnageChange', () => {
  it('is final − preliminary, or undefined when either is missing', () => {
    expect(tonnageChange({ preliminaryLateralTons: 12.5, finalLateralTons: 14 })).toBe(1.5)
    expect(tonnageChange({ preliminaryLateralTons: null, finalLateralTons: 14 })).toBeUndefined()
  })
})

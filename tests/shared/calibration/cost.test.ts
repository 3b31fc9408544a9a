import { describe, expect, it } from 'vitest'
import { attributableTons, capacityDesignedTons, costOfConservatism, lateralTons } from '@shared/calibration'

describe('cost of conservatism (estimate; common practice, no source)', () => {
  it('lateral tons: the total, else the sum of the parts', () => {
    expect(lateralTons({ lateral_total: 40, braces: 5 })).toBe(40)
    expect(lateralTons({ braces: 5, beams: 10, columns: 12, connections: 3 })).toBe(30)
    expect(lateralTons({})).toBeNull()
    // Capacity-designed part leaves the braces out: 10 + 12 + 3 = 25.
    expect(capacityDesignedTons({ lateral_total: 40, braces: 5, beams: 10, columns: 12, connections: 3 })).toBe(25)
    expect(capacityDesignedTons({ lateral_total: 40 })).toBe(40)
  })

  it('attributable = tons × (1 − 1/c) above 1, else 0', () => {
    // c = 1.25 → 1 − 1/1.25 = 0.2 → 100 t × 0.2 = 20 t.
    expect(attributableTons(100, 1.25)).toBeCloseTo(20, 12)
    expect(attributableTons(100, 0.9)).toBe(0)
  })

  it('per project, totals and the unconservative list', () => {
    const res = costOfConservatism([
      // P1: Cmax ratios 1.25, 1.20, 1.30 → median 1.25; beams+columns+connections 10+20+10 = 40 t → 40·0.2 = 8 t.
      { code: 'P1', name: 'One', yearDesigned: 2015, tmaxRatios: [1.1, 1.1, 1.2], cmaxRatios: [1.25, 1.2, 1.3], preliminary: { lateral_total: 60 }, final: { lateral_total: 50, braces: 10, beams: 10, columns: 20, connections: 10 } },
      // P2: Cmax ratios 0.95, 1.05 → median 1.00 → 0 t; the first brace (Cmax 0.95) and Tmax 0.9 on the second are misses → 2 braces; worst Tmax 0.90.
      { code: 'P2', name: 'Two', yearDesigned: 2016, tmaxRatios: [1.0, 0.9], cmaxRatios: [0.95, 1.05], preliminary: {}, final: { lateral_total: 30 } },
    ])
    expect(res.projects).toHaveLength(2)
    expect(res.projects[0]).toMatchObject({ code: 'P1', preliminaryLateralTons: 60, finalLateralTons: 50, unconservativeBraces: 0, braces: 3 })
    expect(res.projects[0]!.conservatism).toBeCloseTo(1.25, 12)
    expect(res.projects[0]!.attributableTons).toBeCloseTo(8, 12)
    expect(res.projects[1]).toMatchObject({ code: 'P2', attributableTons: 0, unconservativeBraces: 2, preliminaryLateralTons: null })
    // Totals: 50 + 30 = 80 t final lateral, 8 t attributable → share 0.1.
    expect(res.totals.finalLateralTons).toBe(80)
    expect(res.totals.attributableTons).toBeCloseTo(8, 12)
    expect(res.totals.attributableShare).toBeCloseTo(0.1, 12)
    expect(res.unconservative).toEqual([{ code: 'P2', name: 'Two', braces: 2, worstQuantity: 'tmax', worstRatio: 0.9 }])
    expect(res.method).toMatch(/estimate/i)
  })
})

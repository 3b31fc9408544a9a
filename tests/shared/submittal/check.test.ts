import { describe, expect, it } from 'vitest'
import { checkBrace, designSnapshotOf, latestSupplierKey, type CheckSnapshot } from '@shared/submittal/check'

const where = { frameLine: 'A', level: 'L2', levelIndex: 1 }

function snap(over: Partial<CheckSnapshot>): CheckSnapshot {
  return { phase: 'cd', revision: 0, coreAreaIn2: 6.5, fyscKsi: 38, fyscBasis: 'yield_range', fyscMaxKsi: 46, ry: null, beta: 1.1, omega: 1.4, stiffnessFactor: 1.4, factorDriftMultiple: null, ...over }
}

// Design (cd): Asc 6.5 in², 38–46 ksi yield range, β 1.1, ω 1.4, KF 1.4.
// AISC 341-16 F4.2a: Tmax = ω·Ry·Fysc·Asc with the range's upper bound for Ry·Fysc = 1.4 · 46 · 6.5 = 418.6 kip;
// Cmax = β·Tmax = 1.1 · 418.6 = 460.46 kip.
const design = snap({})

describe('checkBrace', () => {
  it('flags a larger core whose Tmax and Cmax exceed the design forces, with by how much', () => {
    // Supplier: Asc 7.0, same 38–46 ksi range, β 1.12, ω 1.45, KF 1.50, at 2.0 × design drift.
    const supplier = snap({ phase: 'submittal', coreAreaIn2: 7.0, beta: 1.12, omega: 1.45, stiffnessFactor: 1.5, factorDriftMultiple: 2 })
    const r = checkBrace(where, design, supplier, 0.1)
    const item = (k: string) => r.items.find(i => i.item === k)!
    // core 7.0 / 6.5 − 1 = +7.69 % — inside ±10 % (common practice, no source)
    expect(item('coreArea')).toMatchObject({ status: 'pass', excess: expect.closeTo(0.5, 12), excessRatio: expect.closeTo(0.076923, 6) })
    // KF 1.5 / 1.4 − 1 = +7.14 % — inside ±10 %
    expect(item('stiffnessFactor')).toMatchObject({ status: 'pass', excessRatio: expect.closeTo(0.071429, 6) })
    // AISC 341-16 F4.2a: Tmax = 1.45 · 46 · 7.0 = 466.9 kip > 418.6 → exceeds by 48.3 kip (+11.54 %)
    expect(item('tmax')).toMatchObject({ status: 'exceeds', design: expect.closeTo(418.6, 9), supplier: expect.closeTo(466.9, 9), excess: expect.closeTo(48.3, 9), excessRatio: expect.closeTo(0.115385, 6) })
    // AISC 341-16 F4.2a: Cmax = 1.12 · 466.9 = 522.928 kip > 460.46 → exceeds by 62.468 kip (+13.57 %)
    expect(item('cmax')).toMatchObject({ status: 'exceeds', design: expect.closeTo(460.46, 9), supplier: expect.closeTo(522.928, 9), excess: expect.closeTo(62.468, 9), excessRatio: expect.closeTo(0.135664, 6) })
    expect(item('deformationBasis').status).toBe('pass')
    expect(item('ryBasis').status).toBe('pass')
    expect(r.status).toBe('exceeds')
    expect(r.supplier).toEqual({ phase: 'submittal', revision: 0 })
  })

  it('passes Tmax and Cmax below the design, flags a stiffness outside the band, Ry on a coupon value and an unstated deformation', () => {
    // Coupon: Asc 6.0, measured 42 ksi, Ry 1.1 wrongly recorded, β 1.05, ω 1.35, KF 1.6, no deformation stated.
    const supplier = snap({ phase: 'coupon', coreAreaIn2: 6.0, fyscKsi: 42, fyscBasis: 'coupon', fyscMaxKsi: null, ry: 1.1, beta: 1.05, omega: 1.35, stiffnessFactor: 1.6 })
    const r = checkBrace(where, design, supplier, 0.1)
    const item = (k: string) => r.items.find(i => i.item === k)!
    expect(item('coreArea')).toMatchObject({ status: 'pass', excessRatio: expect.closeTo(-0.076923, 6) }) // 6.0/6.5 − 1 = −7.69 %
    expect(item('stiffnessFactor')).toMatchObject({ status: 'exceeds', excessRatio: expect.closeTo(0.142857, 6) }) // 1.6/1.4 − 1 = +14.3 % > 10 %
    // AISC 341-16 F4.2a: no Ry on a coupon value → Tmax = 1.35 · 42 · 6.0 = 340.2 kip ≤ 418.6; Cmax = 1.05 · 340.2 = 357.21 ≤ 460.46
    expect(item('tmax')).toMatchObject({ status: 'pass', supplier: expect.closeTo(340.2, 9), excess: expect.closeTo(-78.4, 9) })
    expect(item('cmax')).toMatchObject({ status: 'pass', supplier: expect.closeTo(357.21, 9) })
    expect(item('deformationBasis').status).toBe('missing')
    // Ry 1.1 on a measured yield overstates the expected yield by 10 %
    expect(item('ryBasis')).toMatchObject({ status: 'exceeds', excess: expect.closeTo(0.1, 12) })
    expect(r.status).toBe('exceeds')
  })

  it('treats the band as two-sided and inclusive: exactly ±10 % passes, 10.8 % below fails', () => {
    // 6.5 × 1.1 = 7.15 (+10 %) passes; 5.8 / 6.5 − 1 = −10.77 % fails
    expect(checkBrace(where, design, snap({ phase: 'approved', coreAreaIn2: 7.15, factorDriftMultiple: 2 }), 0.1).items[0]!.status).toBe('pass')
    expect(checkBrace(where, design, snap({ phase: 'approved', coreAreaIn2: 5.8, factorDriftMultiple: 2 }), 0.1).items[0]).toMatchObject({ status: 'exceeds', excessRatio: expect.closeTo(-0.107692, 6) })
    // A ±5 % firm band fails the +7.69 % core
    expect(checkBrace(where, design, snap({ phase: 'approved', coreAreaIn2: 7.0, factorDriftMultiple: 2 }), 0.05).items[0]!.status).toBe('exceeds')
  })

  it('says missing when a specified-minimum yield has no Ry (so no Tmax), or when there is no supplier snapshot', () => {
    const r = checkBrace(where, design, snap({ phase: 'submittal', fyscBasis: 'specified_min', fyscMaxKsi: null, ry: null, factorDriftMultiple: 2 }), 0.1)
    expect(r.items.find(i => i.item === 'ryBasis')!.status).toBe('missing')
    expect(r.items.find(i => i.item === 'tmax')!.status).toBe('missing')
    expect(r.status).toBe('missing')
    expect(checkBrace(where, design, null, 0.1)).toMatchObject({ status: 'missing', items: [], supplier: null })
  })

  it('applies Ry to a specified minimum: 36 ksi × Ry 1.3 (A36 plate, AISC 341 Table A3.1, from memory)', () => {
    // Design: Tmax = 1.4 · 1.3 · 36 · 6.5 = 425.88 kip; supplier ω 1.4, Ry 1.3, 36 ksi, Asc 6.5 → equal → pass
    const d = snap({ fyscKsi: 36, fyscBasis: 'specified_min', fyscMaxKsi: null, ry: 1.3 })
    const r = checkBrace(where, d, { ...d, phase: 'submittal', factorDriftMultiple: 2 }, 0.1)
    expect(r.items.find(i => i.item === 'tmax')).toMatchObject({ status: 'pass', design: expect.closeTo(425.88, 9), excess: expect.closeTo(0, 9) })
    expect(r.status).toBe('pass')
  })
})

describe('designSnapshotOf / latestSupplierKey', () => {
  it('takes the latest design phase, then the highest revision', () => {
    const snaps = [snap({ phase: 'sd' }), snap({ phase: 'cd', revision: 1, coreAreaIn2: 7 }), snap({ phase: 'dd' }), snap({ phase: 'cd', revision: 0 }), snap({ phase: 'submittal' })]
    expect(designSnapshotOf(snaps)).toMatchObject({ phase: 'cd', revision: 1 })
    expect(designSnapshotOf([snap({ phase: 'submittal' })])).toBeNull()
  })

  it('orders supplier snapshots submittal rev 0 < rev 1 < approved < coupon', () => {
    expect(latestSupplierKey([{ phase: 'submittal', revision: 0 }, { phase: 'submittal', revision: 1 }, { phase: 'sd', revision: 0 }])).toEqual({ phase: 'submittal', revision: 1 })
    expect(latestSupplierKey([{ phase: 'approved', revision: 0 }, { phase: 'submittal', revision: 3 }])).toEqual({ phase: 'approved', revision: 0 })
    expect(latestSupplierKey([{ phase: 'coupon', revision: 0 }, { phase: 'approved', revision: 0 }])).toEqual({ phase: 'coupon', revision: 0 })
    expect(latestSupplierKey([{ phase: 'sd', revision: 0 }])).toBeNull()
  })
})

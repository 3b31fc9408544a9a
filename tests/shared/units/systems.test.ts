import { describe, expect, it } from 'vitest'
import { CANONICAL_UNITS, DISPLAY_UNITS, fromDisplay, toDisplay, unitOf, type QuantityKind } from '@shared/units'

describe('DISPLAY_UNITS', () => {
  it.each([
    ['force', 'kip', 'kN'],
    ['stress', 'ksi', 'MPa'],
    ['area', 'in²', 'mm²'],
    ['stiffness', 'kip/in', 'kN/mm'],
    ['dimension', 'ft', 'm'],
    ['length', 'in', 'mm'],
    ['weight', 'lb', 'kg'],
    ['moment', 'kip·ft', 'kN·m'],
  ] as const)('unitOf(%s, us|si) is %s | %s', (kind, us, si) => {
    expect(unitOf(kind, 'us')).toBe(us) // product decision: display units of the sizing API
    expect(unitOf(kind, 'si')).toBe(si) // product decision: display units of the sizing API
  })

  it('covers the same kinds in both systems and in CANONICAL_UNITS', () => {
    expect(Object.keys(DISPLAY_UNITS.si).sort()).toEqual(Object.keys(DISPLAY_UNITS.us).sort()) // derived: table completeness
    expect(Object.keys(CANONICAL_UNITS).sort()).toEqual(Object.keys(DISPLAY_UNITS.us).sort()) // derived: table completeness
  })
})

describe('toDisplay(kind, canonical, system) / fromDisplay(kind, display, system)', () => {
  it.each([
    ['dimension', 180, 'us', 15], // derived: 180 in / 12 = 15 ft
    ['dimension', 180, 'si', 4.572], // NIST SP 811 App. B: 180 × 0.0254 m = 4.572 m
    ['force', 1, 'si', 4.4482216152605], // NIST SP 811 App. B: kip → kN
    ['stress', 38, 'si', 262.0007771], // NIST SP 811 App. B: 38 × 6.894757293 MPa
    ['area', 5, 'si', 3225.8], // NIST SP 811 App. B: 5 × 645.16 mm²
    ['moment', 12, 'us', 1], // derived: 12 kip·in = 1 kip·ft
    ['moment', 12, 'si', 1.3558179483], // NIST SP 811 App. B: 1 kip·ft → 1.355 818 kN·m
    ['weight', 1, 'si', 0.45359237], // NIST SP 811 App. B: lb → kg (exact)
    ['length', 2, 'us', 2], // canonical unit already in US
  ] as const)('toDisplay(%s, %d, %s) = %d', (kind, canonical, system, display) => {
    expect(toDisplay(kind as QuantityKind, canonical, system)).toBeCloseTo(display, 6) // NIST SP 811 App. B (row comment)
    expect(fromDisplay(kind as QuantityKind, display, system)).toBeCloseTo(canonical, 6) // derived: inverse
  })
})

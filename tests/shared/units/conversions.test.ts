import { describe, expect, it } from 'vitest'
import { unit } from 'mathjs'
import {
  ftToIn, ftToM, in2ToMm2, inToFt, inToM, inToMm, kgPerM2ToLbPerFt2, kgPerM3ToLbPerFt3, kgPerMToLbPerFt, kgToLb,
  kipFtToKnM, kipPerInToKnPerMm, kipToKn, knMToKipFt, knPerMmToKipPerIn, knToKip, ksiToMpa, lbPerFt2ToKgPerM2,
  lbPerFt3ToKgPerM3, lbPerFtToKgPerM, lbToKg, mm2ToIn2, mmToIn, mpaToKsi, mToFt, mToIn, shortTonToTonne, tonneToShortTon,
} from '@shared/units'

// Relative closeness: |a − b| ≤ rel · |b|.
const expectRel = (actual: number, expected: number, rel: number) =>
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(rel * Math.abs(expected)) // helper: relative tolerance, source named at each call

describe('unit factors against NIST SP 811 App. B', () => {
  // [call, value for 1 unit, SP 811 (7 significant figures), full derived value]
  it.each([
    ['kipToKn(1)', kipToKn(1), 4.448222, 4.4482216152605], // NIST SP 811 App. B: kip → N 4.448 222 E+03
    ['ksiToMpa(1)', ksiToMpa(1), 6.894757, 6.894757293168], // NIST SP 811 App. B: ksi → Pa 6.894 757 E+06
    ['lbPerFt2ToKgPerM2(1)', lbPerFt2ToKgPerM2(1), 4.882428, 4.882427636], // NIST SP 811 App. B: lb/ft² → kg/m² 4.882 428
    ['lbPerFtToKgPerM(1)', lbPerFtToKgPerM(1), 1.488164, 1.488163944], // NIST SP 811 App. B: lb/ft → kg/m 1.488 164
    ['kipFtToKnM(1)', kipFtToKnM(1), 1.355818, 1.3558179483], // NIST SP 811 App. B: kip·ft → N·m 1.355 818 E+03
    ['lbPerFt3ToKgPerM3(1)', lbPerFt3ToKgPerM3(1), 16.01846, 16.01846337], // NIST SP 811 App. B: lb/ft³ → kg/m³ 1.601 846 E+01
    ['shortTonToTonne(1)', shortTonToTonne(1), 0.9071847, 0.90718474], // NIST SP 811 App. B: ton (2000 lb) → kg 9.071 847 E+02
  ])('%s matches the SP 811 factor to 7 significant figures', (_call, actual, sp811, full) => {
    expectRel(actual, sp811, 5e-7) // NIST SP 811 App. B, 7 significant figures
    expectRel(actual, full, 1e-9) // derived from exact bases, engineering reference §7 [D]
  })

  it.each([
    ['inToMm(1)', inToMm(1), 25.4], // NIST SP 811 App. B: in → m 2.54 E−02 (exact)
    ['ftToM(1)', ftToM(1), 0.3048], // NIST SP 811 App. B: ft → m 3.048 E−01 (exact)
    ['in2ToMm2(1)', in2ToMm2(1), 645.16], // NIST SP 811 App. B: in² → m² 6.4516 E−04 (exact)
    ['lbToKg(1)', lbToKg(1), 0.45359237], // NIST SP 811 App. B: lb → kg 4.535 924 E−01 (exact definition 0.45359237)
    ['ftToIn(1)', ftToIn(1), 12], // definition of the foot
  ])('%s is exact', (_call, actual, expected) => {
    expect(actual).toBeCloseTo(expected, 12) // exact by definition, float noise only
  })

  it('kipPerInToKnPerMm(1) = 4.4482216152605 / 25.4 kN/mm', () => {
    // derived: 1 kip/in = 4.4482216152605 kN / 25.4 mm = 0.175126835246476
    expect(kipPerInToKnPerMm(1)).toBeCloseTo(0.175126835246476, 12)
  })
})

describe('check values of engineering reference §7', () => {
  it('ksiToMpa(38) ≈ 262.00 and ksiToMpa(46) ≈ 317.16', () => {
    expect(ksiToMpa(38)).toBeCloseTo(262.0, 2) // derived: 38 × 6.894757 = 262.0008 (engineering reference §7 [D])
    expect(ksiToMpa(46)).toBeCloseTo(317.16, 2) // derived: 46 × 6.894757 = 317.1588
  })
  it('lbPerFt2ToKgPerM2(10) ≈ 48.824, and 10 psf over 1000 ft² is 5 short tons', () => {
    expect(lbPerFt2ToKgPerM2(10)).toBeCloseTo(48.824, 3) // HUD Residential Structural Design Guide App. B: psf → kg/m² 4.8824
    expect((10 * 1000) / 2000).toBe(5) // derived: 10 lb/ft² × 1000 ft² = 10 000 lb = 5 short tons
    expect(tonneToShortTon(shortTonToTonne(5))).toBeCloseTo(5, 12) // derived: round trip
  })
  it('lbPerFt3ToKgPerM3(490) ≈ 7849.0', () => {
    expect(lbPerFt3ToKgPerM3(490)).toBeCloseTo(7849.05, 1) // derived: 490 × 0.45359237 / 0.3048³ = 7849.047 (engineering reference §4 [D])
  })
})

describe('round trips', () => {
  const values = [0.001, 1, 38, 1234.5678, 1e6]
  it.each([
    ['inToMm/mmToIn', inToMm, mmToIn],
    ['ftToM/mToFt', ftToM, mToFt],
    ['inToFt/ftToIn', inToFt, ftToIn],
    ['inToM/mToIn', inToM, mToIn],
    ['kipToKn/knToKip', kipToKn, knToKip],
    ['ksiToMpa/mpaToKsi', ksiToMpa, mpaToKsi],
    ['in2ToMm2/mm2ToIn2', in2ToMm2, mm2ToIn2],
    ['kipPerInToKnPerMm/knPerMmToKipPerIn', kipPerInToKnPerMm, knPerMmToKipPerIn],
    ['lbToKg/kgToLb', lbToKg, kgToLb],
    ['shortTonToTonne/tonneToShortTon', shortTonToTonne, tonneToShortTon],
    ['lbPerFt2ToKgPerM2/kgPerM2ToLbPerFt2', lbPerFt2ToKgPerM2, kgPerM2ToLbPerFt2],
    ['lbPerFt3ToKgPerM3/kgPerM3ToLbPerFt3', lbPerFt3ToKgPerM3, kgPerM3ToLbPerFt3],
    ['lbPerFtToKgPerM/kgPerMToLbPerFt', lbPerFtToKgPerM, kgPerMToLbPerFt],
    ['kipFtToKnM/knMToKipFt', kipFtToKnM, knMToKipFt],
  ])('%s returns the input', (_name, there, back) => {
    for (const v of values) expectRel(back(there(v)), v, 1e-14) // derived: inverse functions
  })
})

describe('cross-check against mathjs units', () => {
  // mathjs defines kip as 4448.2216 N (8 significant figures), so force-based checks use 1000 lbf instead;
  // its psi is stored as 6894.75729276459 Pa (≈ 6e-11 relative from the exact value), hence 1e-9.
  it.each([
    ['inToMm', inToMm, 'in', 'mm'],
    ['ftToM', ftToM, 'ft', 'm'],
    ['in2ToMm2', in2ToMm2, 'in^2', 'mm^2'],
    ['lbToKg', lbToKg, 'lbm', 'kg'],
    ['ksiToMpa', (v: number) => ksiToMpa(v / 1000), 'psi', 'MPa'],
    ['kipToKn', (v: number) => kipToKn(v / 1000), 'lbf', 'kN'],
    ['kipPerInToKnPerMm', (v: number) => kipPerInToKnPerMm(v / 1000), 'lbf/in', 'kN/mm'],
    ['kipFtToKnM', (v: number) => kipFtToKnM(v / 1000), 'lbf ft', 'kN m'],
    ['shortTonToTonne', shortTonToTonne, 'ton', 'tonne'],
    ['lbPerFt2ToKgPerM2', lbPerFt2ToKgPerM2, 'lbm/ft^2', 'kg/m^2'],
    ['lbPerFt3ToKgPerM3', lbPerFt3ToKgPerM3, 'lbm/ft^3', 'kg/m^3'],
    ['lbPerFtToKgPerM', lbPerFtToKgPerM, 'lbm/ft', 'kg/m'],
  ] as const)('%s agrees with mathjs', (_name, fn, from, to) => {
    for (const v of [0.5, 3.25, 38, 490, 12345]) {
      expectRel(fn(v), unit(v, from).toNumber(to), 1e-9) // mathjs units
    }
  })
})

import { describe, expect, it } from 'vitest'
import {
  STEEL_MODULUS_KSI, computeBraceStiffness, computeCoreStrain, computeDriftAtYield, computeStiffnessFactor, computeYieldDeformation,
} from '@shared/engineering'

describe('STEEL_MODULUS_KSI', () => {
  it('is 29,000 ksi', () => {
    expect(STEEL_MODULUS_KSI).toBe(29000) // AISC 360 E = 29,000 ksi (from memory, standard value)
  })
})

describe('computeStiffnessFactor({yieldLengthRatio, areaRatio})', () => {
  it.each([
    [0.6, 3, 1.3636], // engineering reference §5 [D]: 1 / (0.6 + 0.4/3) = 1 / 0.7333 = 1.3636
    [1.0, 3, 1.0], // derived: all yielding → KF = 1
    [0.5, 2, 1.3333], // derived: 1 / (0.5 + 0.25) = 1.3333
  ])('r=%d, m=%d → %d', (yieldLengthRatio, areaRatio, expected) => {
    expect(computeStiffnessFactor({ yieldLengthRatio, areaRatio })).toBeCloseTo(expected, 4) // engineering reference §5 [D]; arithmetic in the row comment
  })
  it.each([0, 1.2, Number.NaN])('throws for r = %d', (r) => {
    expect(() => computeStiffnessFactor({ yieldLengthRatio: r, areaRatio: 3 })).toThrowError(expect.objectContaining({ field: 'yieldLengthRatio' })) // derived
  })
})

describe('computeBraceStiffness / computeYieldDeformation / computeDriftAtYield', () => {
  it('K = KF E Asc / Lwp, Δby = Pysc / K, drift = Δby / cos θ for an invented 5 in² brace', () => {
    // engineering reference §5 [D]: K = 1.4 × 29000 × 5 / 360 = 203000 / 360 = 563.889 kip/in
    const k = computeBraceStiffness({ stiffnessFactor: 1.4, coreAreaIn2: 5, lengthIn: 360 })
    expect(k).toBeCloseTo(563.8889, 4) // engineering reference §5 [D]
    // engineering reference §6.3 [D]: Δby = 200 / 563.889 = 0.354680 in (= Fy Lwp / (KF E) = 40 × 360 / 40600)
    const dby = computeYieldDeformation(200, k)
    expect(dby).toBeCloseTo(0.35468, 5) // engineering reference §6.3 [D]
    // engineering reference §6.3 [D]: 0.354680 / 0.8 = 0.443350 in
    expect(computeDriftAtYield(dby, 36.86989764584402)).toBeCloseTo(0.44335, 5)
  })
  it('throws for KF ≤ 0', () => {
    expect(() => computeBraceStiffness({ stiffnessFactor: 0, coreAreaIn2: 5, lengthIn: 360 })).toThrowError( // derived: invalid input
      expect.objectContaining({ field: 'stiffnessFactor' }),
    ) // derived: invalid input
  })
})

describe('computeCoreStrain({storyDriftIn, angleDeg, yieldLengthRatio, lengthIn})', () => {
  it('gives 2.00 % for the check frame of engineering reference §5', () => {
    // engineering reference §5 [D]: 15 ft story × 1.5 % = 2.70 in; × 2.0 = 5.40 in;
    // brace deformation 5.40 × cos 26.565° = 4.830 in; Ly = 0.6 × 402.49 = 241.50 in; 4.830 / 241.50 = 0.0200
    const strain = computeCoreStrain({ storyDriftIn: 2 * 0.015 * 180, angleDeg: 26.56505117707799, yieldLengthRatio: 0.6, lengthIn: Math.hypot(360, 180) })
    expect(strain).toBeCloseTo(0.02, 4) // engineering reference §5 [D]
  })
})

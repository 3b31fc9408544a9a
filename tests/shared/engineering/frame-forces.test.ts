import { describe, expect, it } from 'vitest'
import {
  computeBeamHorizontalForce, computeBeamUnbalancedLoad, computeColumnAxialForces, computeConnectionRequiredStrength,
  computeSharedBeamCases, midspanPattern,
} from '@shared/engineering'

// Invented braces at θ = 53.130° (3-4-5: sin 0.8, cos 0.6): Cmax 388.531, Tmax 353.21 kip
const lower = { compressionKip: 388.531, tensionKip: 353.21, angleDeg: 53.13010235415598 }
// Cmax 211.926, Tmax 192.66 kip
const upper = { compressionKip: 211.926, tensionKip: 192.66, angleDeg: 53.13010235415598 }

describe('computeBeamUnbalancedLoad(configuration, storyIndex, forces)', () => {
  it.each([
    // AISC 341 F4.4a (from memory); statics §6.3 [D]: (C − T) sin θ = (388.531 − 353.21) × 0.8 = 28.2568
    ['inverted_v', 0, 28.2568, 'up'], // up on the beam above a chevron
    ['v', 0, 28.2568, 'down'], // down on the beam below a V
    ['two_story_x', 0, 28.2568, 'up'], // lower story of a pair is a chevron
    ['two_story_x', 1, 28.2568, 'down'], // upper story of a pair is a V
  ] as const)('%s at story %d → %d kip %s', (configuration, index, load, direction) => {
    const r = computeBeamUnbalancedLoad(configuration, index, lower)
    expect(r.loadKip).toBeCloseTo(load, 4) // AISC 341 F4.4a (from memory); statics
    expect(r.direction).toBe(direction) // statics: engineering reference §6.3
  })

  it('is null for a single diagonal (no midspan intersection)', () => {
    expect(computeBeamUnbalancedLoad('single_diagonal', 0, lower)).toEqual({ loadKip: null, direction: null }) // derived: statics
    expect(midspanPattern('single_diagonal', 3)).toBeNull() // derived: statics
  })

  it('equals (β − 1) ω Ry Pysc sin θ for identical braces', () => {
    // engineering reference §6.3 [D]: (1.1 − 1) × 1.3 × 1.3 × 209 × 0.8 = 28.2568
    expect(computeBeamUnbalancedLoad('inverted_v', 0, lower).loadKip).toBeCloseTo(0.1 * 1.3 * 1.3 * 209 * 0.8, 6)
  })
})

describe('computeBeamHorizontalForce(configuration, forces)', () => {
  it('is (Cmax + Tmax) cos θ where two braces meet', () => {
    // statics §6.3 [D]: (388.531 + 353.21) × 0.6 = 445.0446
    expect(computeBeamHorizontalForce('inverted_v', lower)).toBeCloseTo(445.0446, 4)
  })
  it('is Cmax cos θ for a single diagonal', () => {
    // derived: statics, one brace per bay; 388.531 × 0.6 = 233.1186
    expect(computeBeamHorizontalForce('single_diagonal', lower)).toBeCloseTo(233.1186, 4)
  })
})

describe('computeSharedBeamCases(lower, upper)', () => {
  it('gives each story alone and the combined case', () => {
    // common practice (engineering reference §6.3 [C]):
    // up = 35.321 × 0.8 = 28.2568; down = 19.266 × 0.8 = 15.4128; combined = 12.8440 up
    const r = computeSharedBeamCases(lower, upper)
    expect(r.upwardKip).toBeCloseTo(28.2568, 4) // common practice (§6.3 [C]): (388.531 − 353.21) × 0.8
    expect(r.downwardKip).toBeCloseTo(15.4128, 4) // common practice (§6.3 [C]): (211.926 − 192.66) × 0.8
    expect(r.combinedKip).toBeCloseTo(12.844, 4) // common practice (§6.3 [C]): 28.2568 − 15.4128
    expect(r.combinedDirection).toBe('up') // derived: the chevron below is stronger
    expect(r.governingKip).toBeCloseTo(28.2568, 4) // common practice (§6.3 [C]): max of the three cases
  })
  it('points down when the upper V is stronger', () => {
    const r = computeSharedBeamCases(upper, lower) // derived: swap the stories
    expect(r.combinedDirection).toBe('down') // derived: swapped stories
    expect(r.combinedKip).toBeCloseTo(12.844, 4) // derived: |15.4128 − 28.2568|
  })
})

describe('computeColumnAxialForces(stories)', () => {
  it('accumulates Σ C sin θ and Σ T sin θ from the top down', () => {
    // common practice, follows AISC 341 F4.3 method (from memory):
    // story 2: C 211.926 × 0.8 = 169.5408, T 192.66 × 0.8 = 154.128
    // story 1: C 169.5408 + 388.531 × 0.8 = 480.3656, T 154.128 + 353.21 × 0.8 = 436.696
    const [s1, s2] = computeColumnAxialForces([lower, upper])
    expect(s2!.compressionKip).toBeCloseTo(169.5408, 4) // common practice, follows AISC 341 F4.3 method
    expect(s2!.tensionKip).toBeCloseTo(154.128, 4) // common practice, follows AISC 341 F4.3 method
    expect(s1!.compressionKip).toBeCloseTo(480.3656, 4) // common practice, follows AISC 341 F4.3 method
    expect(s1!.tensionKip).toBeCloseTo(436.696, 4) // common practice, follows AISC 341 F4.3 method
  })
})

describe('computeConnectionRequiredStrength(compressionKip)', () => {
  it.each([
    [330, 363], // AISC 341-16 F4.6c (from memory): 1.1 × 330
    [309.465, 340.4115], // AISC 341-16 F4.6c (from memory): 1.1 × 309.465
  ])('1.1 × %d = %d', (c, expected) => {
    expect(computeConnectionRequiredStrength(c)).toBeCloseTo(expected, 6) // AISC 341-16 F4.6c (from memory)
  })
  it('throws for a non-positive Cmax', () => {
    expect(() => computeConnectionRequiredStrength(0)).toThrowError(expect.objectContaining({ field: 'compressionKip' })) // derived
  })
})

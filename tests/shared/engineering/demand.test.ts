import { describe, expect, it } from 'vitest'
import { computeEqualBraceForce, computeStiffnessWeightedForces, EngineeringInputError } from '@shared/engineering'

describe('computeEqualBraceForce({storyShearKip, braceCount, angleDeg})', () => {
  it.each([
    // Pu = Vu / (n cos θ), engineering reference §6.2 [D]
    [144, 1, 36.8699, 180], // derived: 144 / (1 × 0.8) = 180
    [240, 4, 53.1301, 100], // derived: 240 / (4 × 0.6) = 100
    [1000, 2, 45, 707.1068], // derived: 1000 / (2 × 0.70711) = 707.107
    [-144, 1, 36.8699, 180], // derived: reversed shear gives the same |Pu| (engineering reference §6.3 edge cases)
  ])('Vu=%d, n=%d, θ=%d° → %d kip', (storyShearKip, braceCount, angleDeg, expected) => {
    expect(computeEqualBraceForce({ storyShearKip, braceCount, angleDeg })).toBeCloseTo(expected, 3) // statics, engineering reference §6.2 [D]; arithmetic in the row comment
  })

  it.each([
    [{ storyShearKip: 100, braceCount: 0, angleDeg: 45 }, 'braceCount'], // engineering reference §6.3 edge case n = 0
    [{ storyShearKip: 100, braceCount: 2, angleDeg: 90 }, 'angleDeg'], // engineering reference §6.3 edge case θ = 90°
    [{ storyShearKip: 100, braceCount: 2, angleDeg: 0 }, 'angleDeg'],
    [{ storyShearKip: Number.NaN, braceCount: 2, angleDeg: 45 }, 'storyShearKip'],
  ])('throws EngineeringInputError for %o', (options, field) => {
    expect(() => computeEqualBraceForce(options)).toThrowError(expect.objectContaining({ name: 'EngineeringInputError', field })) // derived: invalid geometry or brace count
  })
})

describe('computeStiffnessWeightedForces(storyShearKip, braces)', () => {
  it('matches the two-brace check of engineering reference §6.2', () => {
    // Pi = Vu ki cos θi / Σ kj cos² θj; Σ = 450 × 0.8 + 600 × 0.5 = 660 (cos² 26.565° = 0.8, cos² 45° = 0.5)
    // P1 = 300 × 450 × 0.894427 / 660 = 182.95; P2 = 300 × 600 × 0.707107 / 660 = 192.85
    const [p1, p2] = computeStiffnessWeightedForces(300, [
      { stiffnessKipPerIn: 450, angleDeg: 26.565 },
      { stiffnessKipPerIn: 600, angleDeg: 45 },
    ])
    expect(p1).toBeCloseTo(182.95, 2) // engineering reference §6.2 [D]
    expect(p2).toBeCloseTo(192.85, 2) // engineering reference §6.2 [D]
    // horizontal components add back to Vu: 163.64 + 136.36 = 300
    expect(p1! * Math.cos((26.565 * Math.PI) / 180) + p2! * Math.cos(Math.PI / 4)).toBeCloseTo(300, 9) // derived: statics
  })

  it('reduces to Vu / (n cos θ) for equal braces', () => {
    const forces = computeStiffnessWeightedForces(-240, Array(4).fill({ stiffnessKipPerIn: 500, angleDeg: 53.1301 }))
    for (const p of forces) expect(p).toBeCloseTo(100, 3) // derived: 240 / (4 × 0.6)
  })

  it('throws naming the brace for a non-positive stiffness', () => {
    const call = () => computeStiffnessWeightedForces(300, [{ stiffnessKipPerIn: 450, angleDeg: 30 }, { stiffnessKipPerIn: 0, angleDeg: 45 }])
    expect(call).toThrow(EngineeringInputError) // derived: a brace of zero stiffness carries nothing
    expect(call).toThrowError(expect.objectContaining({ field: 'braces.1.stiffnessKipPerIn' })) // derived: field path names the brace
  })
})

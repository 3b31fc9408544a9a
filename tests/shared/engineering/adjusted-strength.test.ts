import { describe, expect, it } from 'vitest'
import { checkFactorRanges, computeAdjustedStrength, type CapacityBasis } from '@shared/engineering'

describe('computeAdjustedStrength({coreAreaIn2, fyscMinKsi, basis, beta, omega})', () => {
  it.each([
    // AISC 341 F4.2a (from memory): Tmax = ω Ry Pysc, Cmax = β ω Ry Pysc
    // Asc 5, Fy 40, Ry 1.2, ω 1.25, β 1.1: Pysc = 200; Tmax = 1.25 × 1.2 × 200 = 300; Cmax = 1.1 × 300 = 330
    [{ kind: 'ry', ry: 1.2 }, 5, 40, 1.1, 1.25, 200, 300, 330],
    // yield window 38–46 ksi: Tmax = 1.3 × 46 × 4.5 = 269.1; Cmax = 1.15 × 269.1 = 309.465; Pysc = 38 × 4.5 = 171
    [{ kind: 'yieldRange', fyscMaxKsi: 46 }, 4.5, 38, 1.15, 1.3, 171, 269.1, 309.465],
    // coupon 45 ksi (Ry not applied): Tmax = 1.25 × 45 × 5 = 281.25 — not 1.2 × 281.25; Cmax = 309.375
    [{ kind: 'coupon', fyscKsi: 45 }, 5, 40, 1.1, 1.25, 200, 281.25, 309.375],
  ] as const)('%o', (basis, coreAreaIn2, fyscMinKsi, beta, omega, pysc, t, c) => {
    const r = computeAdjustedStrength({ coreAreaIn2, fyscMinKsi, basis: basis as CapacityBasis, beta, omega })
    expect(r.yieldStrengthKip).toBeCloseTo(pysc, 9) // AISC 341 F4.5b (from memory): Pysc = Fysc Asc on the provided core
    expect(r.tensionKip).toBeCloseTo(t, 9) // AISC 341 F4.2a (from memory)
    expect(r.compressionKip).toBeCloseTo(c, 9) // AISC 341 F4.2a (from memory)
    expect(r.warnings).toEqual([]) // factors inside FACTOR_RANGES
  })

  it.each([
    [{ beta: 0 }, 'beta'],
    [{ beta: -1.1 }, 'beta'],
    [{ omega: 0 }, 'omega'],
    [{ omega: Number.NaN }, 'omega'],
    [{ coreAreaIn2: 0 }, 'coreAreaIn2'],
    [{ basis: { kind: 'ry', ry: 0 } }, 'capacityBasis.ry'],
    [{ fyscMinKsi: Number.POSITIVE_INFINITY }, 'fyscMinKsi'],
  ])('throws EngineeringInputError for %o', (override, field) => {
    const options = { coreAreaIn2: 5, fyscMinKsi: 40, basis: { kind: 'ry', ry: 1.2 } as CapacityBasis, beta: 1.1, omega: 1.25, ...override }
    expect(() => computeAdjustedStrength(options as never)).toThrowError(expect.objectContaining({ field })) // STYLE 4.8: invalid input throws
  })
})

describe('checkFactorRanges(factors)', () => {
  it.each([
    [{ beta: 0.95 }, 'beta'], // AISC 341 F4.2b (from memory): β is never below 1.0
    [{ beta: 1.35 }, 'beta'], // AISC 341 K3.8 (from memory): β ≤ 1.3 qualification limit
    [{ omega: 0.9 }, 'omega'], // engineering reference §5 literature range, from memory
    [{ omega: 1.7 }, 'omega'], // engineering reference §5 literature range, from memory
    [{ stiffnessFactor: 2.2 }, 'stiffnessFactor'], // engineering reference §5 literature range, from memory
    [{ stiffnessFactor: 0.9 }, 'stiffnessFactor'],
    [{ yieldLengthRatio: 0.3 }, 'yieldLengthRatio'], // engineering reference §5 literature range, from memory
    [{ ry: 0.9 }, 'capacityBasis.ry'], // AISC 341 Table A3.1 span (from memory)
  ])('warns for %o', (factors, field) => {
    const warnings = checkFactorRanges(factors)
    expect(warnings).toHaveLength(1) // FACTOR_RANGES: one warning per factor outside its band
    expect(warnings[0]!.field).toBe(field) // request field path, docs/sizing-api.md
  })

  it.each([
    [{ beta: 1.0, omega: 1.0, stiffnessFactor: 1.0 }], // lower edges inside (AISC 341 F4.2b; §5, from memory)
    [{ beta: 1.3, omega: 1.6, stiffnessFactor: 2.0, yieldLengthRatio: 0.8, ry: 1.6 }], // upper edges inside
  ])('returns no warning at the band edges %o', (factors) => {
    expect(checkFactorRanges(factors)).toEqual([]) // band edges are inside (AISC 341 F4.2b/K3.8; engineering reference §5, from memory)
  })
})

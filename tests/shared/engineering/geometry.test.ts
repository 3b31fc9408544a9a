import { describe, expect, it } from 'vitest'
import { EngineeringInputError, bracesAtStory, bracesPerBay, computeBraceGeometry, type BraceConfiguration } from '@shared/engineering'

describe('computeBraceGeometry({configuration, bayWidthIn, storyHeightIn})', () => {
  // Invented 3-4-5 bays so the arithmetic is exact (statics, engineering reference §6.1 [D]).
  it.each([
    // single diagonal: projection L = 288 in, h = 216 in → Lwp = √(288² + 216²) = 360, θ = atan(216/288) = 36.870°
    ['single_diagonal', 288, 216, 288, 360, 36.8699, 1],
    // chevron: projection L/2 = 180 in, h = 240 in → Lwp = 300, θ = atan(240/180) = 53.130°
    ['inverted_v', 360, 240, 180, 300, 53.1301, 2],
    // V: same geometry as the chevron
    ['v', 360, 240, 180, 300, 53.1301, 2],
    // two-story X: L/2 in each story; 288/2 = 144, h = 192 → Lwp = 240, θ = 53.130°
    ['two_story_x', 288, 192, 144, 240, 53.1301, 2],
    // 30 ft single diagonal, 15 ft story: θ = atan(0.5) = 26.565°, Lwp = √(360² + 180²) = 402.492 (engineering reference §5)
    ['single_diagonal', 360, 180, 360, 402.492, 26.5651, 1],
  ] as const)('%s, L=%d in, h=%d in', (configuration, bayWidthIn, storyHeightIn, horizontalIn, lengthIn, angleDeg, perBay) => {
    const g = computeBraceGeometry({ configuration, bayWidthIn, storyHeightIn })
    expect(g.horizontalIn).toBeCloseTo(horizontalIn, 9) // derived: statics, engineering reference §6.1
    expect(g.lengthIn).toBeCloseTo(lengthIn, 3) // derived: Lwp = √(projection² + h²)
    expect(g.angleDeg).toBeCloseTo(angleDeg, 4) // derived: θ = atan(h / projection)
    expect(g.bracesPerBay).toBe(perBay) // engineering reference §6.1 table
  })

  it.each([
    [{ bayWidthIn: 0, storyHeightIn: 180 }, 'bayWidthIn'], // L = 0: θ = 90°, no horizontal stiffness (engineering reference §6.3 edge cases)
    [{ bayWidthIn: -360, storyHeightIn: 180 }, 'bayWidthIn'],
    [{ bayWidthIn: 360, storyHeightIn: 0 }, 'storyHeightIn'],
    [{ bayWidthIn: Number.NaN, storyHeightIn: 180 }, 'bayWidthIn'],
    [{ bayWidthIn: 360, storyHeightIn: Number.POSITIVE_INFINITY }, 'storyHeightIn'],
  ])('throws EngineeringInputError for %o', (dims, field) => {
    const call = () => computeBraceGeometry({ configuration: 'single_diagonal', ...dims })
    expect(call).toThrow(EngineeringInputError) // derived: invalid geometry
    expect(call).toThrow(RangeError) // STYLE 4.8: invalid input throws RangeError
    expect(() => call()).toThrowError(expect.objectContaining({ field })) // EngineeringInputError names the field (docs/sizing-api.md)
  })

  it('throws for an unknown configuration', () => {
    const call = () => computeBraceGeometry({ configuration: 'k_brace' as BraceConfiguration, bayWidthIn: 360, storyHeightIn: 180 })
    expect(call).toThrowError(expect.objectContaining({ field: 'configuration' })) // AISC 341 F4.4b: K-bracing not permitted (from memory)
  })
})

describe('bracesPerBay(configuration) and bracesAtStory(configuration, bracedBays)', () => {
  it.each([
    ['single_diagonal', 1, 1],
    ['single_diagonal', 3, 3],
    ['inverted_v', 1, 2],
    ['v', 2, 4],
    ['two_story_x', 4, 8],
  ] as const)('%s with %d bays has %d braces', (configuration, bays, n) => {
    expect(bracesAtStory(configuration, bays)).toBe(n) // engineering reference §6.1: per bay × bays
    expect(bracesPerBay(configuration)).toBe(n / bays) // engineering reference §6.1 table
  })

  it.each([0, -1, 1.5, Number.NaN])('bracesAtStory(v, %d) throws on bracedBays', (bays) => {
    expect(() => bracesAtStory('v', bays)).toThrowError(expect.objectContaining({ field: 'bracedBays' })) // engineering reference §6.3 edge case n = 0
  })
})

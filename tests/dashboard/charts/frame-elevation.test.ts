import { describe, expect, it } from 'vitest'
import { braceLayout, createFrameElevation, isDrawable, type ElevationInput } from '../../../dashboard/src/charts/frame-elevation'

const stories = (n: number, height = 13) => Array.from({ length: n }, (_, i) => ({ name: `L${i + 1}`, height }))
const base = (overrides: Partial<ElevationInput> = {}): ElevationInput => ({
  configuration: 'inverted_v',
  bayWidth: 28,
  bays: 2,
  stories: stories(3),
  width: 600,
  height: 400,
  ...overrides,
})

describe('createFrameElevation(input)', () => {
  // Braces per story per bay: 1 for a single diagonal, 2 otherwise (derived: statics layout).
  it.each([
    ['inverted_v', 3, 2, 12],
    ['v', 3, 2, 12],
    ['two_story_x', 4, 1, 8],
    ['two_story_x', 3, 3, 18],
    ['single_diagonal', 3, 2, 6],
    ['single_diagonal', 1, 1, 1],
  ] as const)('%s with %i stories and %i bays draws %i braces', (configuration, n, bays, braces) => {
    const e = createFrameElevation(base({ configuration, stories: stories(n), bays }))
    expect(e.braces).toHaveLength(braces)
    expect(e.columns).toHaveLength(n * (bays + 1))
    expect(e.beams).toHaveLength(n * bays)
    expect(e.levelLabels.map(l => l.text)).toEqual(stories(n).map(s => s.name))
  })

  it('meets the inverted-V braces at the beam midspan above, the V braces at the floor midspan below', () => {
    const chevron = createFrameElevation(base({ bays: 1, stories: stories(1) }))
    const [a, b] = chevron.braces
    const mid = chevron.x(14)
    expect(a!.x2).toBeCloseTo(mid, 9)
    expect(b!.x2).toBeCloseTo(mid, 9)
    expect(a!.y2).toBeCloseTo(chevron.y(13), 9) // top of the story
    expect(a!.y1).toBeCloseTo(chevron.y(0), 9)
    const vee = createFrameElevation(base({ configuration: 'v', bays: 1, stories: stories(1) }))
    expect(vee.braces[0]!.x2).toBeCloseTo(mid, 9)
    expect(vee.braces[0]!.y2).toBeCloseTo(vee.y(0), 9) // the floor
  })

  it('alternates a two-story X: chevron in the lower story of each pair, V in the upper, meeting at the shared beam', () => {
    expect(braceLayout('two_story_x', 0, 20, 10)).toEqual([
      [0, 0, 10, 10],
      [20, 0, 10, 10],
    ])
    expect(braceLayout('two_story_x', 1, 20, 10)).toEqual([
      [0, 10, 10, 0],
      [20, 10, 10, 0],
    ])
    expect(braceLayout('two_story_x', 2, 20, 10)).toEqual(braceLayout('inverted_v', 2, 20, 10))
  })

  it('keeps true proportions: one pixel scale for both axes, inside the margins', () => {
    const e = createFrameElevation(base({ bays: 1, stories: stories(2, 14), bayWidth: 28, width: 800, height: 400 }))
    const pxPerUnitX = (e.x(28) - e.x(0)) / 28
    const pxPerUnitY = (e.y(0) - e.y(28)) / 28
    expect(pxPerUnitX).toBeCloseTo(pxPerUnitY, 9)
    for (const s of [...e.columns, ...e.beams, ...e.braces]) {
      for (const px of [s.x1, s.x2]) expect(px).toBeGreaterThanOrEqual(72 - 1e-9)
      for (const py of [s.y1, s.y2]) expect(py).toBeGreaterThanOrEqual(16 - 1e-9)
    }
  })

  it('labels every brace of a story with that story’s text', () => {
    const e = createFrameElevation(base({ braceLabels: ['3.00', '2.00', '1.25'] }))
    expect(e.braces.filter(b => b.label === '3.00')).toHaveLength(4)
    expect(e.braces.filter(b => b.story === 2).every(b => b.label === '1.25')).toBe(true)
    const b = e.braces[0]!
    expect(b.labelX).toBeCloseTo((b.x1 + b.x2) / 2, 9)
  })

  it('draws nothing for a missing bay width or story height', () => {
    expect(isDrawable({ bayWidth: Number.NaN, bays: 1, stories: stories(2) })).toBe(false)
    expect(isDrawable({ bayWidth: 20, bays: 1, stories: [{ name: 'L1', height: 0 }] })).toBe(false)
    expect(isDrawable({ bayWidth: 20, bays: 0, stories: stories(1) })).toBe(false)
    const e = createFrameElevation(base({ stories: [{ name: 'L1', height: Number.NaN }] }))
    expect(e.braces).toEqual([])
    expect(e.columns).toEqual([])
  })
})

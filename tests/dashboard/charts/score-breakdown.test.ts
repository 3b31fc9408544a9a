import { describe, expect, it } from 'vitest'
import type { FeatureContribution } from '@shared/schemas/precedents'
import { FEATURE_COLORS, breakdownDomainMax, createBreakdownSegments, describeBreakdown } from '../../../dashboard/src/charts/score-breakdown'
import { contrastRatio } from '../../../dashboard/src/charts/palette'

// A hand-made breakdown: weights shear 3, stories 2, configuration 2 (Σw = 7); distances d = 0.7, 0.35, 0
// → contributions w·d/Σw = 0.3, 0.1, 0; D = 0.4 (the rule of shared/precedents/similarity.ts).
const breakdown: FeatureContribution[] = [
  { feature: 'configuration', weight: 2, query: 'inverted_v', candidate: 'inverted_v', distance: 0, contribution: 0 },
  { feature: 'stories', weight: 2, query: 4, candidate: 5, distance: 0.35, contribution: 0.1 },
  { feature: 'storyShear', weight: 3, query: 400, candidate: 330, distance: 0.7, contribution: 0.3 },
]

describe('createBreakdownSegments(breakdown, { width, max })', () => {
  it('lays the contributions end to end in the features’ fixed order on the shared scale', () => {
    // Scale [0, 0.8] → [0, 200] px: shear 0 → 0.3 is 0 → 75 px; stories 0.3 → 0.4 is 75 → 100 px.
    const s = createBreakdownSegments(breakdown, { width: 200, max: 0.8 })
    expect(s.map(x => x.feature)).toEqual(['storyShear', 'stories'])
    expect(s[0]!.x).toBeCloseTo(0, 9)
    expect(s[0]!.width).toBeCloseTo(75, 9)
    expect(s[1]!.x).toBeCloseTo(75, 9)
    expect(s[1]!.width).toBeCloseTo(25, 9)
    expect(s[0]!.color).toBe(FEATURE_COLORS.storyShear)
  })

  it('leaves out a feature that matched exactly, and clamps at the scale’s end', () => {
    const s = createBreakdownSegments(breakdown, { width: 100, max: 0.2 })
    expect(s.find(x => x.feature === 'configuration')).toBeUndefined()
    // 0.3 and 0.4 are past max 0.2: the bar fills the width and no more.
    expect(s[0]!.x + s[0]!.width).toBeCloseTo(100, 9)
    expect(s[1]!.width).toBeCloseTo(0, 9)
  })
})

describe('breakdownDomainMax(matches)', () => {
  it('is the largest distance, and 1 when every match is identical', () => {
    expect(breakdownDomainMax([{ distance: 0.4 }, { distance: 1.25 }, { distance: 0.9 }])).toBe(1.25)
    expect(breakdownDomainMax([{ distance: 0 }])).toBe(1)
    expect(breakdownDomainMax([])).toBe(1)
  })
})

describe('describeBreakdown(breakdown, similarity)', () => {
  it('says the similarity, what kept the match apart (largest first) and what matched', () => {
    // exp(−0.4) = 0.6703 → 67 %
    expect(describeBreakdown(breakdown, Math.exp(-0.4))).toBe('Similarity 67 %. Distance by feature: story shear 0.30, stories 0.10. Same configuration.')
  })
})

describe('FEATURE_COLORS', () => {
  it('gives the eight features eight different colours, each at least 3:1 on white (WCAG 2.1 1.4.11)', () => {
    const colors = Object.values(FEATURE_COLORS)
    expect(new Set(colors).size).toBe(8)
    for (const c of colors) expect(contrastRatio(c, '#FFFFFF')).toBeGreaterThanOrEqual(3)
  })
})

import { describe, expect, it } from 'vitest'
import { featureDistance, featureSpreads, rankPrecedents, type PrecedentCandidate } from '@shared/precedents/similarity'

const blank = { storyShear: null, stories: null, storyHeight: null, bayWidth: null, configuration: null, sdc: null, buildingUse: null, supplier: null }
const frame = (code: string, over: Partial<PrecedentCandidate>): PrecedentCandidate => ({ ...blank, code, frameLine: 'A', ...over })

describe('rankPrecedents on shear, stories and configuration (default weights 3, 2, 2; Σw = 7)', () => {
  // ln shears of 100, 200, 400, 800 are evenly spaced by ln 2: type-7 quartiles at h = 0.75 and 2.25
  // → IQR(ln V) = 1.5·ln 2 = 1.039721. Stories [2, 4, 4, 8]: Q1 = 2 + 0.75·2 = 3.5, Q3 = 4 + 0.25·4 = 5 → IQR = 1.5.
  const set = [
    frame('A', { storyShear: 200, stories: 4, configuration: 'inverted_v' }),
    frame('B', { storyShear: 400, stories: 4, configuration: 'single_diagonal' }),
    frame('C', { storyShear: 800, stories: 8, configuration: 'inverted_v' }),
    frame('D', { storyShear: 100, stories: 2, configuration: 'inverted_v' }),
  ]
  const query = { storyShear: 300, stories: 4, configuration: 'inverted_v' }

  it('normalises by the spread of the history', () => {
    const s = featureSpreads(set)
    expect(s.storyShear).toBeCloseTo(1.5 * Math.LN2, 12)
    expect(s.stories).toBeCloseTo(1.5, 12)
  })

  it('ranks A, B, D, C with each feature’s share of the distance', () => {
    // A: d_V = ln(1.5)/1.039721 = 0.389975; stories 0; config 0 → D = 3·0.389975/7 = 0.167132
    // B: d_V = ln(4/3)/1.039721 = 0.276692; config mismatch 1 → D = (0.830076 + 2)/7 = 0.404297
    // D: d_V = ln 3/1.039721 = 1.056642; stories 2/1.5 = 1.333333 → D = (3.169925 + 2.666667)/7 = 0.833799
    // C: d_V = ln(8/3)/1.039721 = 0.943358; stories 4/1.5 = 2.666667 → D = (2.830074 + 5.333333)/7 = 1.166201
    const r = rankPrecedents(query, set)
    expect(r.map(x => x.candidate.code)).toEqual(['A', 'B', 'D', 'C'])
    expect(r.map(x => x.distance)).toEqual([expect.closeTo(0.167132, 5), expect.closeTo(0.404297, 5), expect.closeTo(0.833799, 5), expect.closeTo(1.166201, 5)])
    expect(r[0]!.similarity).toBeCloseTo(Math.exp(-0.167132), 5)
    const b = r[1]!.breakdown
    expect(b.map(x => x.feature)).toEqual(['storyShear', 'stories', 'configuration'])
    expect(b.find(x => x.feature === 'configuration')).toMatchObject({ weight: 2, distance: 1, contribution: expect.closeTo(2 / 7, 12), candidate: 'single_diagonal' })
    expect(b.find(x => x.feature === 'storyShear')).toMatchObject({ distance: expect.closeTo(0.276692, 5), contribution: expect.closeTo(0.118582, 5) })
    // contributions add up to the distance
    expect(b.reduce((s, x) => s + x.contribution, 0)).toBeCloseTo(r[1]!.distance, 12)
  })

  it('puts B first once the configuration weight is 0 (Σw = 5)', () => {
    // A: 3·0.389975/5 = 0.233985; B: 3·0.276692/5 = 0.166015; D: (3.169925 + 2.666667)/5 = 1.167318; C: (2.830074 + 5.333333)/5 = 1.632681
    const r = rankPrecedents(query, set, { weights: { configuration: 0 } })
    expect(r.map(x => x.candidate.code)).toEqual(['B', 'A', 'D', 'C'])
    expect(r[0]!.distance).toBeCloseTo(0.166015, 5)
    expect(r[0]!.breakdown.map(x => x.feature)).toEqual(['storyShear', 'stories'])
  })

  it('respects the limit', () => {
    expect(rankPrecedents(query, set, { limit: 2 }).map(x => x.candidate.code)).toEqual(['A', 'B'])
  })
})

describe('normalisation changes the order', () => {
  // Stories [3, 5, 5]: Q1 (h = 0.5) = 4, Q3 (h = 1.5) = 5 → IQR 1. Bay widths [240, 300, 360] in: Q1 270, Q3 330 → IQR 60.
  const set = [frame('E', { stories: 3, bayWidth: 360 }), frame('F', { stories: 5, bayWidth: 300 }), frame('G', { stories: 5, bayWidth: 240 })]
  const query = { stories: 3, bayWidth: 300 } // weights stories 2, bay 1, Σw = 3

  it('with IQR spreads, E (bay off by one IQR) beats F (two stories = two IQRs)', () => {
    // E: (2·0 + 1·60/60)/3 = 0.333333; F: (2·2/1 + 0)/3 = 1.333333; G: (2·2 + 1·1)/3 = 1.666667
    const r = rankPrecedents(query, set)
    expect(r.map(x => x.candidate.code)).toEqual(['E', 'F', 'G'])
    expect(r.map(x => x.distance)).toEqual([expect.closeTo(1 / 3, 12), expect.closeTo(4 / 3, 12), expect.closeTo(5 / 3, 12)])
  })

  it('with raw units (every spread 1), the 60 in bay difference swamps the stories and F wins', () => {
    // E: 60/3 = 20; F: 2·2/3 = 1.333333; G: (4 + 60)/3 = 21.333333
    const r = rankPrecedents(query, set, { spreads: { stories: 1, bayWidth: 1 } })
    expect(r.map(x => x.candidate.code)).toEqual(['F', 'E', 'G'])
    expect(r[1]!.distance).toBeCloseTo(20, 12)
  })

  it('with the bay weighted 5 and stories 1 (Σw = 6), F wins again', () => {
    // E: 5·1/6 = 0.833333; F: 1·2/6 = 0.333333; G: (2 + 5)/6 = 1.166667
    const r = rankPrecedents(query, set, { weights: { stories: 1, bayWidth: 5 } })
    expect(r.map(x => x.candidate.code)).toEqual(['F', 'E', 'G'])
    expect(r[0]!.distance).toBeCloseTo(1 / 3, 12)
  })
})

describe('featureDistance', () => {
  it('scores categorical features 0/1 and a missing candidate value as 1', () => {
    expect(featureDistance('sdc', 'D', 'D', 1)).toBe(0)
    expect(featureDistance('sdc', 'D', 'C', 1)).toBe(1)
    expect(featureDistance('stories', 4, null, 2)).toBe(1)
  })
  it('compares shears as a log ratio: 200 → 400 kip is as far as 400 → 800 kip', () => {
    expect(featureDistance('storyShear', 200, 400, 1)).toBeCloseTo(Math.LN2, 12)
    expect(featureDistance('storyShear', 800, 400, 1)).toBeCloseTo(Math.LN2, 12)
  })
  it('falls back to 1 for a spread of identical values', () => {
    expect(featureSpreads([frame('X', { stories: 4 }), frame('Y', { stories: 4 })]).stories).toBe(1)
  })
})

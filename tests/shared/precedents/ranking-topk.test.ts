import { describe, expect, it } from 'vitest'
import { featureDistance, featureSpreads, rankPrecedents, type PrecedentCandidate } from '@shared/precedents/similarity'
import { DEFAULT_PRECEDENT_WEIGHTS, PRECEDENT_FEATURES, NUMERIC_FEATURES } from '@shared/schemas/precedents'
import { rng } from '../../../scripts/bench/synthetic'

// rankPrecedents keeps only the `limit` nearest while scanning; the answer must be the head of the
// full ranking the method describes (weighted mean of the feature distances, nearest first, ties by
// code then frame line), worked out here with a plain sort over every candidate.


const rand = rng(17)
const pick = <T>(xs: T[]) => xs[Math.floor(rand() * xs.length)]!
// Coarse values so that many candidates tie on distance and the tie-break decides.
const candidates: PrecedentCandidate[] = Array.from({ length: 400 }, (_, i) => ({
  code: `P-${String(Math.floor(i / 3)).padStart(3, '0')}`,
  frameLine: pick(['A', 'B', 'C', 'D']) + i,
  storyShear: rand() < 0.05 ? null : pick([100, 200, 300, 400]),
  stories: pick([3, 4, 5, null]),
  storyHeight: pick([144, 156, 168]),
  bayWidth: pick([300, 360]),
  configuration: pick(['inverted_v', 'v', null]),
  sdc: pick(['C', 'D']),
  buildingUse: pick(['office', 'school']),
  supplier: pick(['S1', 'S2', null]),
}))

function reference(query: Record<string, number | string>, limit: number, weights = DEFAULT_PRECEDENT_WEIGHTS) {
  const spreads = featureSpreads(candidates)
  const used = PRECEDENT_FEATURES.filter(f => query[f] !== undefined && weights[f] > 0)
  const total = used.reduce((s, f) => s + weights[f], 0)
  return candidates
    .map(c => ({
      c,
      d: used.reduce((s, f) => s + (weights[f] * featureDistance(f, query[f]!, c[f], (NUMERIC_FEATURES as readonly string[]).includes(f) ? spreads[f as keyof typeof spreads] : 1)) / total, 0),
    }))
    .sort((a, b) => a.d - b.d || a.c.code.localeCompare(b.c.code) || a.c.frameLine.localeCompare(b.c.frameLine))
    .slice(0, limit)
    .map(x => [x.c.code, x.c.frameLine, x.d])
}

describe('rankPrecedents keeps the nearest `limit`', () => {
  const queries: Record<string, number | string>[] = [
    { storyShear: 250, stories: 4 },
    { configuration: 'v', sdc: 'D' },
    { storyShear: 300, stories: 5, storyHeight: 156, bayWidth: 360, configuration: 'inverted_v', sdc: 'C', buildingUse: 'office', supplier: 'S2' },
  ]
  for (const [i, q] of queries.entries()) {
    for (const limit of [1, 10, 50]) {
      it(`query ${i + 1}, limit ${limit}`, () => {
        const got = rankPrecedents(q, candidates, { limit, spreads: featureSpreads(candidates) }).map(r => [r.candidate.code, r.candidate.frameLine, r.distance])
        expect(got).toEqual(reference(q, limit))
        // Without the spreads passed, the same answer (they are worked out from the candidates).
        expect(rankPrecedents(q, candidates, { limit }).map(r => [r.candidate.code, r.candidate.frameLine, r.distance])).toEqual(got)
      })
    }
  }
  it('gives each match its breakdown, contributions summing to the distance', () => {
    const [top] = rankPrecedents({ storyShear: 200, sdc: 'C' }, candidates, { limit: 1 })
    expect(top!.breakdown.map(b => b.feature)).toEqual(['storyShear', 'sdc'])
    expect(top!.breakdown.reduce((s, b) => s + b.contribution, 0)).toBeCloseTo(top!.distance, 12)
    expect(top!.similarity).toBeCloseTo(Math.exp(-top!.distance), 12)
  })
})

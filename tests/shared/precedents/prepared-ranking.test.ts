import { describe, expect, it } from 'vitest'
import { featureSpreads, prepareCandidates, rankPrecedents, type PrecedentCandidate, type PrecedentQuery, type RankedPrecedent, type Spreads } from '@shared/precedents/similarity'
import { PRECEDENT_FEATURES, type PrecedentFeature } from '@shared/schemas/precedents'
import { rng } from '../../../scripts/bench/synthetic'
import { rankPrecedentsReference } from './reference'

// rankPrecedents ranks from columns (distinct values coded once per list, a term table per query,
// a precomputed tie-break order). Its answers must be exactly those of the straightforward ranking
// it replaced (./reference.ts): same candidates in the same order, the same floating-point distances,
// similarities and breakdowns, bit for bit — on awkward lists too (missing values, ties on distance,
// repeated codes and frame lines, numbers given as strings, non-positive shears, spreads that make
// distances infinite, NaN or negative).

const rand = rng(2024)
const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rand() * xs.length)]!
const maybe = <T>(p: number, x: () => T): T | null | undefined => (rand() < p ? x() : pick([null, undefined, null]))

function candidateList(n: number): PrecedentCandidate[] {
  // undefined where a value is missing, too: lists built in JavaScript may have it.
  const list = Array.from({ length: n }, (_, i) => ({
    // Repeated codes and frame lines, accents and case: the tie-break order is localeCompare's, then list order.
    code: pick(['P-001', 'P-002', 'p-002', 'É-3', 'E-3', 'P-010', `P-${i % 37}`]),
    frameLine: pick(['A', 'B', 'b', 'C', 'A', `L${i % 5}`]),
    storyShear: maybe(0.9, () => pick<number | string>([100, 200, 300, 300, 400, 250.5, 0, -50, '300', 1e-9, Number.NaN])),
    stories: maybe(0.85, () => pick<number | string>([3, 4, 5, 5, 8, '4', -0])),
    storyHeight: maybe(0.9, () => pick([144, 156, 156, 168, 150 + rand()])),
    bayWidth: maybe(0.9, () => pick([240, 300, 360, 360])),
    configuration: maybe(0.9, () => pick(['inverted_v', 'v', 'single_diagonal', 'x'])),
    sdc: maybe(0.9, () => pick(['C', 'D', 'E'])),
    buildingUse: maybe(0.8, () => pick(['office', 'school', 'laboratory'])),
    // A number where a code is expected: compared as String(value), as before.
    supplier: maybe(0.8, () => pick<string | number>(['S1', 'S2', 'S3', 7])),
  }))
  return list as unknown as PrecedentCandidate[]
}

const QUERY_VALUES: Record<PrecedentFeature, readonly (number | string)[]> = {
  storyShear: [300, 250, 333.3, 1e-9, 0, -100, '300'],
  stories: [4, 5, 12, '5'],
  storyHeight: [156, 160.5, 12],
  bayWidth: [300, 330],
  configuration: ['inverted_v', 'v', 'k'],
  sdc: ['C', 'D'],
  buildingUse: ['office', 'parking'],
  supplier: ['S1', 'S3', 7, '7'],
}

function randomQuery(): PrecedentQuery {
  const q: PrecedentQuery = {}
  for (const f of PRECEDENT_FEATURES) if (rand() < 0.55) q[f] = pick(QUERY_VALUES[f])
  return q
}

function randomWeights(): Partial<Record<PrecedentFeature, number>> | undefined {
  const r = rand()
  if (r < 0.4) return undefined
  if (r < 0.5) return Object.fromEntries(PRECEDENT_FEATURES.map(f => [f, 0])) // nothing weighted: []
  return Object.fromEntries(PRECEDENT_FEATURES.filter(() => rand() < 0.5).map(f => [f, pick([0, 0.5, 1, 3, 10, 100])]))
}

function randomSpreads(list: readonly PrecedentCandidate[]): Spreads | undefined {
  const r = rand()
  if (r < 0.35) return undefined
  if (r < 0.55) return featureSpreads(list)
  if (r < 0.7) return { stories: pick([0.5, 2]) } // partial: the rest from the list
  if (r < 0.8) return { storyShear: 0, stories: 0, storyHeight: 0, bayWidth: 0 } // 0/0 = NaN, x/0 = Infinity
  if (r < 0.9) return { storyShear: -1, stories: -2, storyHeight: 1, bayWidth: -0.5 } // negative terms, −0
  return { storyShear: 1, stories: 1, storyHeight: 1, bayWidth: 1 }
}

/** Every number spelled out exactly (shortest round-trip form; −0, NaN and infinities by name). */
function exact(ranked: RankedPrecedent[]): string {
  return JSON.stringify(ranked, (_, v: unknown) => {
    if (typeof v !== 'number') return v
    if (Object.is(v, -0)) return '−0'
    return Number.isFinite(v) ? v : String(v)
  })
}

function expectSame(got: RankedPrecedent[], want: RankedPrecedent[]) {
  expect(got.map(r => r.candidate)).toEqual(want.map(r => r.candidate))
  got.forEach((r, i) => expect(r.candidate).toBe(want[i]!.candidate)) // the same objects, not look-alikes
  expect(exact(got)).toBe(exact(want))
}

describe('rankPrecedents from columns gives the reference answers exactly', () => {
  for (const n of [0, 1, 5, 60, 700]) {
    it(`${n} candidates, 150 random queries`, () => {
      const list = candidateList(n)
      const prepared = prepareCandidates(list)
      let nonEmpty = 0
      for (let k = 0; k < 150; k++) {
        const query = randomQuery()
        const options = { weights: randomWeights(), spreads: randomSpreads(list), limit: pick([undefined, 0, -1, 1, 3, 10, 50, n + 5]) }
        const want = rankPrecedentsReference(query, list, options)
        if (want.length > 0) nonEmpty++
        expectSame(rankPrecedents(query, prepared, options), want)
        expectSame(rankPrecedents(query, list, options), want)
      }
      if (n > 0) expect(nonEmpty).toBeGreaterThan(50) // most queries rank something
    })
  }

  it('the checks can fail: a list in another order breaks ties differently', () => {
    // Two candidates alike in everything, code and frame line included: list order decides.
    const a = { code: 'T', frameLine: 'A', storyShear: 300, stories: 4, storyHeight: 156, bayWidth: 300, configuration: 'v', sdc: 'D', buildingUse: 'office', supplier: 'S1' }
    const b = { ...a }
    const got = rankPrecedents({ storyShear: 300 }, prepareCandidates([a, b]), { limit: 1 })
    expect(got[0]!.candidate).toBe(a)
    expect(() => expectSame(got, rankPrecedentsReference({ storyShear: 300 }, [b, a], { limit: 1 }))).toThrow()
  })

  it('gives distances with infinite and NaN terms as the reference does (zero spreads)', () => {
    const list = candidateList(200)
    const options = { spreads: { storyShear: 0, stories: 0, storyHeight: 0, bayWidth: 0 }, limit: 20 }
    const query = { storyShear: 300, stories: 4, configuration: 'v' }
    const want = rankPrecedentsReference(query, list, options)
    expect(want.some(r => Number.isNaN(r.distance) || r.distance === Infinity)).toBe(true)
    expectSame(rankPrecedents(query, prepareCandidates(list), options), want)
  })

  it('adds −0 terms as the reference does (negative spreads, exact matches)', () => {
    // d = 0 / (−1) = −0 for an exact match: the reference's 0 + (−0) + (−0) is 0, not −0.
    const list = candidateList(80).map((c, i) => (i % 3 ? c : { ...c, storyShear: 300, stories: 4 }))
    const options = { spreads: { storyShear: -1, stories: -2, storyHeight: 1, bayWidth: 1 } }
    for (const query of [{ storyShear: 300, stories: 4 }, { storyShear: 300 }, { storyShear: 300, stories: 4, sdc: 'D' }]) {
      const want = rankPrecedentsReference(query, list, options)
      expect(want.some(r => Object.is(r.breakdown[0]!.contribution, -0))).toBe(true) // the case is really exercised
      expectSame(rankPrecedents(query, prepareCandidates(list), options), want)
    }
  })

  it('lays each feature out as codes into its distinct values (0 = missing)', () => {
    const list = candidateList(50)
    const p = prepareCandidates(list)
    list.forEach((c, j) => {
      const code = p.numeric.stories.codes[j]!
      if (c.stories === null || c.stories === undefined) expect(code).toBe(0)
      else expect(p.numeric.stories.values[code - 1]).toBe(Number(c.stories))
      const s = p.categorical.supplier.codes[j]!
      expect(s === 0 ? null : p.categorical.supplier.values[s - 1]).toBe(c.supplier === null || c.supplier === undefined ? null : String(c.supplier))
    })
    expect(p.spreads).toEqual(featureSpreads(list))
  })
})

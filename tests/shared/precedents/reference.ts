import { DEFAULT_PRECEDENT_WEIGHTS, NUMERIC_FEATURES, PRECEDENT_FEATURES, type PrecedentFeature } from '@shared/schemas/precedents'
import { featureDistance, featureSpreads, type PrecedentCandidate, type PrecedentQuery, type RankedPrecedent, type Spreads } from '@shared/precedents/similarity'

/*
 * Test oracle: the straightforward ranking that shared/precedents/similarity.ts replaced with its
 * columnar one (a featureDistance call per candidate and feature, a full scan keeping the nearest
 * `limit`). Kept only to check that the fast path gives exactly the same answers; not used by the app.
 */

const isNumeric = (f: PrecedentFeature): f is (typeof NUMERIC_FEATURES)[number] => (NUMERIC_FEATURES as readonly string[]).includes(f)

/**
 * Ranks `candidates` against `query`: nearest first, at most `limit`. `weights` override the
 * defaults per feature (0 drops a feature); `spreads` default to `featureSpreads(candidates)`.
 * Returns [] when no feature with a positive weight is described.
 */
export function rankPrecedentsReference<C extends PrecedentCandidate>(
  query: PrecedentQuery,
  candidates: readonly C[],
  options: { weights?: Partial<Record<PrecedentFeature, number>>; spreads?: Spreads; limit?: number } = {},
): RankedPrecedent<C>[] {
  const weights = { ...DEFAULT_PRECEDENT_WEIGHTS, ...options.weights }
  // The history's spreads are worked out here only when the caller did not pass all of them.
  const given = options.spreads ?? {}
  const spreads = NUMERIC_FEATURES.every(f => typeof given[f] === 'number') ? (given as Required<Spreads>) : { ...featureSpreads(candidates), ...given }
  const used = PRECEDENT_FEATURES.filter(f => query[f] !== undefined && query[f] !== null && weights[f] > 0)
  const total = used.reduce((s, f) => s + weights[f], 0)
  if (total === 0) return []
  const spreadOfUsed = used.map(f => (isNumeric(f) ? spreads[f] : 1))
  const distanceOf = (c: C) => {
    let distance = 0
    for (let i = 0; i < used.length; i++) {
      const f = used[i]!
      distance += (weights[f] * featureDistance(f, query[f]!, c[f], spreadOfUsed[i]!)) / total
    }
    return distance
  }
  // Nearest first; ties by code, then frame line, then input order (what a stable sort gives).
  const before = (a: { distance: number; candidate: C; at: number }, b: { distance: number; candidate: C; at: number }) =>
    a.distance - b.distance || a.candidate.code.localeCompare(b.candidate.code) || a.candidate.frameLine.localeCompare(b.candidate.frameLine) || a.at - b.at
  const limit = Math.min(options.limit ?? candidates.length, candidates.length)
  // The `limit` nearest, kept sorted while scanning (most candidates lose to the worst kept on distance alone).
  const best: { distance: number; candidate: C; at: number }[] = []
  for (let at = 0; at < candidates.length && limit > 0; at++) {
    const candidate = candidates[at]!
    const e = { distance: distanceOf(candidate), candidate, at }
    if (best.length === limit) {
      const worst = best[limit - 1]!
      if (e.distance > worst.distance || before(e, worst) >= 0) continue
      best.pop()
    }
    let i = best.length
    while (i > 0 && before(e, best[i - 1]!) < 0) i--
    best.splice(i, 0, e)
  }
  return best.map(({ candidate: c, distance }) => {
    const breakdown = used.map((f, i) => {
      const cand = c[f]
      const d = featureDistance(f, query[f]!, cand, spreadOfUsed[i]!)
      return { feature: f, weight: weights[f], query: query[f]!, candidate: cand, distance: d, contribution: (weights[f] * d) / total }
    })
    return { candidate: c, distance, similarity: Math.exp(-distance), breakdown }
  })
}

import { interquartileRange, standardDeviation } from 'simple-statistics'
import {
  CATEGORICAL_FEATURES,
  DEFAULT_PRECEDENT_WEIGHTS,
  NUMERIC_FEATURES,
  PRECEDENT_FEATURES,
  type FeatureContribution,
  type PrecedentFeature,
} from '../schemas/precedents'

/**
 * Precedent ranking: pure. Every feature is in stored units (kip, in) here.
 *
 * Method
 * - Numeric features: d = |q − c| / s, with s the interquartile range of that feature over all
 *   candidate frames (type-7 quartiles, simple-statistics). The first-story shear is compared on a
 *   log scale: d = |ln(q / c)| / s, with s the IQR of ln(shear) — a 200 → 400 kip step counts as
 *   much as 400 → 800. When the IQR is 0 the standard deviation is used, and when that is 0 too, 1.
 * - Categorical features (configuration, SDC, building use, supplier): d = 0 when equal, 1 otherwise.
 * - A feature the description leaves out is not used; a candidate missing a used feature gets d = 1.
 * - Weighted distance D = Σ wᵢ·dᵢ / Σ wᵢ over the features used; similarity = exp(−D) (1 = identical).
 *   Each feature's contribution wᵢ·dᵢ / Σ wᵢ sums to D, so the breakdown explains the score.
 * - Ties are broken by code, then frame line, so the order is stable.
 */

/** One candidate frame line (stored units: kip, in). */
export interface PrecedentCandidate {
  code: string
  frameLine: string
  storyShear: number | null
  stories: number | null
  storyHeight: number | null
  bayWidth: number | null
  configuration: string | null
  sdc: string | null
  buildingUse: string | null
  supplier: string | null
}

export type PrecedentQuery = Partial<Record<PrecedentFeature, number | string>>
export type Spreads = Partial<Record<(typeof NUMERIC_FEATURES)[number], number>>

export interface RankedPrecedent<C extends PrecedentCandidate = PrecedentCandidate> {
  candidate: C
  distance: number
  similarity: number
  breakdown: FeatureContribution[]
}

const isNumeric = (f: PrecedentFeature): f is (typeof NUMERIC_FEATURES)[number] => (NUMERIC_FEATURES as readonly string[]).includes(f)

/** IQR, else standard deviation, else 1, of the finite positive-or-any values given. */
function spreadOf(values: number[]): number {
  if (values.length < 2) return 1
  const iqr = interquartileRange(values)
  if (iqr > 0) return iqr
  const sd = standardDeviation(values)
  return sd > 0 ? sd : 1
}

/** The spread of each numeric feature over `candidates` (shear on ln scale), as used by `rankPrecedents`. */
export function featureSpreads(candidates: readonly PrecedentCandidate[]): Required<Spreads> {
  const values = (f: (typeof NUMERIC_FEATURES)[number]) =>
    candidates.map(c => c[f]).filter((v): v is number => typeof v === 'number' && Number.isFinite(v) && (f !== 'storyShear' || v > 0))
  return {
    storyShear: spreadOf(values('storyShear').map(Math.log)),
    stories: spreadOf(values('stories')),
    storyHeight: spreadOf(values('storyHeight')),
    bayWidth: spreadOf(values('bayWidth')),
  }
}

/** Normalised distance of one feature (see the method above). */
export function featureDistance(feature: PrecedentFeature, query: number | string, candidate: number | string | null, spread: number): number {
  if (candidate === null || candidate === undefined) return 1
  if (isNumeric(feature)) {
    const q = Number(query)
    const c = Number(candidate)
    if (feature === 'storyShear') return q > 0 && c > 0 ? Math.abs(Math.log(q / c)) / spread : 1
    return Math.abs(q - c) / spread
  }
  return String(query) === String(candidate) ? 0 : 1
}

/**
 * Ranks `candidates` against `query`: nearest first, at most `limit`. `weights` override the
 * defaults per feature (0 drops a feature); `spreads` default to `featureSpreads(candidates)`.
 * Returns [] when no feature with a positive weight is described.
 */
export function rankPrecedents<C extends PrecedentCandidate>(
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

export { CATEGORICAL_FEATURES, NUMERIC_FEATURES }

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

type NumericFeature = (typeof NUMERIC_FEATURES)[number]
type CategoricalFeature = (typeof CATEGORICAL_FEATURES)[number]

/**
 * One feature of a candidate list in columns: `codes[j]` is 0 where candidate j has no value (null
 * or undefined), else 1 + the index of its value in `values` (the distinct values, first seen first:
 * Number(value) for a numeric feature, String(value) for a categorical one).
 */
export interface FeatureColumn<V> {
  readonly codes: Int32Array
  readonly values: readonly V[]
}

/**
 * A candidate list laid out for `rankPrecedents`: a column per feature, the history's spreads and
 * the tie-break order, worked out once per list (pass it instead of the list to rank many queries
 * against the same history). Built by `prepareCandidates`; the list must not change afterwards.
 */
export interface PreparedCandidates<C extends PrecedentCandidate = PrecedentCandidate> {
  readonly candidates: readonly C[]
  readonly numeric: Readonly<Record<NumericFeature, FeatureColumn<number>>>
  readonly categorical: Readonly<Record<CategoricalFeature, FeatureColumn<string>>>
  /** Each candidate's place in the tie-break order: code, then frame line (localeCompare), then list order. */
  readonly tieRank: Int32Array
  /** `featureSpreads(candidates)`. */
  readonly spreads: Required<Spreads>
}

function column<C extends PrecedentCandidate, V>(candidates: readonly C[], f: PrecedentFeature, key: (v: number | string) => V): FeatureColumn<V> {
  const codes = new Int32Array(candidates.length)
  const values: V[] = []
  const index = new Map<V, number>()
  for (let j = 0; j < candidates.length; j++) {
    const v = candidates[j]![f]
    if (v === null || v === undefined) continue
    const k = key(v)
    let code = index.get(k)
    if (code === undefined) {
      values.push(k)
      index.set(k, (code = values.length))
    }
    codes[j] = code
  }
  return { codes, values }
}

/** Lays `candidates` out in columns for `rankPrecedents` (see `PreparedCandidates`). */
export function prepareCandidates<C extends PrecedentCandidate>(candidates: readonly C[]): PreparedCandidates<C> {
  const numeric = Object.fromEntries(NUMERIC_FEATURES.map(f => [f, column(candidates, f, Number)])) as Record<NumericFeature, FeatureColumn<number>>
  const categorical = Object.fromEntries(CATEGORICAL_FEATURES.map(f => [f, column(candidates, f, String)])) as Record<CategoricalFeature, FeatureColumn<string>>
  const n = candidates.length
  const order = Array.from({ length: n }, (_, j) => j)
  order.sort((a, b) => {
    const x = candidates[a]!
    const y = candidates[b]!
    return x.code.localeCompare(y.code) || x.frameLine.localeCompare(y.frameLine) || a - b
  })
  const tieRank = new Int32Array(n)
  for (let k = 0; k < n; k++) tieRank[order[k]!] = k
  return { candidates, numeric, categorical, tieRank, spreads: featureSpreads(candidates) }
}

const isPrepared = <C extends PrecedentCandidate>(x: readonly C[] | PreparedCandidates<C>): x is PreparedCandidates<C> => !Array.isArray(x)

/**
 * Ranks `candidates` (a list, or the same list laid out by `prepareCandidates`) against `query`:
 * nearest first, at most `limit`. `weights` override the defaults per feature (0 drops a feature);
 * `spreads` default to `featureSpreads(candidates)`. Returns [] when no feature with a positive
 * weight is described.
 *
 * Every distance is the same floating-point sum, term by term in feature order, as `featureDistance`
 * gives; the nearest `limit` are kept while scanning in list order; only those get a breakdown.
 */
export function rankPrecedents<C extends PrecedentCandidate>(
  query: PrecedentQuery,
  candidates: readonly C[] | PreparedCandidates<C>,
  options: { weights?: Partial<Record<PrecedentFeature, number>>; spreads?: Spreads; limit?: number } = {},
): RankedPrecedent<C>[] {
  const prepared = isPrepared(candidates) ? candidates : prepareCandidates(candidates)
  const list = prepared.candidates
  const n = list.length
  const weights = { ...DEFAULT_PRECEDENT_WEIGHTS, ...options.weights }
  // The history's spreads apply only where the caller did not pass all of them.
  const given = options.spreads ?? {}
  const spreads = NUMERIC_FEATURES.every(f => typeof given[f] === 'number') ? (given as Required<Spreads>) : { ...prepared.spreads, ...given }
  const used = PRECEDENT_FEATURES.filter(f => query[f] !== undefined && query[f] !== null && weights[f] > 0)
  const total = used.reduce((s, f) => s + weights[f], 0)
  if (total === 0) return []
  const spreadOfUsed = used.map(f => (isNumeric(f) ? spreads[f] : 1))

  // d of each distinct value of each feature used, already as its term w·d / Σw of the distance.
  const terms: Float64Array[] = []
  const columns: Int32Array[] = []
  for (let i = 0; i < used.length; i++) {
    const f = used[i]!
    const w = weights[f]
    const spread = spreadOfUsed[i]!
    const { codes, values } = isNumeric(f) ? prepared.numeric[f] : prepared.categorical[f as CategoricalFeature]
    const term = new Float64Array(values.length + 1)
    term[0] = (w * 1) / total // no value: d = 1
    if (isNumeric(f)) {
      const q = Number(query[f])
      for (let k = 0; k < values.length; k++) {
        const c = values[k] as number
        const d = f === 'storyShear' ? (q > 0 && c > 0 ? Math.abs(Math.log(q / c)) / spread : 1) : Math.abs(q - c) / spread
        term[k + 1] = (w * d) / total
      }
    } else {
      const q = String(query[f])
      for (let k = 0; k < values.length; k++) term[k + 1] = (w * (values[k] === q ? 0 : 1)) / total
    }
    terms.push(term)
    columns.push(codes)
  }
  const limit = Math.min(options.limit ?? n, n)
  const best = nearest(terms, columns, prepared.tieRank, limit, scratchOf(prepared))
  return best.map(({ at, distance }) => {
    const c = list[at]!
    const breakdown = used.map((f, i) => {
      const cand = c[f]
      const d = featureDistance(f, query[f]!, cand, spreadOfUsed[i]!)
      return { feature: f, weight: weights[f], query: query[f]!, candidate: cand, distance: d, contribution: (weights[f] * d) / total }
    })
    return { candidate: c, distance, similarity: Math.exp(-distance), breakdown }
  })
}

interface Kept {
  at: number
  distance: number
}

/** One distance buffer per prepared list, reused by every ranking (rankPrecedents runs to the end synchronously). */
const scratch = new WeakMap<PreparedCandidates, Float64Array>()
function scratchOf(prepared: PreparedCandidates): Float64Array {
  let buffer = scratch.get(prepared)
  if (!buffer) scratch.set(prepared, (buffer = new Float64Array(prepared.candidates.length)))
  return buffer
}

/**
 * The `limit` nearest of the candidates whose distances are D = ((0 + t₁) + t₂) + … with
 * tᵢ = terms[i][columns[i][j]] (the feature terms added in feature order, as the weighted mean of
 * featureDistance gives them). Nearest first; ties by code, then frame line, then input order
 * (`tieRank`: what a stable sort gives). Kept sorted while scanning in list order: most candidates
 * lose to the worst kept on distance alone. `distance` is a scratch buffer of one slot a candidate.
 */
function nearest(terms: readonly Float64Array[], columns: readonly Int32Array[], tieRank: Int32Array, limit: number, distance: Float64Array): Kept[] {
  const n = tieRank.length
  const m = terms.length
  // Every feature but the last, one at a time. 0 + t is t unless t is −0, so the first is assigned
  // rather than added when it has no −0.
  let from = 0
  if (m === 1 || terms[0]!.some(t => Object.is(t, -0))) distance.fill(0)
  else {
    const first = terms[0]!
    const codes = columns[0]!
    for (let j = 0; j < n; j++) distance[j] = first[codes[j]!]!
    from = 1
  }
  for (let i = from; i < m - 1; i++) {
    const term = terms[i]!
    const codes = columns[i]!
    for (let j = 0; j < n; j++) distance[j] += term[codes[j]!]!
  }
  // The last feature, added while choosing.
  const last = terms[m - 1]!
  const lastCodes = columns[m - 1]!
  const before = (a: number, b: number) => distance[a]! - distance[b]! || tieRank[a]! - tieRank[b]!
  const best: number[] = []
  let worstDistance = 0
  let worstTie = 0
  for (let at = 0; at < n && limit > 0; at++) {
    const d = (distance[at] = distance[at]! + last[lastCodes[at]!]!)
    if (best.length === limit) {
      if (d > worstDistance || (d - worstDistance || tieRank[at]! - worstTie) >= 0) continue
      best.pop()
    }
    let i = best.length
    while (i > 0 && before(at, best[i - 1]!) < 0) i--
    best.splice(i, 0, at)
    if (best.length === limit) {
      const worst = best[limit - 1]!
      worstDistance = distance[worst]!
      worstTie = tieRank[worst]!
    }
  }
  return best.map(at => ({ at, distance: distance[at]! }))
}

export { CATEGORICAL_FEATURES, NUMERIC_FEATURES }

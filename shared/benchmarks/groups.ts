import {
  BENCHMARK_METRICS,
  HEIGHT_BANDS,
  MIN_PUBLISHED_GROUP,
  SUPPRESSED_MESSAGE,
  heightBandOf,
  yearBandOf,
  type BenchmarkGroup,
  type BenchmarkGrouping,
  type BenchmarkMetric,
  type ProposalBody,
  type ProposalResponse,
} from '../schemas/benchmarks'
import { KG_PER_TONNE, LB_PER_SHORT_TON } from '../units/constants'
import { kipToKn } from '../units/force'
import { in2ToMm2 } from '../units/area'
import { lbPerFt2ToKgPerM2, lbToKg, shortTonToTonne } from '../units/mass'
import { bandOfSorted, type Band } from './percentiles'

/**
 * Benchmark groups from per-project figures: pure, so the confidentiality and suppression rules
 * can be tested without a database (the API applies them through `audience`).
 */

type TonnageByCategory = Partial<Record<'braces' | 'beams' | 'columns' | 'connections' | 'lateral_total' | 'structural_total', number>>

/** What the benchmarks need of one finished project (stored units: ft², kip, in², short tons). */
export interface BenchmarkProject {
  code: string
  name: string
  clientConfidential: boolean
  benchmarkPermitted: boolean
  buildingUse: string | null
  stories: number | null
  sdc: string | null
  region: string | null
  yearDesigned: number | null
  floorAreaFt2: number | null
  /** Braced frame lines. */
  frames: number
  /** Σ over frame lines of the first-story design shear, kip. */
  baseShearKip: number | null
  /** Σ over braces of brace count × final (governing, confirmed) core area, in²; null when any brace has none. */
  totalCoreAreaIn2: number | null
  tonnage: { preliminary: TonnageByCategory; final: TonnageByCategory }
}

export type Audience = 'analyst' | 'bd'
export type Units = 'us' | 'si'

/** Lateral steel of a stage: the `lateral_total` row, else the sum of braces, beams, columns and connections when all four exist. */
export function lateralTons(t: TonnageByCategory): number | null {
  if (t.lateral_total !== undefined) return t.lateral_total
  const parts = [t.braces, t.beams, t.columns, t.connections]
  return parts.every(p => p !== undefined) ? parts.reduce((a, b) => a! + b!, 0)! : null
}

const ratio = (a: number | null | undefined, b: number | null | undefined) => (a != null && b != null && b > 0 ? a / b : null)

/** Each metric of one project, in `units` (see `METRIC_UNITS`); null when an input is missing. */
export function projectMetrics(p: BenchmarkProject, units: Units): Record<BenchmarkMetric, number | null> {
  const lateral = lateralTons(p.tonnage.final)
  const structural = p.tonnage.final.structural_total ?? null
  const braces = p.tonnage.final.braces ?? null
  const si = units === 'si'
  const tons = (t: number | null) => (t === null ? null : si ? shortTonToTonne(t) : t)
  const perArea = (t: number | null) => {
    const lbPerFt2 = ratio(t === null ? null : t * LB_PER_SHORT_TON, p.floorAreaFt2)
    return lbPerFt2 === null ? null : si ? lbPerFt2ToKgPerM2(lbPerFt2) : lbPerFt2
  }
  const spread = (fin: number | null, pre: number | null) => {
    const r = ratio(fin, pre)
    return r === null ? null : r - 1
  }
  const bracePerCore = (() => {
    if (braces === null || !p.totalCoreAreaIn2) return null
    const lb = braces * LB_PER_SHORT_TON
    return si ? lbToKg(lb) / in2ToMm2(p.totalCoreAreaIn2) : lb / p.totalCoreAreaIn2
  })()
  return {
    lateralPerFloorArea: perArea(lateral),
    structuralPerFloorArea: perArea(structural),
    lateralPerFrame: ratio(tons(lateral), p.frames),
    lateralPerStory: ratio(tons(lateral), p.stories),
    lateralPerBaseShear: ratio(tons(lateral), p.baseShearKip === null ? null : si ? kipToKn(p.baseShearKip) : p.baseShearKip),
    bracePerCoreArea: bracePerCore,
    lateralEstimateSpread: spread(lateral, lateralTons(p.tonnage.preliminary)),
    structuralEstimateSpread: spread(structural, p.tonnage.preliminary.structural_total ?? null),
  }
}

/** The group key of a project under a grouping ('unknown' when the field is empty). */
export function groupKeyOf(p: BenchmarkProject, groupBy: BenchmarkGrouping): string {
  const key =
    groupBy === 'use' ? p.buildingUse : groupBy === 'heightBand' ? heightBandOf(p.stories) : groupBy === 'sdc' ? p.sdc : groupBy === 'region' ? p.region : yearBandOf(p.yearDesigned)
  return key ?? 'unknown'
}

/** May `p` be named (code, name) to `audience`? Business development: only non-confidential, benchmark-permitted projects. */
export function isNameable(p: BenchmarkProject, audience: Audience): boolean {
  return audience === 'analyst' || (!p.clientConfidential && p.benchmarkPermitted)
}

/**
 * `projectMetrics` remembered per project object and units: a benchmark list is read once per data
 * version and its objects are never changed, so every request over that list reuses the figures.
 */
const metricsMemo = { us: new WeakMap<BenchmarkProject, Record<BenchmarkMetric, number | null>>(), si: new WeakMap<BenchmarkProject, Record<BenchmarkMetric, number | null>>() }
function metricsOf(p: BenchmarkProject, units: Units): Record<BenchmarkMetric, number | null> {
  const memo = metricsMemo[units]
  let m = memo.get(p)
  if (!m) memo.set(p, (m = projectMetrics(p, units)))
  return m
}

/**
 * Percentile bands of every metric over `members`: `percentileBand` of each metric's values, with
 * the finite values of a metric gathered straight into a typed array and sorted there (no array of
 * boxed values per metric, no comparator).
 */
export function metricBands(members: readonly BenchmarkProject[], units: Units): NonNullable<BenchmarkGroup['metrics']> {
  const rows = members.map(m => metricsOf(m, units))
  const values = new Float64Array(rows.length)
  const bands: Partial<Record<BenchmarkMetric, Band | null>> = {}
  for (const k of BENCHMARK_METRICS) {
    let n = 0
    for (let i = 0; i < rows.length; i++) {
      const v = rows[i]![k]
      if (v !== null && Number.isFinite(v)) values[n++] = v
    }
    bands[k] = n ? bandOfSorted(values.slice(0, n).sort()) : null
  }
  return bands as NonNullable<BenchmarkGroup['metrics']>
}

/**
 * One benchmark group as `audience` may see it. For `bd` a group of fewer than
 * `MIN_PUBLISHED_GROUP` projects is suppressed: `suppressed: true`, the message, no figures, no count and no names.
 */
export function publishGroup(key: string, members: readonly BenchmarkProject[], units: Units, audience: Audience): BenchmarkGroup {
  if (audience === 'bd' && members.length < MIN_PUBLISHED_GROUP) return { key, n: null, suppressed: true, message: SUPPRESSED_MESSAGE }
  return {
    key,
    n: members.length,
    suppressed: false,
    metrics: metricBands(members, units),
    projects: members.filter(m => isNameable(m, audience)).map(m => ({ code: m.code, name: m.name })),
  }
}

/** Groups of `projects` by `groupBy`, in a stable order (height bands low to high, else by key). */
export function buildGroups(projects: readonly BenchmarkProject[], groupBy: BenchmarkGrouping, units: Units, audience: Audience): BenchmarkGroup[] {
  const byKey = new Map<string, BenchmarkProject[]>()
  for (const p of projects) {
    const k = groupKeyOf(p, groupBy)
    const members = byKey.get(k)
    if (members) members.push(p)
    else byKey.set(k, [p])
  }
  const bandOrder = (k: string) => {
    const i = HEIGHT_BANDS.findIndex(b => b.label === k)
    return i < 0 ? HEIGHT_BANDS.length : i
  }
  const keys = [...byKey.keys()].sort((a, b) => (groupBy === 'heightBand' ? bandOrder(a) - bandOrder(b) : 0) || (a === 'unknown' ? 1 : b === 'unknown' ? -1 : a.localeCompare(b)))
  return keys.map(k => publishGroup(k, byKey.get(k)!, units, audience))
}

/** The comparison group of a proposal and its bands: what `proposalFor` gives before the floor area scales it. */
export interface ProposalGroup {
  group: { criteria: Record<string, string>; n: number } | null
  bands: NonNullable<BenchmarkGroup['metrics']> | null
  widened: string[]
}

/** What `proposalGroup` depends on: equal keys give the same group (the floor area plays no part). */
export const proposalGroupKey = (body: ProposalBody): string => JSON.stringify([body.use, heightBandOf(body.stories), body.sdc ?? null, body.region ?? null, body.units])

/**
 * The group a proposal is benchmarked against: the first of these with at least
 * `MIN_PUBLISHED_GROUP` projects having a lateral figure per floor area —
 * use + height band + SDC + region, use + height band + SDC, use + height band, use, height band, all projects
 * (criteria not given in the body are skipped). Depends only on the fields of `proposalGroupKey`.
 */
export function proposalGroup(projects: readonly BenchmarkProject[], body: Pick<ProposalBody, 'use' | 'stories' | 'sdc' | 'region' | 'units'>): ProposalGroup {
  const band = heightBandOf(body.stories)!
  const ladder: Record<string, string>[] = []
  const full: Record<string, string> = { use: body.use, heightBand: band }
  if (body.sdc) full.sdc = body.sdc
  if (body.region) ladder.push({ ...full, region: body.region })
  if (body.sdc) ladder.push({ ...full })
  ladder.push({ use: body.use, heightBand: band }, { use: body.use }, { heightBand: band }, {})
  const matches = (p: BenchmarkProject, c: Record<string, string>) =>
    (c.use === undefined || p.buildingUse === c.use) &&
    (c.heightBand === undefined || heightBandOf(p.stories) === c.heightBand) &&
    (c.sdc === undefined || p.sdc === c.sdc) &&
    (c.region === undefined || p.region === c.region)
  const widened: string[] = []
  for (const criteria of ladder) {
    const members = projects.filter(p => matches(p, criteria))
    const bands = members.length >= MIN_PUBLISHED_GROUP ? metricBands(members, body.units) : null
    if (!bands?.lateralPerFloorArea || bands.lateralPerFloorArea.n < MIN_PUBLISHED_GROUP) {
      widened.push(describeCriteria(criteria))
      continue
    }
    return { group: { criteria, n: members.length }, bands, widened }
  }
  return { group: null, bands: null, widened }
}

/** The benchmark range and expected tonnage of one building over `projects`: `proposalFromGroup` of its `proposalGroup`. */
export function proposalFor(projects: readonly BenchmarkProject[], body: ProposalBody): Omit<ProposalResponse, 'cautions'> & { widened: string[] } {
  return proposalFromGroup(body, proposalGroup(projects, body))
}

/** The range and expected tonnage of one building from its comparison group: expected tonnage = band × floor area. */
export function proposalFromGroup(body: ProposalBody, group: ProposalGroup): Omit<ProposalResponse, 'cautions'> & { widened: string[] } {
  const unitPerArea = body.units === 'si' ? 'kg/m²' : 'lb/ft²'
  const massPerTon = body.units === 'si' ? KG_PER_TONNE : LB_PER_SHORT_TON
  const { bands, widened } = group
  if (!group.group || !bands) return { group: null, lateralPerFloorArea: null, structuralPerFloorArea: null, perFloorAreaUnit: unitPerArea, expectedLateral: null, expectedStructural: null, widened: [...widened] }
  const expected = (b: Band | null) =>
    b ? { low: (b.p25 * body.floorArea) / massPerTon, median: (b.p50 * body.floorArea) / massPerTon, high: (b.p75 * body.floorArea) / massPerTon, unit: body.units === 'si' ? 'tonne' : 'ton' } : null
  return {
    group: { criteria: { ...group.group.criteria }, n: group.group.n },
    lateralPerFloorArea: bands.lateralPerFloorArea,
    structuralPerFloorArea: bands.structuralPerFloorArea,
    perFloorAreaUnit: unitPerArea,
    expectedLateral: expected(bands.lateralPerFloorArea),
    expectedStructural: expected(bands.structuralPerFloorArea),
    widened: [...widened],
  }
}

/** 'use office, heightBand 4–7 stories' (or 'all projects'). */
export function describeCriteria(c: Record<string, string>): string {
  const parts = Object.entries(c).map(([k, v]) => `${k} ${v}`)
  return parts.length ? parts.join(', ') : 'all projects'
}

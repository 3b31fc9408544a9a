import { z } from 'zod'
import { BUILDING_USES, SDCS } from './projects'

/**
 * Steel tonnage benchmarks contract (principal, business development).
 *
 * `GET /api/benchmarks?groupBy=…` answers per group of finished projects: n, and P10/P25/median/
 * P75/P90 bands (quantile definition: `shared/benchmarks/percentiles.ts`) of
 * - lateral-system steel and total structural steel per gross floor area: lb/ft² (`units=si`: kg/m²);
 * - lateral tons per braced frame line, per story, per kip of base shear (si: tonnes, per kN);
 *   base shear = the sum over the project's frame lines of their first-story design shear;
 * - brace steel per total core area (Σ braces × final core area): lb/in² (si: kg/mm²);
 * - the spread final / preliminary − 1 of the lateral and structural estimates.
 *
 * Confidentiality (enforced by the API): for `bd`, client-confidential projects count in the
 * statistics but are never named (code, name or client) — only projects both not confidential and
 * `benchmark_permitted` are listed — and a group of fewer than `MIN_PUBLISHED_GROUP` projects is
 * returned as `suppressed: true` with the message and no figures (not even its count). Principals see every group and every project.
 */

/** Smallest group whose figures business development may see (common practice, no source). */
export const MIN_PUBLISHED_GROUP = 5
export const SUPPRESSED_MESSAGE = 'too few projects to publish'

export const BENCHMARK_GROUPINGS = ['use', 'heightBand', 'sdc', 'region', 'years'] as const
export type BenchmarkGrouping = (typeof BENCHMARK_GROUPINGS)[number]

/** Height bands by stories above grade: label → inclusive range. */
export const HEIGHT_BANDS = [
  { label: '1–3 stories', min: 1, max: 3 },
  { label: '4–7 stories', min: 4, max: 7 },
  { label: '8–12 stories', min: 8, max: 12 },
  { label: '13+ stories', min: 13, max: Infinity },
] as const

/** The height band label of a story count. */
export function heightBandOf(stories: number | null): string | null {
  if (stories === null || !Number.isFinite(stories) || stories < 1) return null
  return HEIGHT_BANDS.find(b => stories >= b.min && stories <= b.max)!.label
}

/** Five-year bands of the year designed: 2017 → '2015–2019'. */
export function yearBandOf(year: number | null): string | null {
  if (year === null || !Number.isFinite(year)) return null
  const start = Math.floor(year / 5) * 5
  return `${start}–${start + 4}`
}

const splitList = (v: unknown) => (v === undefined || v === '' ? undefined : Array.isArray(v) ? v : String(v).split(','))
/** A comma-separated list of free-text values (at most 50). */
const textList = () => z.preprocess(splitList, z.array(z.string().trim().min(1).max(80)).max(50).optional())
/** A comma-separated list of enum values (at most 50). */
const enumList = <T extends readonly [string, ...string[]]>(values: T) => z.preprocess(splitList, z.array(z.enum(values)).max(50).optional())
const optInt = (min: number, max: number) => z.preprocess(v => (v === '' ? undefined : v), z.coerce.number().int().min(min).max(max).optional())

export const BenchmarkQuery = z.object({
  groupBy: z.enum(BENCHMARK_GROUPINGS).default('use'),
  units: z.enum(['us', 'si']).default('us'),
  yearFrom: optInt(1900, 2100),
  yearTo: optInt(1900, 2100),
  use: enumList(BUILDING_USES),
  sdc: enumList(SDCS),
  region: textList(),
})
export type BenchmarkQuery = z.infer<typeof BenchmarkQuery>

/** P10, P25, median, P75, P90 of one metric over the group's projects that have it (`n`). */
export const PercentileBand = z.object({ n: z.number().int(), p10: z.number(), p25: z.number(), p50: z.number(), p75: z.number(), p90: z.number() })
export type PercentileBand = z.infer<typeof PercentileBand>

export const BENCHMARK_METRICS = [
  'lateralPerFloorArea',
  'structuralPerFloorArea',
  'lateralPerFrame',
  'lateralPerStory',
  'lateralPerBaseShear',
  'bracePerCoreArea',
  'lateralEstimateSpread',
  'structuralEstimateSpread',
] as const
export type BenchmarkMetric = (typeof BENCHMARK_METRICS)[number]

/** Unit of each metric by system. */
export const METRIC_UNITS: Record<BenchmarkMetric, { us: string; si: string }> = {
  lateralPerFloorArea: { us: 'lb/ft²', si: 'kg/m²' },
  structuralPerFloorArea: { us: 'lb/ft²', si: 'kg/m²' },
  lateralPerFrame: { us: 'ton/frame', si: 'tonne/frame' },
  lateralPerStory: { us: 'ton/story', si: 'tonne/story' },
  lateralPerBaseShear: { us: 'ton/kip', si: 'tonne/kN' },
  bracePerCoreArea: { us: 'lb/in²', si: 'kg/mm²' },
  lateralEstimateSpread: { us: 'fraction', si: 'fraction' },
  structuralEstimateSpread: { us: 'fraction', si: 'fraction' },
}

export const BenchmarkGroup = z.object({
  key: z.string(),
  /** Projects in the group; null when suppressed (a small count can itself point at a project). */
  n: z.number().int().nullable(),
  suppressed: z.boolean(),
  /** Set when suppressed: "too few projects to publish". */
  message: z.string().optional(),
  /** Absent when suppressed; a metric no project of the group has is null. */
  metrics: z.record(z.enum(BENCHMARK_METRICS), PercentileBand.nullable()).optional(),
  /** Projects that may be named to the caller (see the confidentiality rule above). */
  projects: z.array(z.object({ code: z.string(), name: z.string() })).optional(),
})
export type BenchmarkGroup = z.infer<typeof BenchmarkGroup>

export const BenchmarkResponse = z.object({
  groupBy: z.enum(BENCHMARK_GROUPINGS),
  units: z.enum(['us', 'si']),
  metricUnits: z.record(z.string(), z.string()),
  /** Finished projects counted (confidential ones included). */
  n: z.number().int(),
  groups: z.array(BenchmarkGroup),
  cautions: z.array(z.string()),
})
export type BenchmarkResponse = z.infer<typeof BenchmarkResponse>

/** `POST /api/benchmarks/proposal`: a building a fee proposal is for. `floorArea`: ft² (us) or m² (si). */
export const ProposalBody = z
  .object({
    use: z.enum(BUILDING_USES),
    stories: z.number().int().min(1).max(200),
    floorArea: z.number().finite().positive().max(1e8),
    sdc: z.enum(SDCS).optional(),
    region: z.string().trim().min(1).max(80).optional(),
    units: z.enum(['us', 'si']).default('us'),
  })
  .strict()
export type ProposalBody = z.infer<typeof ProposalBody>

/** Expected steel for one category: the P25–P75 range and the median, in short tons (us) or tonnes (si). */
export const ExpectedTonnage = z.object({ low: z.number(), median: z.number(), high: z.number(), unit: z.string() })

export const ProposalResponse = z.object({
  /** The benchmark group used: the criteria it matched and its size. */
  group: z.object({ criteria: z.record(z.string(), z.string()), n: z.number().int() }).nullable(),
  lateralPerFloorArea: PercentileBand.nullable(),
  structuralPerFloorArea: PercentileBand.nullable(),
  perFloorAreaUnit: z.string(),
  expectedLateral: ExpectedTonnage.nullable(),
  expectedStructural: ExpectedTonnage.nullable(),
  cautions: z.array(z.string()),
})
export type ProposalResponse = z.infer<typeof ProposalResponse>

/**
 * `POST /api/benchmarks/proposal/email` (principal, bd): the proposal sheet of `profile` as a PDF
 * attachment to `to`. `POST /api/benchmarks/proposal.pdf` takes a `ProposalBody` and answers the PDF.
 */
export const ProposalEmailBody = z
  .object({
    profile: ProposalBody,
    to: z.email({ message: 'Enter the recipient’s e-mail address.' }).max(200),
  })
  .strict()
export type ProposalEmailBody = z.infer<typeof ProposalEmailBody>

export const ProposalEmailSent = z.object({ to: z.string(), fileName: z.string() })
export type ProposalEmailSent = z.infer<typeof ProposalEmailSent>

/** Proposal e-mails one user may send per hour (a sheet goes to a client or a colleague, not to a list). */
export const PROPOSAL_EMAILS_PER_HOUR = 10

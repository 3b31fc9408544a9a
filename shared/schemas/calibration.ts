import { z } from 'zod'

/**
 * The calibration review and starting-factor contract: query filters and answers, shared by the
 * API (validation, response shape) and the dashboard (typed client, URL state).
 *
 * Vocabulary
 * - a *pair* is one brace's assumed snapshot (the chosen early phase, schematic design by default)
 *   and its final (governing) snapshot, both confirmed (nothing waiting in the review queue);
 * - the *ratio* of a quantity is assumed / final; below 1 means the final exceeded the assumption;
 * - a strength-side quantity is judged one-sided: final > assumed is an *underestimate*, the
 *   unconservative case for capacity design; the stiffness factor is judged two-sided against the
 *   firm's tolerance band (±10 % common practice, no source);
 * - values on different bases (β/ω deformation basis, yield basis, AISC 341 edition) carry a
 *   `basis` label and are summarised separately, never pooled.
 */

export const CALIBRATION_QUANTITIES = ['beta', 'omega', 'overstrength', 'stiffness', 'coreArea', 'tmax', 'cmax'] as const
export type CalibrationQuantity = (typeof CALIBRATION_QUANTITIES)[number]

export const QUANTITY_INFO: Record<CalibrationQuantity, { label: string; side: 'strength' | 'band'; unit: 'ratio' | 'ksi' | 'in2' | 'kip'; help: string }> = {
  beta: { label: 'β (compression strength adjustment)', side: 'strength', unit: 'ratio', help: 'Assumed β against the supplier’s qualified β at its stated deformation.' },
  omega: { label: 'ω (strain hardening adjustment)', side: 'strength', unit: 'ratio', help: 'Assumed ω against the supplier’s qualified ω at its stated deformation.' },
  overstrength: {
    label: 'Expected core yield stress',
    side: 'strength',
    unit: 'ksi',
    help: 'Assumed Ry·Fysc (or the yield-range upper bound) against the coupon-tested (or mill-certified) core yield stress.',
  },
  stiffness: { label: 'Stiffness factor', side: 'band', unit: 'ratio', help: 'Assumed against final brace stiffness factor; judged against the two-sided tolerance band.' },
  coreArea: { label: 'Core area', side: 'strength', unit: 'in2', help: 'Preliminary against final steel core area; a larger final core raises every capacity-design force.' },
  tmax: { label: 'Tmax (adjusted tension strength)', side: 'strength', unit: 'kip', help: 'ω·Ry·Fysc·Asc from the assumed values against the final ones (AISC 341-16 F4.2a).' },
  cmax: { label: 'Cmax (adjusted compression strength)', side: 'strength', unit: 'kip', help: 'β·ω·Ry·Fysc·Asc from the assumed values against the final ones (AISC 341-16 F4.2a).' },
}

export const CALIBRATION_GROUPINGS = ['supplier', 'configuration', 'yearBand', 'office', 'none'] as const
export type CalibrationGrouping = (typeof CALIBRATION_GROUPINGS)[number]

/** Early phases an assumption can be taken from. */
export const ASSUMED_PHASES = ['sd', 'dd', 'cd'] as const

const list = z.preprocess(v => (v === undefined || v === '' ? undefined : Array.isArray(v) ? v : String(v).split(',')), z.array(z.string().min(1).max(80)).max(50).optional())
const optInt = (min: number, max: number) => z.preprocess(v => (v === '' ? undefined : v), z.coerce.number().int().min(min).max(max).optional())
const optNum = (min: number, max: number) => z.preprocess(v => (v === '' ? undefined : v), z.coerce.number().min(min).max(max).optional())

/**
 * Filters shared by every calibration endpoint and kept in the dashboard URL (same names), so a
 * view can be bookmarked. Lists are comma-separated in a query string.
 */
export const CalibrationFilters = z
  .object({
    yearFrom: optInt(1900, 2100),
    yearTo: optInt(1900, 2100),
    /** Supplier codes. */
    supplier: list,
    /** Building uses (as stored). */
    use: list,
    sdc: list,
    /** AISC 341 editions. */
    codeEdition: list,
    configuration: list,
    storiesMin: optInt(1, 200),
    storiesMax: optInt(1, 200),
    /** Final core area band, in². */
    coreAreaMin: optNum(0, 1000),
    coreAreaMax: optNum(0, 1000),
    /** Which early phase counts as the assumption. */
    phase: z.enum(ASSUMED_PHASES).default('sd'),
  })
  .strict()
export type CalibrationFilters = z.infer<typeof CalibrationFilters>

export const QuantityQuery = z.object({ quantity: z.enum(CALIBRATION_QUANTITIES).default('cmax') })
export const GroupQuery = z.object({ groupBy: z.enum(CALIBRATION_GROUPINGS).default('supplier') })

/** GET /api/calibration/options — what the filters can take, from the loaded history. */
export const CalibrationOptions = z.object({
  suppliers: z.array(z.object({ code: z.string(), name: z.string() })),
  uses: z.array(z.string()),
  sdcs: z.array(z.string()),
  codeEditions: z.array(z.string()),
  configurations: z.array(z.string()),
  offices: z.array(z.string()),
  years: z.object({ min: z.number().int(), max: z.number().int() }).nullable(),
  stories: z.object({ min: z.number().int(), max: z.number().int() }).nullable(),
  /** Number of braces with a confirmed assumed/final pair under the default filters. */
  pairs: z.number().int(),
  /** Firm settings the screens show: stiffness band (fraction) and small-group threshold. */
  stiffnessTolerance: z.number(),
  minGroupSize: z.number().int(),
})
export type CalibrationOptions = z.infer<typeof CalibrationOptions>

/**
 * GET /api/calibration/points?quantity&groupBy&filters — one point per brace. JSON by default;
 * an Arrow IPC stream with the same columns when the request sends
 * `Accept: application/vnd.apache.arrow.stream`.
 */
export const CalibrationPoint = z.object({
  braceId: z.number().int(),
  projectCode: z.string(),
  projectName: z.string(),
  frameLine: z.string(),
  level: z.string(),
  group: z.string(),
  basis: z.string(),
  assumed: z.number(),
  final: z.number(),
})
export type CalibrationPoint = z.infer<typeof CalibrationPoint>
export const CalibrationPoints = z.object({ quantity: z.enum(CALIBRATION_QUANTITIES), points: z.array(CalibrationPoint) })
export type CalibrationPoints = z.infer<typeof CalibrationPoints>
export const ARROW_STREAM_TYPE = 'application/vnd.apache.arrow.stream'

/** Distribution of assumed / final within one group on one basis. */
export const RatioSummary = z.object({
  group: z.string(),
  basis: z.string(),
  n: z.number().int(),
  min: z.number(),
  q1: z.number(),
  median: z.number(),
  q3: z.number(),
  max: z.number(),
  mean: z.number(),
  /** Box-plot whiskers: furthest points within 1.5 IQR of the quartiles (Tukey). */
  whiskerLow: z.number(),
  whiskerHigh: z.number(),
  /** Share of braces whose final exceeded the assumption (ratio < 1). */
  underestimateRate: z.number(),
  /** Share outside the ±tolerance band (stiffness: the two-sided judgement; shown for all). */
  outsideBandRate: z.number(),
  histogram: z.array(z.object({ x0: z.number(), x1: z.number(), count: z.number().int() })),
})
export type RatioSummary = z.infer<typeof RatioSummary>

/** GET /api/calibration/summary?quantity&groupBy&filters */
export const CalibrationSummary = z.object({
  quantity: z.enum(CALIBRATION_QUANTITIES),
  side: z.enum(['strength', 'band']),
  tolerance: z.number(),
  groups: z.array(RatioSummary),
  /** All braces of the filter, still split by basis. */
  overall: z.array(RatioSummary),
})
export type CalibrationSummary = z.infer<typeof CalibrationSummary>

/** GET /api/calibration/trend?quantity&filters — by year designed. */
export const CalibrationTrend = z.object({
  quantity: z.enum(CALIBRATION_QUANTITIES),
  years: z.array(z.object({ year: z.number().int(), basis: z.string(), n: z.number().int(), q1: z.number(), median: z.number(), q3: z.number(), underestimateRate: z.number() })),
})
export type CalibrationTrend = z.infer<typeof CalibrationTrend>

/** GET /api/calibration/cost?filters — steel cost of conservatism, per project and in total. */
export const CalibrationCost = z.object({
  /** How `attributableTons` was estimated, in words the principal can check. */
  method: z.string(),
  projects: z.array(
    z.object({
      code: z.string(),
      name: z.string(),
      yearDesigned: z.number().int().nullable(),
      /** Median over the project's braces of assumed Cmax / final Cmax. */
      conservatism: z.number(),
      preliminaryLateralTons: z.number().nullable(),
      finalLateralTons: z.number().nullable(),
      /** Lateral-system tons attributable to factors above final (≥ 0), by the stated method. */
      attributableTons: z.number(),
      unconservativeBraces: z.number().int(),
      braces: z.number().int(),
    }),
  ),
  totals: z.object({ projects: z.number().int(), finalLateralTons: z.number(), attributableTons: z.number(), attributableShare: z.number() }),
  /** Projects with at least one brace whose final Tmax or Cmax exceeded the assumed one. */
  unconservative: z.array(z.object({ code: z.string(), name: z.string(), braces: z.number().int(), worstQuantity: z.enum(CALIBRATION_QUANTITIES), worstRatio: z.number() })),
})
export type CalibrationCost = z.infer<typeof CalibrationCost>

export const MISS_SORTS = ['ratio', 'project', 'year', 'supplier'] as const
export const MissesQuery = z.object({
  sort: z.enum(MISS_SORTS).default('ratio'),
  dir: z.enum(['asc', 'desc']).default('asc'),
  limit: z.coerce.number().int().min(1).max(1000).default(100),
})

/** GET /api/calibration/misses?quantity&sort&dir&limit&filters (and …/misses.csv) — largest misses first. */
export const CalibrationMiss = z.object({
  braceId: z.number().int(),
  projectCode: z.string(),
  projectName: z.string(),
  frameLine: z.string(),
  level: z.string(),
  supplier: z.string().nullable(),
  yearDesigned: z.number().int().nullable(),
  basis: z.string(),
  assumed: z.number(),
  final: z.number(),
  ratio: z.number(),
})
export type CalibrationMiss = z.infer<typeof CalibrationMiss>
export const CalibrationMisses = z.object({ quantity: z.enum(CALIBRATION_QUANTITIES), items: z.array(CalibrationMiss) })

/** Quantities a starting factor is suggested for. */
export const STARTING_QUANTITIES = ['beta', 'omega', 'overstrength', 'stiffness'] as const
export type StartingQuantity = (typeof STARTING_QUANTITIES)[number]

/** GET /api/starting-factors?… — describe the new project. */
export const StartingFactorsQuery = z
  .object({
    supplier: z.string().max(40).optional(),
    configuration: z.string().max(40).optional(),
    coreAreaMin: optNum(0, 1000),
    coreAreaMax: optNum(0, 1000),
    yearFrom: optInt(1900, 2100),
    yearTo: optInt(1900, 2100),
    /** Quantile of comparable finals, 0.5–0.99 (default 0.9). */
    quantile: z.coerce.number().min(0.5).max(0.99).default(0.9),
  })
  .strict()
export type StartingFactorsQuery = z.infer<typeof StartingFactorsQuery>

export const StartingSuggestion = z.object({
  quantity: z.enum(STARTING_QUANTITIES),
  basis: z.string(),
  /** The value to start from (ksi for overstrength, else a factor). */
  suggested: z.number(),
  groupValue: z.number().nullable(),
  firmValue: z.number(),
  /**
   * Comparable projects behind `groupValue` (the credibility weight counts projects: braces of one
   * project share a supplier and a submittal, so they are not independent evidence).
   */
  groupSize: z.number().int(),
  /** True when the group was below the firm's threshold and the value was shrunk toward the firm-wide one. */
  shrunk: z.boolean(),
  /** Weight of the group's own value (1 when not shrunk). */
  weight: z.number(),
  /** The firm's habit: median assumed over the last `habitYears` years of the group. */
  habit: z.number().nullable(),
  underestimateRateSuggested: z.number(),
  underestimateRateHabit: z.number().nullable(),
  meanConservatismSuggested: z.number(),
  meanConservatismHabit: z.number().nullable(),
  /** How the value was chosen (quantile, or the median for the two-sided stiffness factor). */
  rule: z.string(),
})
export type StartingSuggestion = z.infer<typeof StartingSuggestion>

export const BacktestYear = z.object({
  year: z.number().int(),
  /** Projects of that year scored, and the braces among them. */
  projects: z.number().int(),
  braces: z.number().int(),
  /** Projects finished before that year that the suggestion was computed from. */
  trainedOn: z.number().int(),
  suggested: z.number(),
  suggestedUnderestimateRate: z.number(),
  suggestedMeanConservatism: z.number(),
  habitUnderestimateRate: z.number(),
  habitMeanConservatism: z.number(),
})
export type BacktestYear = z.infer<typeof BacktestYear>

export const StartingFactors = z.object({
  quantile: z.number(),
  minGroupSize: z.number().int(),
  habitYears: z.number().int(),
  suggestions: z.array(StartingSuggestion),
  /** The suggested capacity basis for the New frame worksheet (stresses ksi). */
  capacityBasis: z.object({ kind: z.literal('yieldRange'), fyscMax: z.number() }),
  /** Back-test per quantity, by year. */
  backtest: z.record(z.enum(STARTING_QUANTITIES), z.array(BacktestYear)),
  cautions: z.array(z.string()),
})
export type StartingFactors = z.infer<typeof StartingFactors>

/** Firm calibration settings (firm_settings key `calibration`), edited by admins and principals. */
export const CalibrationSettings = z
  .object({
    /** Smallest comparable group (projects) used without shrinkage. */
    minGroupSize: z.number().int().min(2).max(100),
    /** Years of recent assumptions that make up the firm's habit. */
    habitYears: z.number().int().min(1).max(20),
  })
  .strict()
export type CalibrationSettings = z.infer<typeof CalibrationSettings>
export const FALLBACK_CALIBRATION_SETTINGS: CalibrationSettings = { minGroupSize: 10, habitYears: 3 }

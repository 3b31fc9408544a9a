import { z } from 'zod'
import { ROLES } from '../auth/roles'
import { CALIBRATION_QUANTITIES } from './calibration'

/**
 * `GET /api/overview` (any signed-in user): the landing screen's live figures. Which sections come
 * back depends on the caller's role, and each figure names the dashboard path that explains it:
 * - `calibration` (principal): how the firm's assumed Cmax compared with the final one, the steel
 *   attributed to conservatism, and the latest projects with an unconservative final;
 * - `work` (principal, engineer): the review queue, drafts awaiting the supplier's values, recent imports;
 * - `coverage` (principal, bd): finished projects per building use and per height band under the
 *   benchmarks' publication rule — for bd a count below `MIN_PUBLISHED_GROUP` is suppressed (null),
 *   and no section names a project, a code or a client; principals also get use × height band.
 * Admin gets none of the sections (the admin landing is the Admin screen).
 */

const Path = z.string().startsWith('/')

export const CalibrationHeadline = z.object({
  /** The quantity compared (assumed / final), Cmax by default. */
  quantity: z.enum(CALIBRATION_QUANTITIES),
  /** Braces with an assumed and a confirmed final value (the largest basis group). */
  braces: z.number().int(),
  /** Median of assumed / final: above 1 the assumptions were conservative. */
  medianRatio: z.number().nullable(),
  /** Share of braces whose final exceeded the assumption (ratio < 1). */
  underestimateRate: z.number().nullable(),
  /** Lateral-system tons attributed to factors above final, and that share of the final lateral tons. */
  attributableTons: z.number().nullable(),
  attributableShare: z.number().nullable(),
  href: Path,
  costHref: Path,
})
export type CalibrationHeadline = z.infer<typeof CalibrationHeadline>

export const UnconservativeFinal = z.object({
  code: z.string(),
  name: z.string(),
  yearDesigned: z.number().int().nullable(),
  braces: z.number().int(),
  worstQuantity: z.enum(CALIBRATION_QUANTITIES),
  /** Assumed / final of the worst brace (below 1). */
  worstRatio: z.number(),
  href: Path,
})

export const OverviewCalibration = z.object({
  headline: CalibrationHeadline,
  /** Projects with a brace whose final Tmax or Cmax exceeded the assumed one, newest design first (at most 5). */
  unconservative: z.array(UnconservativeFinal),
  unconservativeTotal: z.number().int(),
  unconservativeHref: Path,
})

export const OverviewWork = z.object({
  review: z.object({
    open: z.number().int(),
    projects: z.number().int(),
    href: Path,
    /** The first few open items. */
    items: z.array(z.object({ id: z.number().int(), projectCode: z.string(), field: z.string(), reason: z.string() })),
  }),
  drafts: z.object({
    /** Draft projects with a brace that has no supplier value (submittal, approved or coupon) yet. */
    awaiting: z.number().int(),
    href: Path,
    items: z.array(z.object({ code: z.string(), name: z.string(), createdAt: z.string(), braces: z.number().int(), withSupplier: z.number().int(), href: Path })),
  }),
  imports: z.object({
    href: Path,
    items: z.array(
      z.object({
        id: z.number().int(),
        fileName: z.string(),
        status: z.string(),
        startedAt: z.string(),
        loaded: z.number().int(),
        rejected: z.number().int(),
        queued: z.number().int(),
        href: Path,
      }),
    ),
  }),
})

/** One count of the coverage; `n` null and `suppressed` true when too few to publish to the caller. */
export const CoverageCount = z.object({ key: z.string(), n: z.number().int().nullable(), suppressed: z.boolean(), href: Path })
export type CoverageCount = z.infer<typeof CoverageCount>

export const OverviewCoverage = z.object({
  /** Finished projects counted by the benchmarks (confidential ones included, never named). */
  total: z.number().int(),
  minPublished: z.number().int(),
  byUse: z.array(CoverageCount),
  byHeightBand: z.array(CoverageCount),
  /** Use × height band (principals only; empty for bd, whose suppressed cells could be found by difference from the totals). */
  cells: z.array(CoverageCount.extend({ use: z.string(), heightBand: z.string() })),
  href: Path,
})

export const OverviewResponse = z.object({
  role: z.enum(ROLES),
  generatedAt: z.string(),
  calibration: OverviewCalibration.optional(),
  work: OverviewWork.optional(),
  coverage: OverviewCoverage.optional(),
})
export type OverviewResponse = z.infer<typeof OverviewResponse>

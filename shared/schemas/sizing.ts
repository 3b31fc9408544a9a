import { z } from 'zod'
import { UNIT_SYSTEMS } from '../units/systems'
import { DESIGN_METHODS, findStepBandIssues } from '../engineering/core-size'
import { EngineeringInputError } from '../engineering/errors'
import { BRACE_CONFIGURATIONS } from '../engineering/geometry'
import { SIZE_FRAME_DEFAULTS, SIZE_FRAME_LIMITS } from '../engineering/size-frame-input'

/**
 * Wire contract of `POST /api/sizing/frame` (and `npm run size -- request.json`).
 * Numbers are in the request's unit system: US ft / kip / ksi / in², SI m / kN / MPa / mm².
 * `SizingRequest` parses to a value `sizeFrame` accepts; `SizingResponse` describes what it returns.
 */

/** A finite number greater than zero (zod 4 numbers reject ±Infinity and NaN). */
const POSITIVE_MESSAGE = 'must be a finite number greater than 0.'
const Positive = z.number({ error: POSITIVE_MESSAGE }).positive({ error: POSITIVE_MESSAGE })

/** One story, bottom story first. */
export const SizingLevel = z.object({
  name: z.string().trim().min(1).max(SIZE_FRAME_LIMITS.maxNameLength),
  storyHeight: Positive,
  storyShear: Positive,
})
export type SizingLevel = z.infer<typeof SizingLevel>

/** Where the expected core yield comes from: Ry × Fysc,min, the upper bound of a yield window, or a coupon value. */
export const SizingCapacityBasis = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('ry'), ry: Positive }),
  z.object({ kind: z.literal('yieldRange'), fyscMax: Positive }),
  z.object({ kind: z.literal('coupon'), fysc: Positive }),
])
export type SizingCapacityBasis = z.infer<typeof SizingCapacityBasis>

/** One band of a core-increment table, in the request's area unit; `upTo: null` only on the last band. */
export const SizingCoreStep = z.object({ upTo: Positive.nullable(), step: Positive })
export type SizingCoreStep = z.infer<typeof SizingCoreStep>

const toPath = (field: string): (string | number)[] =>
  field === '' ? [] : field.split('.').map((part) => (/^\d+$/.test(part) ? Number(part) : part))

/** Body of `POST /api/sizing/frame`. Defaults: bracedBays 1, stiffnessFactor 1.4, yieldLengthRatio 0.6. */
export const SizingRequest = z
  .object({
    units: z.enum(UNIT_SYSTEMS),
    method: z.enum(DESIGN_METHODS),
    configuration: z.enum(BRACE_CONFIGURATIONS),
    bayWidth: Positive,
    bracedBays: z.number().int().min(1).max(SIZE_FRAME_LIMITS.maxBracedBays).default(SIZE_FRAME_DEFAULTS.bracedBays),
    levels: z.array(SizingLevel).min(1).max(SIZE_FRAME_LIMITS.maxLevels),
    fyscMin: Positive,
    capacityBasis: SizingCapacityBasis,
    beta: Positive,
    omega: Positive,
    stiffnessFactor: Positive.default(SIZE_FRAME_DEFAULTS.stiffnessFactor),
    yieldLengthRatio: Positive.max(1).default(SIZE_FRAME_DEFAULTS.yieldLengthRatio),
    coreSteps: z.array(SizingCoreStep).min(1).optional(),
  })
  .superRefine((request, ctx) => {
    const basis = request.capacityBasis
    if (basis.kind === 'yieldRange' && basis.fyscMax < request.fyscMin) {
      ctx.addIssue({ code: 'custom', path: ['capacityBasis', 'fyscMax'], message: `must be at least fyscMin (${request.fyscMin}).` })
    }
    if (request.coreSteps) {
      for (const issue of findStepBandIssues(request.coreSteps, 'coreSteps')) {
        ctx.addIssue({ code: 'custom', path: toPath(issue.field), message: issue.message })
      }
    }
  })
export type SizingRequest = z.infer<typeof SizingRequest>
/** What a client may send (optional fields before defaults are applied). */
export type SizingRequestInput = z.input<typeof SizingRequest>

const Num = z.number()
const Direction = z.enum(['up', 'down'])

/** One story of a sizing result. */
export const SizingLevelResult = z.object({
  name: z.string(),
  storyHeight: Num,
  storyShear: Num,
  angleDeg: Num,
  bracesAtLevel: z.number().int(),
  braceLength: Num,
  braceAxialDemand: Num,
  requiredCoreArea: Num,
  coreArea: Num,
  demandCapacityRatio: Num,
  yieldStrength: Num,
  expectedYieldStrength: Num,
  adjustedTension: Num,
  adjustedCompression: Num,
  beamUnbalancedLoad: Num.nullable(),
  beamUnbalancedDirection: Direction.nullable(),
  beamHorizontalForce: Num,
  columnAxial: Num,
  columnAxialTension: Num,
  connectionRequiredStrength: Num,
  stiffness: Num,
  yieldDeformation: Num,
  driftAtYield: Num,
  driftRatioAtYield: Num,
  coreWeight: Num,
})
export type SizingLevelResult = z.infer<typeof SizingLevelResult>

/** Body of a successful `POST /api/sizing/frame` response. */
export const SizingResponse = z.object({
  unitSystem: z.enum(UNIT_SYSTEMS),
  method: z.enum(DESIGN_METHODS),
  configuration: z.enum(BRACE_CONFIGURATIONS),
  units: z.record(z.string(), z.string()),
  assumptions: z.object({
    bayWidth: Num,
    bracedBays: z.number().int(),
    fyscMin: Num,
    expectedYieldStress: Num,
    ryApplied: Num,
    beta: Num,
    omega: Num,
    stiffnessFactor: Num,
    yieldLengthRatio: Num,
    resistanceFactor: Num.nullable(),
    safetyFactor: Num.nullable(),
    steelModulus: Num,
    steelDensity: Num,
    braceToCoreWeightRatio: Num,
    coreSteps: z.array(z.object({ upTo: Num.nullable(), step: Num })),
  }),
  levels: z.array(SizingLevelResult),
  sharedBeams: z.array(
    z.object({
      lowerLevel: z.string(),
      upperLevel: z.string(),
      upwardLoad: Num,
      downwardLoad: Num,
      combinedLoad: Num,
      combinedDirection: Direction.nullable(),
      governingLoad: Num,
    }),
  ),
  totals: z.object({
    braceCount: z.number().int(),
    coreWeight: Num,
    estimatedBraceWeight: Num,
    braceWeightBasis: z.literal('default'),
    maxDemandCapacityRatio: Num,
  }),
  warnings: z.array(z.object({ field: z.string(), message: z.string() })),
  cautions: z.array(z.string()),
})
export type SizingResponse = z.infer<typeof SizingResponse>

/**
 * The `fields` map of a VALIDATION_FAILED error body, `{ "<dotted.path>": "<message>" }`, from a
 * `ZodError` of `SizingRequest` or an `EngineeringInputError` thrown by `sizeFrame`. The first message
 * per path wins and an empty path becomes `(body)`, as in `toFieldMessages` of `api-error.ts`.
 * Returns `null` for any other error (which is then not a validation failure).
 */
export function toSizingErrorFields(error: unknown): Record<string, string> | null {
  const pairs =
    error instanceof z.ZodError
      ? error.issues.map((issue) => [issue.path.map(String).join('.'), issue.message] as const)
      : error instanceof EngineeringInputError
        ? error.issues.map((issue) => [issue.field, issue.message] as const)
        : null
  if (!pairs) return null
  const fields: Record<string, string> = {}
  for (const [path, message] of pairs) fields[path || '(body)'] ??= message
  return fields
}

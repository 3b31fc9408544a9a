import { z } from 'zod'
import { BUILDING_USES, CONFIGURATIONS, SDCS } from './projects'

/**
 * Precedent finder contract: `POST /api/precedents/search` (principal, engineer).
 *
 * A *precedent* is one frame line of a finished project. The new frame is described by the
 * features below; each past frame gets a weighted distance and a similarity, with each feature's
 * share broken down (method: `shared/precedents/similarity.ts`, docs/records-precedents-benchmarks.md).
 *
 * Units: `units` = `us` (default) takes the shear in kip and lengths in ft; `si` takes kN and m.
 * Answers give stored units (kip, in, in², short tons, lb/ft²) whatever `units` was.
 */

export const PRECEDENT_FEATURES = ['storyShear', 'stories', 'storyHeight', 'bayWidth', 'configuration', 'sdc', 'buildingUse', 'supplier'] as const
export type PrecedentFeature = (typeof PRECEDENT_FEATURES)[number]

/** Numeric features (normalised by the history's spread) and categorical ones (0/1 mismatch). */
export const NUMERIC_FEATURES = ['storyShear', 'stories', 'storyHeight', 'bayWidth'] as const satisfies readonly PrecedentFeature[]
export const CATEGORICAL_FEATURES = ['configuration', 'sdc', 'buildingUse', 'supplier'] as const satisfies readonly PrecedentFeature[]

/**
 * Default weights: the first-story shear and the configuration drive core sizes the most, then the
 * number of stories (common practice, no source). Any weight may be 0 (feature ignored).
 */
export const DEFAULT_PRECEDENT_WEIGHTS: Record<PrecedentFeature, number> = {
  storyShear: 3,
  stories: 2,
  storyHeight: 1,
  bayWidth: 1,
  configuration: 2,
  sdc: 1,
  buildingUse: 1,
  supplier: 1,
}

const Positive = z.number().finite().positive()

/** The new frame. Omit a feature to leave it out of the comparison. */
export const PrecedentDescription = z
  .object({
    /** Design story shear of the frame line at its first (bottom) story — its base shear. kip (us) or kN (si). */
    storyShear: Positive.optional(),
    stories: z.number().int().min(1).max(200).optional(),
    /** Typical story height (compared with the mean story height of each past frame): ft (us) or m (si). */
    storyHeight: Positive.max(100).optional(),
    /** Braced bay width: ft (us) or m (si). */
    bayWidth: Positive.max(200).optional(),
    configuration: z.enum(CONFIGURATIONS).optional(),
    sdc: z.enum(SDCS).optional(),
    buildingUse: z.enum(BUILDING_USES).optional(),
    /** A supplier code of the history. */
    supplier: z.string().trim().min(1).max(40).optional(),
  })
  .strict()
  .refine(d => Object.keys(d).length > 0, { message: 'Describe the new frame by at least one feature.', path: ['(body)'] })
export type PrecedentDescription = z.infer<typeof PrecedentDescription>

export const PrecedentWeights = z
  .object(Object.fromEntries(PRECEDENT_FEATURES.map(f => [f, z.number().finite().min(0).max(100).optional()])) as Record<PrecedentFeature, z.ZodOptional<z.ZodNumber>>)
  .strict()
export type PrecedentWeights = z.infer<typeof PrecedentWeights>

export const PrecedentSearchBody = z
  .object({
    description: PrecedentDescription,
    weights: PrecedentWeights.optional(),
    limit: z.number().int().min(1).max(50).default(10),
    units: z.enum(['us', 'si']).default('us'),
  })
  .strict()
export type PrecedentSearchBody = z.infer<typeof PrecedentSearchBody>

/** One feature's part in a match's score. */
export const FeatureContribution = z.object({
  feature: z.enum(PRECEDENT_FEATURES),
  weight: z.number(),
  /** The new frame's value (stored units) and the precedent's. */
  query: z.union([z.number(), z.string()]),
  candidate: z.union([z.number(), z.string()]).nullable(),
  /** Normalised distance d (numeric: |Δ| / spread, shear: |ln ratio| / spread of ln; categorical 0/1; missing candidate value 1). */
  distance: z.number(),
  /** w·d / Σw: this feature's share of the weighted distance D. */
  contribution: z.number(),
})
export type FeatureContribution = z.infer<typeof FeatureContribution>

export const PrecedentLevel = z.object({
  level: z.string(),
  levelIndex: z.number().int(),
  /** Story height of the level, in. */
  storyHeightIn: z.number(),
  storyShearKip: z.number(),
  preliminaryCoreAreaIn2: z.number().nullable(),
  finalCoreAreaIn2: z.number().nullable(),
  assumed: z.object({ beta: z.number().nullable(), omega: z.number().nullable(), stiffnessFactor: z.number().nullable() }).nullable(),
  final: z.object({ beta: z.number().nullable(), omega: z.number().nullable(), stiffnessFactor: z.number().nullable(), factorDriftMultiple: z.number().nullable() }).nullable(),
})

export const PrecedentMatch = z.object({
  rank: z.number().int(),
  code: z.string(),
  name: z.string(),
  frameLine: z.string(),
  yearDesigned: z.number().int().nullable(),
  /** The frame line's geometry (what "Start from this precedent" carries): configuration, braced bays, bay width in in. */
  configuration: z.enum(CONFIGURATIONS),
  bays: z.number().int(),
  bayWidthIn: z.number(),
  /** exp(−D), 1 = identical on every feature used. */
  similarity: z.number(),
  /** D = Σ w·d / Σ w. */
  distance: z.number(),
  breakdown: z.array(FeatureContribution),
  levels: z.array(PrecedentLevel),
  /** Final tonnage over the project's gross floor area, lb/ft² (null when not recorded). */
  lateralLbPerFt2: z.number().nullable(),
  structuralLbPerFt2: z.number().nullable(),
})
export type PrecedentMatch = z.infer<typeof PrecedentMatch>

export const PrecedentSearchResponse = z.object({
  /** Frames compared. */
  candidates: z.number().int(),
  weights: z.record(z.string(), z.number()),
  /** Spread used for each numeric feature (IQR; of ln for the shear), stored units. */
  spreads: z.record(z.string(), z.number()),
  matches: z.array(PrecedentMatch),
  cautions: z.array(z.string()),
})
export type PrecedentSearchResponse = z.infer<typeof PrecedentSearchResponse>

import { z } from 'zod'

/**
 * Project records contract: the paginated list, one project's full record, the submittal check
 * and the two edits (project fields, a new supplier snapshot). Shared by the API (validation,
 * response shape) and the dashboard (typed client, URL state).
 *
 * Units: every quantity is in the stored units named by its suffix — kip, in, ksi, in², ft²,
 * short tons — as in the history tables; the dashboard converts for display with `shared/units`.
 * Areas: principal and engineer only (`projects` in `shared/auth/roles.ts`); business development
 * never reaches a project- or brace-level record.
 *
 * Vocabulary (as in `docs/import-format.md`): a brace's *assumed* values are its `sd` snapshot,
 * its *final* values the snapshot marked `governing`; the *design* snapshot is the latest of
 * sd/dd/cd — what the beams, columns and connections were sized from.
 */

/** The standing cautions carried by answers that inform design. */
export const DESIGN_CAUTIONS = [
  'Preliminary design aid: figures from the firm’s history are starting points, not a design.',
  'Verify every value with the selected supplier’s qualified values and with the governing code and edition.',
  'The engineer of record decides.',
] as const

export const BUILDING_USES = ['office', 'laboratory', 'healthcare', 'school', 'residential', 'parking', 'industrial', 'mixed', 'other'] as const
export const CONFIGURATIONS = ['single_diagonal', 'inverted_v', 'v', 'two_story_x'] as const
export const PHASES = ['sd', 'dd', 'cd', 'submittal', 'approved', 'coupon'] as const
export type Phase = (typeof PHASES)[number]
/** Phases a design (the firm's own sizing) is recorded in. */
export const DESIGN_PHASES = ['sd', 'dd', 'cd'] as const
/** Phases carrying the supplier's values. */
export const SUPPLIER_PHASES = ['submittal', 'approved', 'coupon'] as const
export type SupplierPhase = (typeof SUPPLIER_PHASES)[number]
export const YIELD_BASES = ['specified_min', 'yield_range', 'mill_cert', 'coupon'] as const
export const SDCS = ['A', 'B', 'C', 'D', 'E', 'F'] as const
export const PHASES_REACHED = ['sd', 'dd', 'cd', 'construction', 'complete'] as const
export const TONNAGE_STAGES = ['preliminary', 'final'] as const
export const TONNAGE_CATEGORIES = ['braces', 'beams', 'columns', 'connections', 'lateral_total', 'structural_total'] as const

/** `:code` in a path: the firm's project code. */
export const ProjectCode = z.string().trim().min(1, { message: 'Give a project code.' }).max(40)

const splitList = (v: unknown) => (v === undefined || v === '' ? undefined : Array.isArray(v) ? v : String(v).split(','))
/** A comma-separated list of free-text values (at most 50). */
const textList = () => z.preprocess(splitList, z.array(z.string().trim().min(1).max(80)).max(50).optional())
/** A comma-separated list of enum values (at most 50). */
const enumList = <T extends readonly [string, ...string[]]>(values: T) => z.preprocess(splitList, z.array(z.enum(values)).max(50).optional())
const optInt = (min: number, max: number) => z.preprocess(v => (v === '' ? undefined : v), z.coerce.number().int().min(min).max(max).optional())

/** Columns the list may be sorted by (a whitelist: anything else is a 400 naming `sort`). */
export const PROJECT_SORTS = ['code', 'name', 'yearDesigned', 'yearCompleted', 'stories', 'heightFt', 'floorAreaFt2', 'sdc', 'buildingUse', 'supplier', 'region', 'office', 'updatedAt'] as const
export type ProjectSort = (typeof PROJECT_SORTS)[number]

/**
 * `GET /api/projects` query. Lists are comma-separated. `q` searches code and name (case-insensitive,
 * substring). `status`: `draft` = started in the New frame worksheet, `finished` = the rest.
 * `configuration` keeps projects with at least one frame line of that configuration.
 */
export const ProjectListQuery = z
  .object({
    page: z.coerce.number().int().min(1).default(1),
    pageSize: z.coerce.number().int().min(1).max(200, { message: 'must be at most 200.' }).default(50),
    sort: z.enum(PROJECT_SORTS).default('code'),
    order: z.enum(['asc', 'desc']).default('asc'),
    q: z.string().trim().max(100).optional(),
    yearFrom: optInt(1900, 2100),
    yearTo: optInt(1900, 2100),
    supplier: textList(),
    use: enumList(BUILDING_USES),
    sdc: enumList(SDCS),
    configuration: enumList(CONFIGURATIONS),
    storiesMin: optInt(1, 200),
    storiesMax: optInt(1, 200),
    status: z.enum(['all', 'draft', 'finished']).default('all'),
  })
  .refine(q => q.yearFrom === undefined || q.yearTo === undefined || q.yearFrom <= q.yearTo, { path: ['yearTo'], message: 'must not be before yearFrom.' })
  .refine(q => q.storiesMin === undefined || q.storiesMax === undefined || q.storiesMin <= q.storiesMax, { path: ['storiesMax'], message: 'must not be below storiesMin.' })
export type ProjectListQuery = z.infer<typeof ProjectListQuery>

export const ProjectListItem = z.object({
  id: z.number().int(),
  code: z.string(),
  name: z.string(),
  client: z.string().nullable(),
  clientConfidential: z.boolean(),
  benchmarkPermitted: z.boolean(),
  office: z.string().nullable(),
  region: z.string().nullable(),
  buildingUse: z.string().nullable(),
  sdc: z.string().nullable(),
  stories: z.number().int().nullable(),
  heightFt: z.number().nullable(),
  floorAreaFt2: z.number().nullable(),
  yearDesigned: z.number().int().nullable(),
  yearCompleted: z.number().int().nullable(),
  phaseReached: z.string().nullable(),
  draft: z.boolean(),
  supplierCode: z.string().nullable(),
  supplierName: z.string().nullable(),
  frameCount: z.number().int(),
  configurations: z.array(z.string()),
})
export type ProjectListItem = z.infer<typeof ProjectListItem>

export const ProjectList = z.object({ items: z.array(ProjectListItem), total: z.number().int(), page: z.number().int(), pageSize: z.number().int() })
export type ProjectList = z.infer<typeof ProjectList>

/** One stored snapshot, as recorded (adjusted strengths as stored, kip). */
export const SnapshotView = z.object({
  id: z.number().int(),
  phase: z.enum(PHASES),
  revision: z.number().int(),
  date: z.string().nullable(),
  sourceDocument: z.string().nullable(),
  requiredCoreAreaIn2: z.number().nullable(),
  coreAreaIn2: z.number().nullable(),
  fyscKsi: z.number().nullable(),
  fyscBasis: z.enum(YIELD_BASES).nullable(),
  fyscMaxKsi: z.number().nullable(),
  ry: z.number().nullable(),
  beta: z.number().nullable(),
  omega: z.number().nullable(),
  factorDriftMultiple: z.number().nullable(),
  stiffnessFactor: z.number().nullable(),
  yieldLengthRatio: z.number().nullable(),
  adjustedTensionKip: z.number().nullable(),
  adjustedCompressionKip: z.number().nullable(),
  governing: z.boolean(),
  /** False while a value of it waits in the review queue. */
  confirmed: z.boolean(),
})
export type SnapshotView = z.infer<typeof SnapshotView>

/** Factors of one snapshot (assumed or final). */
export const FactorSet = z.object({
  phase: z.enum(PHASES),
  revision: z.number().int(),
  beta: z.number().nullable(),
  omega: z.number().nullable(),
  ry: z.number().nullable(),
  fyscKsi: z.number().nullable(),
  fyscBasis: z.enum(YIELD_BASES).nullable(),
  fyscMaxKsi: z.number().nullable(),
  stiffnessFactor: z.number().nullable(),
  yieldLengthRatio: z.number().nullable(),
  factorDriftMultiple: z.number().nullable(),
  /** Tmax = ω·Ry·Fysc·Asc, kip, computed by the engine from these values (AISC 341-16 F4.2a); null when a value is missing. */
  tmaxKip: z.number().nullable(),
  /** Cmax = β·Tmax, kip (AISC 341-16 F4.2a). */
  cmaxKip: z.number().nullable(),
  confirmed: z.boolean(),
})
export type FactorSet = z.infer<typeof FactorSet>

export const BraceView = z.object({
  id: z.number().int(),
  braceCount: z.number().int(),
  angleDeg: z.number(),
  workPointLengthIn: z.number(),
  /** Pu (LRFD) or Pa (ASD), kip per brace. */
  requiredStrengthKip: z.number(),
  method: z.enum(['lrfd', 'asd']),
  /** Required core area of the assumed (sd) snapshot, else of the latest design snapshot that has one, in². */
  requiredCoreAreaIn2: z.number().nullable(),
  /** Core area of the assumed (sd) snapshot, in². */
  preliminaryCoreAreaIn2: z.number().nullable(),
  /** Core area of the governing snapshot, in²; null while pending. */
  finalCoreAreaIn2: z.number().nullable(),
  assumed: FactorSet.nullable(),
  final: FactorSet.nullable(),
  /** Every snapshot, in phase order then revision: the submittal revisions read as a timeline. */
  snapshots: z.array(SnapshotView),
})
export type BraceView = z.infer<typeof BraceView>

export const LevelView = z.object({
  name: z.string(),
  levelIndex: z.number().int(),
  storyHeightIn: z.number(),
  storyShearKip: z.number(),
  designDriftIn: z.number().nullable(),
  brace: BraceView.nullable(),
})
export const FrameView = z.object({
  frameLine: z.string(),
  configuration: z.enum(CONFIGURATIONS),
  bays: z.number().int(),
  bayWidthIn: z.number(),
  /** Bottom story first. */
  levels: z.array(LevelView),
})
export type FrameView = z.infer<typeof FrameView>

export const TonnageView = z.object({ stage: z.enum(TONNAGE_STAGES), category: z.enum(TONNAGE_CATEGORIES), tons: z.number(), scope: z.string().nullable() })

export const ProjectDetail = z.object({
  project: ProjectListItem.extend({
    riskCategory: z.string().nullable(),
    importanceFactor: z.number().nullable(),
    sds: z.number().nullable(),
    sd1: z.number().nullable(),
    siteClass: z.string().nullable(),
    asce7Edition: z.string().nullable(),
    aisc341Edition: z.string().nullable(),
    analysisMethod: z.string().nullable(),
    r: z.number().nullable(),
    cd: z.number().nullable(),
    omega0: z.number().nullable(),
    createdAt: z.string(),
    updatedAt: z.string(),
  }),
  frames: z.array(FrameView),
  /** Short tons, by stage and category, with what each figure includes. */
  tonnage: z.array(TonnageView),
  /** The import run the project was (last) loaded by; null for a draft saved from the worksheet. */
  importRun: z.object({ id: z.number().int(), fileName: z.string(), source: z.string(), status: z.string(), startedAt: z.string(), finishedAt: z.string().nullable() }).nullable(),
  cautions: z.array(z.string()),
})
export type ProjectDetail = z.infer<typeof ProjectDetail>

// ---------- submittal check ----------

/** `GET /api/projects/:code/submittal-check`: which supplier snapshot to check; default the latest one recorded. */
export const SubmittalCheckQuery = z
  .object({
    phase: z.enum(SUPPLIER_PHASES).optional(),
    revision: z.coerce.number().int().min(0).max(99).optional(),
  })
  .refine(q => q.revision === undefined || q.phase !== undefined, { path: ['phase'], message: 'Give the phase along with the revision.' })
export type SubmittalCheckQuery = z.infer<typeof SubmittalCheckQuery>

export const CHECK_ITEMS = ['coreArea', 'stiffnessFactor', 'tmax', 'cmax', 'deformationBasis', 'ryBasis'] as const
export type CheckItemKey = (typeof CHECK_ITEMS)[number]

/**
 * One item of the check. `pass`; `exceeds` (outside the band, above the design force, or a basis
 * that contradicts itself) with `excess` (the amount, in `unit`) and `excessRatio` (fraction of the
 * design value); `missing` when a value needed for the item is not recorded.
 */
export const CheckItem = z.object({
  item: z.enum(CHECK_ITEMS),
  status: z.enum(['pass', 'exceeds', 'missing']),
  design: z.number().nullable(),
  supplier: z.number().nullable(),
  unit: z.string(),
  /** supplier − design (same unit); for the band items, signed. */
  excess: z.number().nullable(),
  /** supplier / design − 1. */
  excessRatio: z.number().nullable(),
  message: z.string(),
})
export type CheckItem = z.infer<typeof CheckItem>

export const BraceCheck = z.object({
  frameLine: z.string(),
  level: z.string(),
  levelIndex: z.number().int(),
  design: z.object({ phase: z.enum(DESIGN_PHASES), revision: z.number().int() }).nullable(),
  supplier: z.object({ phase: z.enum(SUPPLIER_PHASES), revision: z.number().int() }).nullable(),
  status: z.enum(['pass', 'exceeds', 'missing']),
  items: z.array(CheckItem),
})
export type BraceCheck = z.infer<typeof BraceCheck>

export const SubmittalCheckResponse = z.object({
  code: z.string(),
  phase: z.enum(SUPPLIER_PHASES).nullable(),
  revision: z.number().int().nullable(),
  /** Two-sided band for core area and stiffness factor, a fraction (0.10 = ±10 %), from the firm's settings. */
  tolerance: z.number(),
  summary: z.object({ braces: z.number().int(), pass: z.number().int(), exceeds: z.number().int(), missing: z.number().int() }),
  braces: z.array(BraceCheck),
  cautions: z.array(z.string()),
})
export type SubmittalCheckResponse = z.infer<typeof SubmittalCheckResponse>

// ---------- edits ----------

const optText = (max: number) => z.string().trim().max(max).nullable().optional()
const positive = (what: string) => z.number({ error: `must be a number (${what}).` }).finite().positive({ message: `must be greater than 0 (${what}).` })

/**
 * `PATCH /api/projects/:code`: the whitelisted project fields an engineer or principal may edit
 * (stored units: ft, ft²). Strict: an unknown field is a 400 naming it. At least one field.
 */
/**
 * The project's `updatedAt` as the editor loaded it. When the project has changed since (an import,
 * another user), the edit is refused with 409 and nothing is stored: reload and apply it again.
 */
const ExpectedUpdatedAt = z.iso.datetime({ offset: true, message: 'must be the project’s updatedAt as loaded (ISO date-time).' }).optional()

export const PatchProjectBody = z
  .object({
    name: z.string().trim().min(1, { message: 'Name the project.' }).max(200).optional(),
    client: optText(200),
    clientConfidential: z.boolean().optional(),
    benchmarkPermitted: z.boolean().optional(),
    office: optText(80),
    region: optText(80),
    buildingUse: z.enum(BUILDING_USES).nullable().optional(),
    riskCategory: z.enum(['I', 'II', 'III', 'IV']).nullable().optional(),
    sdc: z.enum(SDCS).nullable().optional(),
    siteClass: z.enum(['A', 'B', 'C', 'D', 'E', 'F']).nullable().optional(),
    stories: z.number().int().min(1).max(200).nullable().optional(),
    heightFt: positive('building height in ft').max(5000).nullable().optional(),
    floorAreaFt2: positive('gross floor area in ft²').max(1e8).nullable().optional(),
    yearDesigned: z.number().int().min(1900).max(2100).optional(),
    yearCompleted: z.number().int().min(1900).max(2100).nullable().optional(),
    phaseReached: z.enum(PHASES_REACHED).nullable().optional(),
    /** A supplier code already in the history; null clears it. */
    supplierCode: z.string().trim().min(1).max(40).nullable().optional(),
    /** False finishes a draft project. */
    draft: z.boolean().optional(),
    expectedUpdatedAt: ExpectedUpdatedAt,
  })
  .strict()
  .refine(b => Object.keys(b).some(k => k !== 'expectedUpdatedAt'), { message: 'Change at least one field.', path: ['(body)'] })
export type PatchProjectBody = z.infer<typeof PatchProjectBody>

/**
 * `POST /api/projects/:code/snapshots`: the supplier's values for the braces of one story of one
 * frame line (stored units: in², ksi). `revision` defaults to the next free revision of the phase.
 * Yield basis rules (AISC 341-16 F4.2a, from memory): a specified minimum needs Ry; a yield range
 * needs its upper bound ≥ Fysc; a coupon or mill-certificate value takes no Ry (empty or 1.0).
 */
export const CreateSnapshotBody = z
  .object({
    frameLine: z.string().trim().min(1, { message: 'Give the frame line.' }).max(40),
    level: z.string().trim().min(1, { message: 'Give the level name.' }).max(40),
    phase: z.enum(SUPPLIER_PHASES),
    revision: z.number().int().min(0).max(99).optional(),
    date: z.iso.date({ message: 'must be a date as YYYY-MM-DD.' }).nullable().optional(),
    sourceDocument: optText(200),
    coreAreaIn2: positive('core area in in²').max(200),
    fyscKsi: positive('core yield stress in ksi').max(150),
    fyscBasis: z.enum(YIELD_BASES),
    fyscMaxKsi: positive('upper bound of the yield range in ksi').max(150).nullable().optional(),
    ry: positive('Ry').max(3).nullable().optional(),
    beta: positive('β').max(3),
    omega: positive('ω').max(3),
    factorDriftMultiple: positive('deformation as a multiple of the design story drift').max(10).nullable().optional(),
    stiffnessFactor: positive('stiffness factor').max(5).nullable().optional(),
    yieldLengthRatio: z.number().finite().gt(0, { message: 'must be greater than 0.' }).max(1, { message: 'must be at most 1 (Ly/Lwp).' }).nullable().optional(),
    /** Take this snapshot as the brace's final (clears the mark on the brace's other snapshots). */
    governing: z.boolean().default(false),
    expectedUpdatedAt: ExpectedUpdatedAt,
  })
  .strict()
  .superRefine((b, ctx) => {
    if (b.fyscBasis === 'specified_min' && !b.ry) ctx.addIssue({ code: 'custom', path: ['ry'], message: 'A specified-minimum yield needs Ry (AISC 341 Table A3.1).' })
    if (b.fyscBasis === 'yield_range' && !b.fyscMaxKsi) ctx.addIssue({ code: 'custom', path: ['fyscMaxKsi'], message: 'A yield range needs its upper bound.' })
    if (b.fyscBasis === 'yield_range' && b.fyscMaxKsi && b.fyscMaxKsi < b.fyscKsi) ctx.addIssue({ code: 'custom', path: ['fyscMaxKsi'], message: 'must be at least fyscKsi.' })
    if ((b.fyscBasis === 'coupon' || b.fyscBasis === 'mill_cert') && b.ry != null && b.ry !== 1) {
      ctx.addIssue({ code: 'custom', path: ['ry'], message: 'Ry is not applied to a measured (coupon or mill-certificate) yield: leave it empty or 1.' })
    }
  })
export type CreateSnapshotBody = z.infer<typeof CreateSnapshotBody>

export const SnapshotCreated = z.object({ code: z.string(), frameLine: z.string(), level: z.string(), snapshot: SnapshotView, cautions: z.array(z.string()) })
export type SnapshotCreated = z.infer<typeof SnapshotCreated>

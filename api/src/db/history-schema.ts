import { boolean, doublePrecision, index, integer, jsonb, pgEnum, pgTable, serial, smallint, text, timestamp, uniqueIndex, varchar, date } from 'drizzle-orm/pg-core'
import { users } from './schema'

/**
 * The firm's BRB history. Quantities are stored in one canonical system — kip, in, ksi, in²,
 * ft², short tons — named by a unit suffix on the column; importers convert at the edge.
 */

export const configurationEnum = pgEnum('brace_configuration', ['single_diagonal', 'inverted_v', 'v', 'two_story_x'])
export const phaseEnum = pgEnum('value_phase', ['sd', 'dd', 'cd', 'submittal', 'approved', 'coupon'])
export const yieldBasisEnum = pgEnum('yield_basis', ['specified_min', 'yield_range', 'mill_cert', 'coupon'])
export const tonnageStageEnum = pgEnum('tonnage_stage', ['preliminary', 'final'])
export const tonnageCategoryEnum = pgEnum('tonnage_category', ['braces', 'beams', 'columns', 'connections', 'lateral_total', 'structural_total'])
export const designMethodEnum = pgEnum('design_method', ['lrfd', 'asd'])

/** Brace suppliers under the firm's own anonymised codes. */
export const suppliers = pgTable('suppliers', {
  id: serial('id').primaryKey(),
  code: varchar('code', { length: 40 }).notNull().unique(),
  displayName: varchar('display_name', { length: 120 }).notNull(),
  notes: text('notes'),
})

export const projects = pgTable(
  'projects',
  {
    id: serial('id').primaryKey(),
    /** The natural key: the firm's project code. */
    code: varchar('code', { length: 40 }).notNull(),
    name: varchar('name', { length: 200 }).notNull(),
    client: varchar('client', { length: 200 }),
    clientConfidential: boolean('client_confidential').notNull().default(true),
    benchmarkPermitted: boolean('benchmark_permitted').notNull().default(false),
    office: varchar('office', { length: 80 }),
    region: varchar('region', { length: 80 }),
    buildingUse: varchar('building_use', { length: 40 }),
    riskCategory: varchar('risk_category', { length: 4 }),
    importanceFactor: doublePrecision('importance_factor'),
    sdc: varchar('sdc', { length: 1 }),
    sds: doublePrecision('sds_g'),
    sd1: doublePrecision('sd1_g'),
    siteClass: varchar('site_class', { length: 2 }),
    stories: smallint('stories'),
    heightFt: doublePrecision('height_ft'),
    floorAreaFt2: doublePrecision('floor_area_ft2'),
    asce7Edition: varchar('asce7_edition', { length: 10 }),
    aisc341Edition: varchar('aisc341_edition', { length: 10 }),
    analysisMethod: varchar('analysis_method', { length: 10 }),
    r: doublePrecision('r'),
    cd: doublePrecision('cd'),
    omega0: doublePrecision('omega0'),
    supplierId: integer('supplier_id').references(() => suppliers.id),
    yearDesigned: smallint('year_designed'),
    yearCompleted: smallint('year_completed'),
    phaseReached: varchar('phase_reached', { length: 20 }),
    /** True for a project started in the New frame worksheet and not yet finished. */
    draft: boolean('draft').notNull().default(false),
    importRunId: integer('import_run_id'),
    /** SHA-256 of the project as loaded: a re-import of the same content changes nothing. */
    contentHash: varchar('content_hash', { length: 64 }),
    /** Set when someone changes the project in Backsight (a form); an import clears it. While set, an import that would overwrite the edit is refused. */
    editedAt: timestamp('edited_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  t => [uniqueIndex('projects_code_key').on(t.code)],
)

export const frames = pgTable(
  'frames',
  {
    id: serial('id').primaryKey(),
    projectId: integer('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    frameLine: varchar('frame_line', { length: 40 }).notNull(),
    configuration: configurationEnum('configuration').notNull(),
    bays: smallint('bays').notNull().default(1),
    bayWidthIn: doublePrecision('bay_width_in').notNull(),
  },
  t => [uniqueIndex('frames_project_line_key').on(t.projectId, t.frameLine)],
)

export const levels = pgTable(
  'levels',
  {
    id: serial('id').primaryKey(),
    frameId: integer('frame_id')
      .notNull()
      .references(() => frames.id, { onDelete: 'cascade' }),
    name: varchar('name', { length: 40 }).notNull(),
    /** 1 = bottom story. */
    levelIndex: smallint('level_index').notNull(),
    storyHeightIn: doublePrecision('story_height_in').notNull(),
    storyShearKip: doublePrecision('story_shear_kip').notNull(),
    designDriftIn: doublePrecision('design_drift_in'),
  },
  t => [uniqueIndex('levels_frame_name_key').on(t.frameId, t.name)],
)

/** The braces of one story of one frame (all alike): geometry and demand. */
export const braces = pgTable(
  'braces',
  {
    id: serial('id').primaryKey(),
    levelId: integer('level_id')
      .notNull()
      .references(() => levels.id, { onDelete: 'cascade' }),
    braceCount: smallint('brace_count').notNull(),
    angleDeg: doublePrecision('angle_deg').notNull(),
    workPointLengthIn: doublePrecision('work_point_length_in').notNull(),
    requiredStrengthKip: doublePrecision('required_strength_kip').notNull(),
    method: designMethodEnum('method').notNull().default('lrfd'),
  },
  t => [uniqueIndex('braces_level_key').on(t.levelId)],
)

/**
 * Brace values by phase: schematic design through submittal revisions to coupon tests.
 * `governing` marks the snapshot taken as final for the brace (at most one per brace).
 */
export const braceSnapshots = pgTable(
  'brace_snapshots',
  {
    id: serial('id').primaryKey(),
    braceId: integer('brace_id')
      .notNull()
      .references(() => braces.id, { onDelete: 'cascade' }),
    phase: phaseEnum('phase').notNull(),
    revision: smallint('revision').notNull().default(0),
    date: date('date'),
    sourceDocument: varchar('source_document', { length: 200 }),
    requiredCoreAreaIn2: doublePrecision('required_core_area_in2'),
    coreAreaIn2: doublePrecision('core_area_in2'),
    fyscKsi: doublePrecision('fysc_ksi'),
    fyscBasis: yieldBasisEnum('fysc_basis'),
    fyscMaxKsi: doublePrecision('fysc_max_ksi'),
    ry: doublePrecision('ry'),
    beta: doublePrecision('beta'),
    omega: doublePrecision('omega'),
    /** Deformation at which β and ω were taken, as a multiple of the design story drift (e.g. 2.0). */
    factorDriftMultiple: doublePrecision('factor_drift_multiple'),
    stiffnessFactor: doublePrecision('stiffness_factor'),
    yieldLengthRatio: doublePrecision('yield_length_ratio'),
    adjustedTensionKip: doublePrecision('adjusted_tension_kip'),
    adjustedCompressionKip: doublePrecision('adjusted_compression_kip'),
    governing: boolean('governing').notNull().default(false),
    /** False while a value of this snapshot waits in the review queue; analytics use confirmed ones only. */
    confirmed: boolean('confirmed').notNull().default(true),
  },
  t => [uniqueIndex('brace_snapshots_key').on(t.braceId, t.phase, t.revision), index('brace_snapshots_phase_idx').on(t.phase)],
)

export const tonnage = pgTable(
  'tonnage',
  {
    id: serial('id').primaryKey(),
    projectId: integer('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    stage: tonnageStageEnum('stage').notNull(),
    category: tonnageCategoryEnum('category').notNull(),
    tons: doublePrecision('tons_short').notNull(),
    /** What the figure includes, in the firm's words. */
    scope: varchar('scope', { length: 200 }),
  },
  t => [uniqueIndex('tonnage_key').on(t.projectId, t.stage, t.category)],
)

export const importRuns = pgTable('import_runs', {
  id: serial('id').primaryKey(),
  userId: integer('user_id').references(() => users.id, { onDelete: 'set null' }),
  source: varchar('source', { length: 20 }).notNull(), // 'cli' | 'upload'
  fileName: varchar('file_name', { length: 260 }).notNull(),
  sha256: varchar('sha256', { length: 64 }).notNull(),
  /** queued → running → finished | failed */
  status: varchar('status', { length: 20 }).notNull().default('queued'),
  progressStage: varchar('progress_stage', { length: 20 }),
  progressDone: integer('progress_done').notNull().default(0),
  progressTotal: integer('progress_total').notNull().default(0),
  error: text('error'),
  dryRun: boolean('dry_run').notNull().default(false),
  loaded: integer('loaded').notNull().default(0),
  updated: integer('updated').notNull().default(0),
  unchanged: integer('unchanged').notNull().default(0),
  rejected: integer('rejected').notNull().default(0),
  queued: integer('queued').notNull().default(0),
  startedAt: timestamp('started_at', { withTimezone: true }).notNull().defaultNow(),
  finishedAt: timestamp('finished_at', { withTimezone: true }),
  /** The uploaded original, kept (bounded in size) so a run can be audited or replayed. */
  original: text('original_base64'),
})

/** Each problem a run found: where (file, sheet, row, column), the value, and what was expected. */
export const importProblems = pgTable(
  'import_problems',
  {
    id: serial('id').primaryKey(),
    runId: integer('run_id')
      .notNull()
      .references(() => importRuns.id, { onDelete: 'cascade' }),
    projectCode: varchar('project_code', { length: 40 }),
    severity: varchar('severity', { length: 10 }).notNull(), // 'error' rejects the project; 'review' queues it
    file: varchar('file', { length: 260 }).notNull(),
    sheet: varchar('sheet', { length: 60 }),
    row: integer('row'),
    column: varchar('column', { length: 80 }),
    value: text('value'),
    message: text('message').notNull(),
  },
  t => [index('import_problems_run_idx').on(t.runId)],
)

/** Suspicious values waiting for an engineer or principal: confirm, correct or discard. */
export const reviewItems = pgTable(
  'review_items',
  {
    id: serial('id').primaryKey(),
    runId: integer('run_id').references(() => importRuns.id, { onDelete: 'set null' }),
    snapshotId: integer('snapshot_id').references(() => braceSnapshots.id, { onDelete: 'cascade' }),
    projectCode: varchar('project_code', { length: 40 }).notNull(),
    field: varchar('field', { length: 80 }).notNull(),
    value: text('value'),
    reason: text('reason').notNull(),
    status: varchar('status', { length: 12 }).notNull().default('open'), // open | confirmed | corrected | discarded
    resolution: jsonb('resolution'),
    resolvedBy: integer('resolved_by').references(() => users.id, { onDelete: 'set null' }),
    resolvedAt: timestamp('resolved_at', { withTimezone: true }),
  },
  t => [index('review_items_status_idx').on(t.status)],
)

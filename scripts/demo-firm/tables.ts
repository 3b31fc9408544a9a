/**
 * The tables of the Backsight history import format (docs/import-format.md, version 1) as
 * in-memory rows, and the extra generator-side records that are not written to the files.
 * Column lists are in the order the files use. Rows are in US customary units (`units` = `us`):
 * ft, in (drift), kip, ksi, in², ft², short ton. `null` is an empty cell ("not known").
 */

/** One cell: a number, a text, or empty. */
export type Cell = string | number | null

/** Column order of every table, exactly the names of docs/import-format.md. */
export const COLUMNS = {
  about: ['key', 'value'],
  suppliers: ['supplier_code', 'display_name', 'notes'],
  projects: [
    'project_code', 'name', 'client', 'client_confidential', 'benchmark_permitted', 'office', 'region', 'building_use',
    'risk_category', 'importance_factor', 'sdc', 'sds', 'sd1', 'site_class', 'stories', 'height', 'floor_area',
    'asce7_edition', 'aisc341_edition', 'analysis_method', 'r', 'cd', 'omega0', 'supplier_code',
    'year_designed', 'year_completed', 'phase_reached',
  ],
  frames: ['project_code', 'frame_line', 'configuration', 'bays', 'bay_width'],
  levels: ['project_code', 'frame_line', 'level', 'level_index', 'story_height', 'story_shear', 'design_drift'],
  braces: ['project_code', 'frame_line', 'level', 'brace_count', 'angle_deg', 'work_point_length', 'required_strength', 'method'],
  brace_values: [
    'project_code', 'frame_line', 'level', 'phase', 'revision', 'date', 'source_document', 'required_core_area', 'core_area',
    'fysc', 'fysc_basis', 'fysc_max', 'ry', 'beta', 'omega', 'factor_drift_multiple', 'stiffness_factor',
    'yield_length_ratio', 'governing',
  ],
  tonnage: ['project_code', 'stage', 'category', 'weight', 'scope'],
} as const

/** The eight tables of the format. */
export type TableName = keyof typeof COLUMNS

/** Table names in the order the files list them. */
export const TABLE_NAMES = Object.keys(COLUMNS) as TableName[]

/** A row of one table: every column of that table, each a `Cell`. */
export type Row<T extends TableName> = { [K in (typeof COLUMNS)[T][number]]: Cell }

/**
 * Adjusted strengths the generator computed with the engine for one snapshot (NOT a format column;
 * kept beside the tables so tests can check them). Forces in kip, stress in ksi. For a snapshot that
 * carries a planted fault these are the values the firm MEANT (before the typo).
 */
export interface AdjustedStrengthRow {
  project_code: string
  frame_line: string
  level: string
  phase: string
  revision: number
  expected_yield_stress: number
  ry_applied: number
  adjusted_tension: number
  adjusted_compression: number
}

/** The seven planted data faults (README and tests use the same ids). */
export type FaultId = 'unit_slip' | 'mpa_in_ksi' | 'duplicate_project' | 'pending_final' | 'revised_submittal' | 'beta_omega_swap' | 'empty_story_height'

/** Where one planted fault sits. `level`/`frame_line`/`phase` are set for single-cell faults. */
export interface PlantedFault {
  id: FaultId
  project_code: string
  /** For `duplicate_project`: the project it duplicates. */
  duplicate_of?: string
  frame_line?: string
  level?: string
  phase?: string
  revision?: number
  column?: string
  value?: Cell
  intended?: Cell
  description: string
}

/** What `generateDemoFirm` returns: the format tables plus generator-side records. */
export type DemoTables = { [T in TableName]: Row<T>[] } & {
  adjusted_strengths: AdjustedStrengthRow[]
  faults: PlantedFault[]
}

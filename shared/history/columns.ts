import type { ImportQuantity } from '../units/tokens'

/**
 * The tables and columns of the history import format (docs/import-format.md), as data.
 * The ETL reads every file through this table; the Imports screen builds its templates from it.
 */
export type ColumnType = 'text' | 'number' | 'integer' | 'year' | 'boolean' | 'date' | 'enum'

export interface ColumnSpec {
  name: string
  type: ColumnType
  required?: boolean
  quantity?: ImportQuantity
  values?: readonly string[]
  /** Hard limits: outside them the value cannot be right (the project is rejected). */
  min?: number
  max?: number
  /** Plausible band: outside it the value is queued for review, never loaded silently. */
  plausible?: readonly [number, number]
  /** One line for the template and the docs. */
  note?: string
}

export const CONFIGURATIONS = ['single_diagonal', 'inverted_v', 'v', 'two_story_x'] as const
export const PHASES = ['sd', 'dd', 'cd', 'submittal', 'approved', 'coupon'] as const
export const YIELD_BASES = ['specified_min', 'yield_range', 'mill_cert', 'coupon'] as const
export const TONNAGE_STAGES = ['preliminary', 'final'] as const
export const TONNAGE_CATEGORIES = ['braces', 'beams', 'columns', 'connections', 'lateral_total', 'structural_total'] as const
export const BUILDING_USES = ['office', 'laboratory', 'healthcare', 'school', 'residential', 'parking', 'industrial', 'mixed', 'other'] as const

const key = (name: string): ColumnSpec => ({ name, type: 'text', required: true })

export const TABLES = {
  suppliers: [key('supplier_code'), { name: 'display_name', type: 'text', required: true }, { name: 'notes', type: 'text' }],
  projects: [
    key('project_code'),
    { name: 'name', type: 'text', required: true },
    { name: 'client', type: 'text' },
    { name: 'client_confidential', type: 'boolean' },
    { name: 'benchmark_permitted', type: 'boolean' },
    { name: 'office', type: 'text' },
    { name: 'region', type: 'text' },
    { name: 'building_use', type: 'enum', values: BUILDING_USES },
    { name: 'risk_category', type: 'enum', values: ['I', 'II', 'III', 'IV'] },
    { name: 'importance_factor', type: 'number', min: 0.5, max: 2, plausible: [1, 1.5] },
    { name: 'sdc', type: 'enum', values: ['A', 'B', 'C', 'D', 'E', 'F'] },
    { name: 'sds', type: 'number', min: 0, max: 5, plausible: [0.05, 2.5] },
    { name: 'sd1', type: 'number', min: 0, max: 5, plausible: [0.02, 1.8] },
    { name: 'site_class', type: 'enum', values: ['A', 'B', 'BC', 'C', 'CD', 'D', 'DE', 'E', 'F'] },
    { name: 'stories', type: 'integer', min: 1, max: 150, plausible: [1, 60] },
    { name: 'height', type: 'number', quantity: 'length', min: 0, max: 24_000, plausible: [96, 9_600] },
    { name: 'floor_area', type: 'number', quantity: 'floorArea', min: 0, max: 1e8, plausible: [1_000, 5e6] },
    { name: 'asce7_edition', type: 'text' },
    { name: 'aisc341_edition', type: 'text' },
    { name: 'analysis_method', type: 'enum', values: ['elf', 'mrsa', 'lrha', 'nlrha'] },
    { name: 'r', type: 'number', min: 1, max: 10, plausible: [6, 8] },
    { name: 'cd', type: 'number', min: 1, max: 10, plausible: [4, 6] },
    { name: 'omega0', type: 'number', min: 1, max: 4, plausible: [2, 2.5] },
    { name: 'supplier_code', type: 'text' },
    { name: 'year_designed', type: 'year', required: true, min: 1980, max: 2100 },
    { name: 'year_completed', type: 'year', min: 1980, max: 2100 },
    { name: 'phase_reached', type: 'enum', values: ['sd', 'dd', 'cd', 'construction', 'complete'] },
  ],
  frames: [
    key('project_code'),
    key('frame_line'),
    { name: 'configuration', type: 'enum', required: true, values: CONFIGURATIONS },
    { name: 'bays', type: 'integer', min: 1, max: 20 },
    // Stored in inches; plausible 10–60 ft.
    { name: 'bay_width', type: 'number', required: true, quantity: 'length', min: 0, max: 2_400, plausible: [120, 720] },
  ],
  levels: [
    key('project_code'),
    key('frame_line'),
    key('level'),
    { name: 'level_index', type: 'integer', required: true, min: 1, max: 150 },
    // Stored in inches; plausible 8–40 ft.
    { name: 'story_height', type: 'number', required: true, quantity: 'length', min: 0, max: 1_200, plausible: [96, 480] },
    { name: 'story_shear', type: 'number', required: true, quantity: 'force', min: 0, max: 1e6, plausible: [5, 20_000] },
    { name: 'design_drift', type: 'number', quantity: 'drift', min: 0, max: 100, plausible: [0.01, 20] },
  ],
  braces: [
    key('project_code'),
    key('frame_line'),
    key('level'),
    { name: 'brace_count', type: 'integer', required: true, min: 1, max: 100 },
    { name: 'angle_deg', type: 'number', required: true, min: 0, max: 90, plausible: [20, 70] },
    { name: 'work_point_length', type: 'number', required: true, quantity: 'length', min: 0, max: 2_400, plausible: [120, 900] },
    { name: 'required_strength', type: 'number', required: true, quantity: 'force', min: 0, max: 1e5, plausible: [5, 5_000] },
    { name: 'method', type: 'enum', values: ['lrfd', 'asd'] },
  ],
  brace_values: [
    key('project_code'),
    key('frame_line'),
    key('level'),
    { name: 'phase', type: 'enum', required: true, values: PHASES },
    { name: 'revision', type: 'integer', min: 0, max: 50 },
    { name: 'date', type: 'date' },
    { name: 'source_document', type: 'text' },
    { name: 'required_core_area', type: 'number', quantity: 'area', min: 0, max: 1_000, plausible: [0.25, 100] },
    { name: 'core_area', type: 'number', quantity: 'area', min: 0, max: 1_000, plausible: [0.25, 100] },
    // Core plate yield: the 30–65 ksi band of mild and A572 plate (engineering reference §5, from memory).
    { name: 'fysc', type: 'number', quantity: 'stress', min: 0, max: 1_000, plausible: [30, 65] },
    { name: 'fysc_basis', type: 'enum', values: YIELD_BASES },
    { name: 'fysc_max', type: 'number', quantity: 'stress', min: 0, max: 1_000, plausible: [30, 75] },
    { name: 'ry', type: 'number', min: 0.5, max: 3, plausible: [1, 1.6] },
    // β, ω, KF, Ly/Lwp bands from the BRB test literature (engineering reference §5, from memory), widened.
    { name: 'beta', type: 'number', min: 0, max: 5, plausible: [1, 1.3] },
    { name: 'omega', type: 'number', min: 0, max: 5, plausible: [1, 1.8] },
    { name: 'factor_drift_multiple', type: 'number', min: 0, max: 10, plausible: [1, 3] },
    { name: 'stiffness_factor', type: 'number', min: 0, max: 5, plausible: [1, 2] },
    { name: 'yield_length_ratio', type: 'number', min: 0, max: 1, plausible: [0.3, 0.9] },
    { name: 'governing', type: 'boolean' },
  ],
  tonnage: [
    key('project_code'),
    { name: 'stage', type: 'enum', required: true, values: TONNAGE_STAGES },
    { name: 'category', type: 'enum', required: true, values: TONNAGE_CATEGORIES },
    { name: 'weight', type: 'number', required: true, quantity: 'weight', min: 0, max: 1e6 },
    { name: 'scope', type: 'text' },
  ],
} as const satisfies Record<string, readonly ColumnSpec[]>

export type TableName = keyof typeof TABLES
export const TABLE_NAMES = Object.keys(TABLES) as TableName[]

/** Boolean spellings a spreadsheet may hold. */
export function parseBooleanCell(v: string): boolean | undefined {
  const t = v.trim().toLowerCase()
  if (['yes', 'y', 'true', '1'].includes(t)) return true
  if (['no', 'n', 'false', '0'].includes(t)) return false
  return undefined
}

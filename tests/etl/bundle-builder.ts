import type { RawBundle, RawCell, RawTable } from '../../etl/src/readers/types'

type Rows = Record<string, RawCell>[]

/** A RawBundle as a reader would return it, from plain rows; headers may carry `[unit]`. */
export function bundle(tables: Record<string, Rows>, about: Record<string, string> = { units: 'us' }, file = 'test.xlsx'): RawBundle {
  const out: RawTable[] = Object.entries(tables).map(([table, rows]) => {
    const headers = [...new Set(rows.flatMap(r => Object.keys(r)))]
    const columns = headers.map(h => {
      const m = /^(.*?)\s*\[(.+)\]\s*$/.exec(h)
      return { header: h, name: (m ? m[1]! : h).trim().toLowerCase(), unit: m ? m[2]!.trim() : undefined }
    })
    return {
      table,
      file,
      sheet: table,
      columns,
      rows: rows.map((r, i) => ({ line: i + 2, values: Object.fromEntries(columns.map(c => [c.name, r[c.header] ?? null])) })),
    }
  })
  return { file, format: 'xlsx', about, tables: out, problems: [] }
}

/** One valid two-story inverted-V project in US units (invented). */
export function validProject(code = 'T-001'): Record<string, Rows> {
  return {
    suppliers: [{ supplier_code: 'SUP-A', display_name: 'Supplier A' }],
    projects: [{ project_code: code, name: `Test building ${code}`, stories: 2, floor_area: 40_000, year_designed: 2019, supplier_code: 'SUP-A', sdc: 'D', phase_reached: 'complete' }],
    frames: [{ project_code: code, frame_line: 'A', configuration: 'inverted_v', bays: 1, bay_width: 30 }],
    levels: [
      { project_code: code, frame_line: 'A', level: 'L2', level_index: 1, story_height: 15, story_shear: 300 },
      { project_code: code, frame_line: 'A', level: 'Roof', level_index: 2, story_height: 13, story_shear: 180 },
    ],
    braces: [
      // derived: statics — tan θ = 2·15/30 → 45.0°; 2·13/30 → 40.91°
      { project_code: code, frame_line: 'A', level: 'L2', brace_count: 2, angle_deg: 45, work_point_length: 21.21, required_strength: 212.1 },
      { project_code: code, frame_line: 'A', level: 'Roof', brace_count: 2, angle_deg: 40.91, work_point_length: 19.85, required_strength: 119.1 },
    ],
    brace_values: [
      { project_code: code, frame_line: 'A', level: 'L2', phase: 'sd', required_core_area: 6.2, core_area: 6.5, fysc: 38, fysc_basis: 'yield_range', fysc_max: 46, beta: 1.1, omega: 1.4, stiffness_factor: 1.4, yield_length_ratio: 0.6 },
      { project_code: code, frame_line: 'A', level: 'L2', phase: 'coupon', core_area: 6.5, fysc: 42.5, fysc_basis: 'coupon', beta: 1.12, omega: 1.45, factor_drift_multiple: 2, stiffness_factor: 1.35, yield_length_ratio: 0.62, governing: 'yes' },
      { project_code: code, frame_line: 'A', level: 'Roof', phase: 'sd', required_core_area: 3.5, core_area: 3.5, fysc: 38, fysc_basis: 'yield_range', fysc_max: 46, beta: 1.1, omega: 1.4 },
    ],
    tonnage: [
      { project_code: code, stage: 'preliminary', category: 'lateral_total', weight: 42 },
      { project_code: code, stage: 'final', category: 'lateral_total', weight: 39.5, scope: 'braces, beams and columns of braced frames, gussets' },
    ],
  }
}

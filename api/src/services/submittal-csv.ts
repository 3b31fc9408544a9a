import type { SubmittalCheckResponse } from '@shared/schemas/projects'
import { toSafeCsv } from './csv-safe'

/**
 * The submittal check as a CSV sheet for the project file: one row per check item (a brace without
 * both snapshots gets one row saying what is missing), in stored units, with the check's key and
 * cautions as trailing rows. Written through the formula-safe writer.
 */
export const SUBMITTAL_CSV_HEADER = ['project', 'supplier_phase', 'supplier_revision', 'frame_line', 'level', 'design_snapshot', 'brace_status', 'item', 'status', 'design', 'supplier', 'unit', 'excess', 'excess_percent', 'message']

export function submittalCheckCsv(check: SubmittalCheckResponse, generatedAt: string): string {
  const rows: unknown[][] = []
  const round = (v: number | null, d: number) => (v === null ? null : Number(v.toFixed(d)))
  for (const b of check.braces) {
    const design = b.design ? `${b.design.phase} rev. ${b.design.revision}` : null
    const head = [check.code, check.phase, check.revision, b.frameLine, b.level, design, b.status]
    if (!b.items.length) {
      rows.push([...head, null, 'missing', null, null, null, null, null, b.design ? 'No supplier snapshot of this phase and revision.' : 'No design (sd/dd/cd) snapshot.'])
      continue
    }
    for (const i of b.items) rows.push([...head, i.item, i.status, round(i.design, 4), round(i.supplier, 4), i.unit, round(i.excess, 4), i.excessRatio === null ? null : round(i.excessRatio * 100, 2), i.message])
  }
  rows.push([])
  rows.push([`Tolerance band for core area and stiffness factor: ±${(check.tolerance * 100).toFixed(1)} %`])
  rows.push([`Summary: ${check.summary.braces} brace groups, ${check.summary.pass} pass, ${check.summary.exceeds} exceed, ${check.summary.missing} missing values`])
  rows.push([`Generated ${generatedAt}`])
  for (const c of check.cautions) rows.push([c])
  return toSafeCsv(SUBMITTAL_CSV_HEADER, rows)
}

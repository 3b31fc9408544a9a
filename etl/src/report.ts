import type { ImportProblem } from '@shared/history/types'
import type { RunSummary } from './run'

/** `file, sheet, row N, column: message (value)` — where a person finds the cell. */
export function formatProblem(p: ImportProblem): string {
  const where = [p.file, p.sheet && `sheet ${p.sheet}`, p.row !== undefined && `row ${p.row}`, p.column && `column ${p.column}`].filter(Boolean).join(', ')
  const value = p.value !== undefined && p.value !== '' ? ` (value: ${p.value})` : ''
  const project = p.projectCode ? ` [${p.projectCode}]` : ''
  return `${p.severity.toUpperCase().padEnd(6)} ${where}${project}: ${p.message}${value}`
}

export function formatSummary(s: RunSummary): string {
  const rows: [string, number][] = [
    ['projects in files', s.projects],
    ['loaded (new)', s.loaded],
    ['updated', s.updated],
    ['unchanged', s.unchanged],
    ['rejected', s.rejected],
    ['values queued for review', s.queued],
  ]
  const table = rows.map(([k, v]) => `  ${k.padEnd(26)} ${String(v).padStart(7)}`).join('\n')
  const shown = s.problems.filter(p => p.severity !== 'note').slice(0, 200)
  const more = s.problems.length - shown.length
  return [
    `${s.dryRun ? 'Dry run (nothing written)' : `Import run ${s.runId}`} — ${s.files.length} file(s) in ${(s.durationMs / 1000).toFixed(1)} s`,
    table,
    shown.length ? '\nProblems:\n' + shown.map(formatProblem).join('\n') : '\nNo problems found.',
    more > 0 ? `… and ${more} more (notes and the rest are stored with the run).` : '',
  ].join('\n')
}

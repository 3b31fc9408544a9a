import type { SizingResponse } from '@shared/schemas/sizing'
import { RESULT_COLUMNS, directionLabel, unitLabel } from './sizing-results'
import { describeInputs } from './worksheet-summary'
import type { WorksheetForm } from './worksheet-form'

/**
 * CSV export of the per-level results, with a header block carrying the design cautions, the
 * inputs and the unit of every column. Pure (string in, string out); the view turns it into a download.
 */

const FORMULA_START = /^[=+\-@\t\r]/

/**
 * One CSV cell. Text that a spreadsheet would run as a formula (starting with = + - @, a tab or
 * a carriage return) gets a leading `'` (OWASP's CSV-injection advice, common practice).
 * Numbers are written as numbers, so a negative value stays a number. Cells holding a comma,
 * a quote or a line break are quoted (RFC 4180).
 */
export function csvCell(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return ''
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : ''
  const text = FORMULA_START.test(value) ? `'${value}` : value
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text
}

export function csvLine(cells: readonly (string | number | null | undefined)[]): string {
  return cells.map(csvCell).join(',')
}

/** Ten significant digits: enough for any check, without float noise like 2.7850000000000001. */
const tidy = (v: number | null) => (v === null ? null : Number(v.toPrecision(10)))

export interface ResultsCsvInput {
  form: WorksheetForm
  result: SizingResponse
  /** ISO timestamp of the export. */
  generatedAt: string
  /** Whether the server's result was checked and matched (shown in the header). */
  serverCheck?: 'matches' | 'differs' | 'not checked'
}

/** The whole file: header block (title, cautions, inputs), then one row per level, then totals. CRLF line ends. */
export function buildResultsCsv({ form, result, generatedAt, serverCheck = 'not checked' }: ResultsCsvInput): string {
  const lines: string[] = []
  lines.push(csvLine(['Backsight – New frame worksheet (preliminary BRB sizing)']))
  lines.push(csvLine(['Generated', generatedAt]))
  lines.push(csvLine(['Server check', serverCheck]))
  lines.push('')
  lines.push(csvLine(['Cautions']))
  for (const caution of result.cautions) lines.push(csvLine(['Caution', caution]))
  lines.push('')
  lines.push(csvLine(['Inputs', 'Value', 'Unit']))
  for (const line of describeInputs(form)) lines.push(csvLine([line.label, line.value, line.unit]))
  lines.push('')

  const cols = RESULT_COLUMNS
  const heading = (label: string, field: string) => {
    const unit = unitLabel(result, field)
    return unit ? `${label} (${unit})` : label
  }
  lines.push(
    csvLine([
      'Level',
      heading('Story height', 'storyHeight'),
      heading('Story shear', 'storyShear'),
      heading('Brace angle', 'angleDeg'),
      'Braces at level',
      ...cols.map(c => heading(c.label(result.method), c.field)),
      'Beam unbalanced direction',
    ]),
  )
  for (const level of result.levels) {
    lines.push(
      csvLine([
        level.name,
        tidy(level.storyHeight),
        tidy(level.storyShear),
        tidy(level.angleDeg),
        level.bracesAtLevel,
        ...cols.map(c => tidy(level[c.field])),
        directionLabel(level.beamUnbalancedDirection).replace(/^[↑↓] /, ''),
      ]),
    )
  }
  lines.push('')
  lines.push(csvLine(['Totals', 'Value', 'Unit']))
  lines.push(csvLine(['Braces', result.totals.braceCount, '']))
  lines.push(csvLine(['Core weight', tidy(result.totals.coreWeight), unitLabel(result, 'coreWeight')]))
  lines.push(csvLine(['Estimated brace weight (placeholder ratio)', tidy(result.totals.estimatedBraceWeight), unitLabel(result, 'estimatedBraceWeight')]))
  lines.push(csvLine(['Largest DCR', tidy(result.totals.maxDemandCapacityRatio), '']))
  if (result.warnings.length) {
    lines.push('')
    lines.push(csvLine(['Warnings', 'Field']))
    for (const w of result.warnings) lines.push(csvLine([w.message, w.field]))
  }
  return lines.join('\r\n') + '\r\n'
}

/** A file name from the frame label: letters, digits and dashes only. */
export function csvFileName(label: string, date: string): string {
  const base = label.trim().toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 60)
  return `${base || 'new-frame'}-${date.slice(0, 10)}.csv`
}

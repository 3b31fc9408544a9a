import { parseBooleanCell, TABLES, type ColumnSpec, type TableName } from '@shared/history/columns'
import type { ImportProblem } from '@shared/history/types'
import { IMPORT_SYSTEM_UNITS, IMPORT_UNIT_FACTORS, normalizeUnitToken, STORED_UNITS, toStoredUnit } from '@shared/units/tokens'
import type { RawBundle, RawCell, RawTable } from '../readers/types'
import { suspectValue } from './plausibility'

export type TypedValue = string | number | boolean | null

/** One row after cell parsing: typed values in stored units, with where it came from. */
export interface TypedRow {
  table: TableName
  file: string
  sheet?: string
  line: number
  values: Record<string, TypedValue>
  /** Hard problems found in this row: its project is rejected. */
  errors: ImportProblem[]
  /** Values that parse but look wrong (review queue). */
  reviews: ImportProblem[]
}

/** Text a spreadsheet would run as a formula (OWASP CSV injection: = + - @, tab, carriage return). */
const FORMULA_LIKE = /^[=+\-@\t\r]/
const EXPORT_ESCAPED = /^'[=+\-@\t\r]/

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/

/** File-level default units from the `about` table: 'us' | 'si' | undefined (undeclared) | 'invalid'. */
function fileUnits(bundle: RawBundle, problems: ImportProblem[]): 'us' | 'si' | undefined {
  const raw = bundle.about.units?.trim().toLowerCase()
  if (raw === undefined || raw === '') return undefined
  if (raw === 'us' || raw === 'si') return raw
  problems.push({ severity: 'error', file: bundle.file, column: 'units', value: bundle.about.units, message: 'The file declares units that are neither "us" nor "si".' })
  return undefined
}

/**
 * Parses every table of a bundle against the column specs. Problems that concern a whole table
 * (unknown table, a quantity column without a unit, a missing required column) are returned as
 * row errors on every row of that table, so each affected project is rejected and says why.
 */
export function parseBundle(bundle: RawBundle): { rows: TypedRow[]; problems: ImportProblem[] } {
  const toProblem = (p: RawBundle['problems'][number]): ImportProblem => ({ severity: p.severity ?? 'error', file: p.file, sheet: p.sheet, row: p.line, column: p.column, message: p.message })
  // A reader's error inside a known table (a duplicate or reserved header, cells beyond the header, a
  // formula without a result) rejects the projects it touches: the row it names, or — for a header
  // problem — every row of that table. Notes and problems outside any table stay file-level.
  const known = bundle.tables.filter(t => t.table in TABLES)
  const inTable = new Map<RawTable, ImportProblem[]>()
  const problems: ImportProblem[] = []
  for (const p of bundle.problems) {
    const table = p.severity === 'note' ? undefined : known.find(t => t.sheet === p.sheet && t.file === p.file)
    if (table) inTable.set(table, [...(inTable.get(table) ?? []), toProblem(p)])
    else problems.push(toProblem(p))
  }
  const units = fileUnits(bundle, problems)
  const rows: TypedRow[] = []
  for (const table of bundle.tables) {
    if (!(table.table in TABLES)) {
      problems.push({
        severity: 'error',
        file: table.file,
        sheet: table.sheet,
        message: `Unknown table "${table.table}"; expected one of ${Object.keys(TABLES).join(', ')}. Its rows were not read.`,
      })
      continue
    }
    // A loop, not push(...rows): a table can hold more rows than a call takes arguments.
    const parsed = parseTable(table, table.table as TableName, units)
    const readerErrors = inTable.get(table) ?? []
    if (readerErrors.length) {
      const lines = new Set(table.rows.map(r => r.line))
      for (const row of parsed) {
        for (const e of readerErrors) if (e.row === row.line || e.row === undefined || !lines.has(e.row)) row.errors.push({ ...e, row: e.row ?? row.line })
      }
      // A table whose every row was empty still says what was wrong with it.
      if (!parsed.length) for (const e of readerErrors) problems.push(e)
    }
    for (const row of parsed) rows.push(row)
  }
  return { rows, problems }
}

function parseTable(table: RawTable, name: TableName, units: 'us' | 'si' | undefined): TypedRow[] {
  const specs: readonly ColumnSpec[] = TABLES[name]
  const where = { file: table.file, sheet: table.sheet }
  const tableErrors: ImportProblem[] = []
  const unitOf = new Map<string, string>()
  const present = new Set(table.columns.map(c => c.name))
  for (const spec of specs) {
    if (spec.required && !present.has(spec.name)) {
      tableErrors.push({ severity: 'error', ...where, column: spec.name, message: `Required column "${spec.name}" is missing from table ${name}.` })
    }
  }
  for (const col of table.columns) {
    const spec = specs.find(s => s.name === col.name)
    if (!spec?.quantity) continue
    const token = col.unit ?? (units ? IMPORT_SYSTEM_UNITS[units][spec.quantity] : undefined)
    if (token === undefined) {
      tableErrors.push({
        severity: 'error',
        ...where,
        column: col.header,
        message: `No unit for "${col.name}": declare units (us or si) in the about table, or write the unit in the header, e.g. "${col.name} [${IMPORT_SYSTEM_UNITS.us[spec.quantity]}]".`,
      })
      continue
    }
    const normalized = normalizeUnitToken(spec.quantity, token)
    if (!normalized) {
      tableErrors.push({
        severity: 'error',
        ...where,
        column: col.header,
        value: token,
        message: `Unknown unit "${token}" for ${col.name}; expected one of ${Object.keys(IMPORT_UNIT_FACTORS[spec.quantity]).join(', ')}.`,
      })
      continue
    }
    unitOf.set(col.name, normalized)
  }

  const units_: Record<string, string | undefined> = Object.fromEntries(unitOf)
  return table.rows.map(raw => {
    const row: TypedRow = { table: name, ...where, line: raw.line, values: {}, errors: tableErrors.length ? tableErrors.map(e => ({ ...e, row: raw.line })) : [], reviews: [] }
    for (const spec of specs) {
      const cell = raw.values[spec.name] ?? null
      const r = parseCell(spec, cell, units_[spec.name])
      if (r.error === undefined && r.review === undefined) {
        row.values[spec.name] = r.value
        continue
      }
      // Only problems pay for a location object.
      const at = { ...where, row: raw.line, column: spec.name, value: cell === null ? undefined : String(cell) }
      if (r.error) row.errors.push({ severity: 'error', ...at, message: r.error })
      else {
        row.values[spec.name] = r.value
        row.reviews.push({ severity: 'review', ...at, message: r.review! })
      }
    }
    return row
  })
}

function parseCell(spec: ColumnSpec, cell: RawCell, unit: string | undefined): { value: TypedValue; error?: string; review?: string } {
  const text = typeof cell === 'string' ? cell.trim() : cell
  if (text === null || text === '') {
    return spec.required ? { value: null, error: `${spec.name} is required.` } : { value: null }
  }
  switch (spec.type) {
    case 'text': {
      // Backsight's own CSV exports write a formula-like text as '=…; reading it back restores the text.
      const s = EXPORT_ESCAPED.test(String(text)) ? String(text).slice(1) : String(text)
      if (s.length > 200) return { value: null, error: `${spec.name} is longer than 200 characters.` }
      return FORMULA_LIKE.test(s)
        ? { value: s, review: `${spec.name} "${s.slice(0, 40)}" starts like a spreadsheet formula; it is kept as plain text and neutralised in every export — confirm it is meant.` }
        : { value: s }
    }
    case 'boolean': {
      const b = typeof text === 'boolean' ? text : parseBooleanCell(String(text))
      return b === undefined ? { value: null, error: `${spec.name} must be yes or no.` } : { value: b }
    }
    case 'enum': {
      const s = String(text).trim()
      const hit = spec.values?.find(v => v.toLowerCase() === s.toLowerCase())
      return hit ? { value: hit } : { value: null, error: `${spec.name} must be one of ${spec.values?.join(', ')}.` }
    }
    case 'date': {
      const s = String(text)
      const ok = /^\d{4}-\d{2}-\d{2}$/.test(s) && !Number.isNaN(Date.parse(`${s}T00:00:00Z`))
      return ok ? { value: s } : { value: null, error: `${spec.name} must be a date written YYYY-MM-DD.` }
    }
    default:
      return parseNumberCell(spec, text, unit)
  }
}

function parseNumberCell(spec: ColumnSpec, cell: string | number | boolean, unit: string | undefined) {
  let n: number
  if (typeof cell === 'number') n = cell
  else if (typeof cell === 'string' && NUMBER.test(cell.trim())) n = Number(cell.trim())
  else return { value: null, error: `${spec.name} must be a number.` }
  if (!Number.isFinite(n)) return { value: null, error: `${spec.name} must be a finite number.` }
  if ((spec.type === 'integer' || spec.type === 'year') && !Number.isInteger(n)) {
    return { value: null, error: `${spec.name} must be a whole number.` }
  }
  // Limits and plausible bands are stated in the stored units, so convert first.
  const stored = spec.quantity && unit ? toStoredUnit(spec.quantity, n, unit) : n
  const unitNote = spec.quantity ? ` ${STORED_UNITS[spec.quantity]}` : ''
  // A real (non-integer) quantity with a lower limit of 0 must be positive; counts may be 0.
  const exclusive = spec.type === 'number' && spec.min === 0
  if (spec.min !== undefined && (exclusive ? stored <= 0 : stored < spec.min)) {
    const limit = exclusive ? 'greater than 0' : `at least ${spec.min}${unitNote}`
    return { value: null, error: `${spec.name} ${n} cannot be right: it must be ${limit}.` }
  }
  if (spec.max !== undefined && stored > spec.max) {
    return { value: null, error: `${spec.name} ${n} cannot be right: it must be at most ${spec.max}${unitNote}.` }
  }
  const review = spec.plausible ? suspectValue(spec, stored, n, unit) : undefined
  return { value: stored, review }
}

import { parse } from 'csv-parse/sync'
import { aboutFromTable, TableBuilder, tableNameFromFile, toName, type Place } from './columns'
import { ReadError, type RawBundle, type RawCell } from './types'

const NEWLINE = /\r\n|\r|\n/
const NEWLINES = /\r\n|\r|\n/g

/** `,` unless the header line has more `;` or tabs (spreadsheets in many locales save `;`). */
function detectDelimiter(headerLine: string): string {
  const count = (char: string) => headerLine.split(char).length - 1
  return [';', '\t'].reduce((best, char) => (count(char) > count(best) ? char : best), ',')
}

/**
 * The line where a record starts. csv-parse reports the line where it ends, and its `raw` text includes the empty
 * and comment lines skipped before it; take those off, then count the line breaks inside the record.
 */
function startLine(raw: string, endLine: number): number {
  const lines = raw.split(NEWLINE)
  while (lines.length > 1 && (lines[0]!.trim() === '' || lines[0]!.startsWith('#'))) lines.shift()
  const text = lines.join('\n').replace(/\n$/, '')
  return endLine - (text.match(NEWLINES)?.length ?? 0)
}

interface CsvRecord {
  record: string[]
  /** Line where the record starts, counting from the top of the file. */
  line: number
}

/**
 * A file without a single quote character has no quoted fields, so each non-empty, non-comment line is one
 * record split at the delimiter — the same records csv-parse returns (tests/etl/readers/csv.test.ts checks
 * that), several times faster on large exports.
 */
export function splitPlain(lines: string[], skipped: number, delimiter: string): CsvRecord[] {
  const out: CsvRecord[] = []
  for (let i = skipped; i < lines.length; i++) {
    const text = lines[i]!
    if (text === '' || text.startsWith('#')) continue
    out.push({ record: text.split(delimiter), line: i + 1 })
  }
  return out
}

/** Quoted CSV through csv-parse, with the line each record starts on. */
export function parseQuoted(file: string, body: string, delimiter: string, skipped: number): CsvRecord[] {
  let records: { record: string[]; raw: string; info: { lines: number } }[]
  try {
    // With `info` and `raw`, csv-parse returns { record, raw, info } objects; its types only know string[][].
    records = parse(body, {
      delimiter,
      relax_column_count: true,
      relax_quotes: true,
      skip_empty_lines: true,
      comment: '#',
      comment_no_infix: true,
      info: true,
      raw: true,
    }) as unknown as typeof records
  } catch (error) {
    const line = (error as { lines?: number }).lines
    const where = line === undefined ? '' : `line ${line + skipped}: `
    throw new ReadError(file, `not readable as CSV (${where}${error instanceof Error ? error.message : String(error)})`)
  }
  return records.map(({ record, raw, info }) => ({ record, line: startLine(raw, info.lines) + skipped }))
}

/**
 * Reads one CSV text (BOM already removed) as one table named after the file (`north-2019-levels.csv` → `levels`).
 * Leading `# key: value` lines go into `about`; other lines starting with `#` are comments. Values stay trimmed
 * strings (empty → `null`); lines count the header, comment and empty lines. A file named `about` fills `about`.
 */
export function readCsv(file: string, text: string, problems: Place[] = []): RawBundle {
  const about: Record<string, string> = {}
  const lines = text.split(NEWLINE)
  let skipped = 0
  for (const line of lines) {
    const trimmed = line.trim()
    if (trimmed !== '' && !trimmed.startsWith('#')) break
    const declaration = /^#\s*([^:]+?)\s*:\s*(.*?)\s*$/.exec(trimmed)
    if (declaration) about[toName(declaration[1]!)] = declaration[2]!
    skipped++
  }
  const body = lines.slice(skipped).join('\n')
  const delimiter = detectDelimiter(lines[skipped] ?? '')
  const records = body.includes('"') ? parseQuoted(file, body, delimiter, skipped) : splitPlain(lines, skipped, delimiter)
  const table = tableNameFromFile(file)
  const [header, ...rows] = records
  if (!header && table !== 'about') problems.push({ message: 'the file has no header line' })
  const builder = new TableBuilder({}, header?.record ?? [], header?.line, (i) => `column ${i + 1}`, problems)
  for (const { record, line } of rows) {
    const cells: RawCell[] = record.map((cell) => {
      const t = cell.trim()
      return t === '' ? null : t
    })
    builder.add(line, cells)
  }
  const bundle: RawBundle = { file, format: 'csv', about, tables: [], problems: problems.map((p) => ({ file, ...p })) }
  if (table === 'about') Object.assign(about, aboutFromTable(builder.table(table, file)))
  else bundle.tables.push(builder.table(table, file))
  return bundle
}

import ExcelJS from 'exceljs'
import { aboutFromTable, KNOWN_TABLES, normalizeHeader, TableBuilder, toIsoDate, toName, type Place } from './columns'
import { ReadError, type RawBundle, type RawCell } from './types'
import { zipBombReason } from './zip-guard'

/** `0` → `A`, `27` → `AB`. */
function columnLetter(index: number): string {
  let letters = ''
  for (let n = index + 1; n > 0; n = Math.floor((n - 1) / 26)) letters = String.fromCharCode(65 + ((n - 1) % 26)) + letters
  return letters
}

/**
 * One cell as a {@link RawCell}: formulas give their cached result, rich text and hyperlinks their text, dates
 * `YYYY-MM-DD`. An error value (`#DIV/0!`) or a formula without a cached result is `null` plus a problem.
 */
function toCell(value: ExcelJS.CellValue, problem: (message: string) => void): RawCell {
  if (value === null || value === undefined) return null
  if (typeof value === 'string') return value.trim() === '' ? null : value.trim()
  if (typeof value === 'number') return Number.isFinite(value) ? value : null
  if (typeof value === 'boolean') return value
  if (value instanceof Date) return toIsoDate(value)
  if ('error' in value) {
    problem(`cell holds the error ${value.error}`)
    return null
  }
  if ('richText' in value) return toCell(value.richText.map((part) => part.text).join(''), problem)
  if ('hyperlink' in value) return toCell(value.text as ExcelJS.CellValue, problem)
  if ('formula' in value || 'sharedFormula' in value) {
    const formula = 'formula' in value && value.formula ? value.formula : (value as ExcelJS.CellSharedFormulaValue).sharedFormula
    if (value.result === undefined) {
      problem(`formula =${formula} has no saved result; open and save the workbook in a spreadsheet program`)
      return null
    }
    if (typeof value.result === 'object' && !(value.result instanceof Date) && 'error' in value.result) {
      problem(`formula =${formula} gives the error ${value.result.error}`)
      return null
    }
    return toCell(value.result, problem)
  }
  return null
}

/**
 * Reads an XLSX workbook: one table per worksheet (name lowercased), header in row 1, Excel row numbers as lines;
 * the sheet `about` (columns `key`, `value`) goes into `about`. Fully empty rows and empty sheets are skipped.
 */
export async function readXlsx(file: string, data: Uint8Array): Promise<RawBundle> {
  const bomb = zipBombReason(data)
  if (bomb) throw new ReadError(file, `refused as a workbook: ${bomb}`)
  const workbook = new ExcelJS.Workbook()
  try {
    // exceljs types its input as its own `Buffer` interface; at run time it takes a Node Buffer.
    type XlsxInput = Parameters<typeof workbook.xlsx.load>[0]
    await workbook.xlsx.load(Buffer.from(data.buffer, data.byteOffset, data.byteLength) as unknown as XlsxInput)
  } catch (error) {
    throw new ReadError(file, `not a readable XLSX workbook (${error instanceof Error ? error.message : String(error)})`)
  }
  const bundle: RawBundle = { file, format: 'xlsx', about: {}, tables: [], problems: [] }
  const problems: Place[] = []
  for (const sheet of workbook.worksheets) {
    if (sheet.actualRowCount === 0) continue
    const width = sheet.columnCount
    const place = { sheet: sheet.name }
    const header = sheet.getRow(1)
    const headers = Array.from({ length: width }, (_, i) => {
      const cell = toCell(header.getCell(i + 1).value, (message) => problems.push({ ...place, line: 1, message }))
      return cell === null ? null : String(cell)
    })
    const names = headers.map((h) => (h === null ? undefined : normalizeHeader(h).name || undefined))
    const builder = new TableBuilder(place, headers, 1, (i) => `column ${columnLetter(i)}`, problems)
    sheet.eachRow((row, line) => {
      if (line === 1) return
      const cells = Array.from({ length: width }, (_, i) =>
        toCell(row.getCell(i + 1).value, (message) => {
          const column = names[i] === undefined ? {} : { column: names[i] }
          problems.push({ ...place, line, ...column, message: `${columnLetter(i)}${line}: ${message}` })
        }),
      )
      builder.add(line, cells)
    })
    const table = builder.table(toName(sheet.name), file)
    if (table.table === 'about') Object.assign(bundle.about, aboutFromTable(table))
    else bundle.tables.push(table)
  }
  if (bundle.tables.length === 0 && problems.length === 0) {
    throw new ReadError(file, `the workbook has no tables to load (expected sheets named ${KNOWN_TABLES.filter((t) => t !== 'about').join(', ')}, each with a header row)`)
  }
  bundle.problems = problems.map((problem) => ({ file, ...problem }))
  return bundle
}

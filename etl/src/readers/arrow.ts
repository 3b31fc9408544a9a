import { DataType, tableFromIPC, type Field, type Table } from 'apache-arrow'
import { aboutFromTable, normalizeHeader, TableBuilder, tableNameFromFile, toIsoDate, toName, type Place } from './columns'
import { ReadError, type RawBundle, type RawCell } from './types'

/** Schema metadata written by other tools that is not a declaration of ours. */
const FOREIGN_METADATA = /^(pandas|arrow:|huggingface)/i

/** One value of a column of type `field.type` as a {@link RawCell}. */
function toCell(field: Field, value: unknown, problem: (message: string) => void): RawCell {
  if (value === null || value === undefined) return null
  if (DataType.isDate(field.type) || DataType.isTimestamp(field.type)) {
    // Date32/Date64/Timestamp values come out as epoch milliseconds (UTC).
    return toIsoDate(value instanceof Date ? value : new Date(Number(value)))
  }
  if (typeof value === 'bigint') {
    if (value >= BigInt(Number.MIN_SAFE_INTEGER) && value <= BigInt(Number.MAX_SAFE_INTEGER)) return Number(value)
    problem(`integer ${value} is too large to read exactly; kept as text`)
    return String(value)
  }
  if (typeof value === 'number') {
    if (Number.isNaN(value)) return null // pandas writes missing floats as NaN
    if (Number.isFinite(value)) return value
    problem(`value ${value} is not a finite number`)
    return null
  }
  if (typeof value === 'string') return value.trim() === '' ? null : value.trim()
  if (typeof value === 'boolean') return value
  problem(`values of type ${String(field.type)} are not supported; read as empty`)
  return null
}

/** The unit of a column: `[unit]` in its name, else the field metadata key `unit`. */
function headerOf(field: Field): string {
  const unit = field.metadata.get('unit')
  return unit && normalizeHeader(field.name).unit === undefined ? `${field.name} [${unit}]` : field.name
}

/**
 * Reads an Arrow IPC file (`ARROW1`, also Feather v2) or stream as one table. Schema metadata `table` names it
 * (else the file name rule of CSV); the other keys (`units`, `format`, `version`) go into `about`. Lines are the row
 * index + 1.
 */
export function readArrow(file: string, data: Uint8Array): RawBundle {
  let table: Table
  try {
    table = tableFromIPC(data)
  } catch (error) {
    throw new ReadError(file, `not a readable Arrow IPC file (${error instanceof Error ? error.message : String(error)})`)
  }
  const about: Record<string, string> = {}
  let name = tableNameFromFile(file)
  for (const [key, value] of table.schema.metadata) {
    if (toName(key) === 'table') name = toName(value)
    else if (!FOREIGN_METADATA.test(key)) about[toName(key)] = value.trim()
  }
  const problems: Place[] = []
  const fields = table.schema.fields
  const builder = new TableBuilder({}, fields.map(headerOf), undefined, (i) => `column ${i + 1} ("${fields[i]!.name}")`, problems)
  // Whole columns at once: the vector iterator is far cheaper than get(row) per cell.
  const columns = fields.map((_, i) => Array.from(table.getChildAt(i)!) as unknown[])
  const unsupported = new Set<number>()
  let line = 0
  const reporters = fields.map((field, i) => (message: string) => {
    // An unsupported type would repeat on every row: say it once per column.
    if (message.includes('not supported')) {
      if (unsupported.has(i)) return
      unsupported.add(i)
    }
    problems.push({ line, column: normalizeHeader(field.name).name, message })
  })
  for (let row = 0; row < table.numRows; row++) {
    line = row + 1
    const cells: RawCell[] = new Array(fields.length)
    for (let i = 0; i < fields.length; i++) cells[i] = toCell(fields[i]!, columns[i]![row], reporters[i]!)
    builder.add(line, cells)
  }
  const bundle: RawBundle = { file, format: 'arrow', about, tables: [], problems: problems.map((p) => ({ file, ...p })) }
  if (name === 'about') Object.assign(about, aboutFromTable(builder.table(name, file)))
  else bundle.tables.push(builder.table(name, file))
  return bundle
}

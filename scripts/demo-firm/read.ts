import { existsSync, readFileSync, readdirSync, statSync } from 'node:fs'
import { join } from 'node:path'
import { tableFromIPC } from 'apache-arrow'
import { parse } from 'csv-parse/sync'
import ExcelJS from 'exceljs'

/**
 * Read the demo files back into plain tables ({ header, rows } per table, every cell as text, '' for
 * empty), so two output folders — or a folder and `planFiles` — can be compared row by row without
 * depending on zip bytes. Not a loader: no units, no validation.
 */

export interface ParsedTable {
  header: string[]
  rows: string[][]
}
export type ParsedFile = Record<string, ParsedTable>

const text = (v: unknown): string => (v === null || v === undefined ? '' : typeof v === 'object' && 'result' in (v as object) ? String((v as { result: unknown }).result) : String(v))

export async function readXlsx(path: string): Promise<ParsedFile> {
  const wb = new ExcelJS.Workbook()
  await wb.xlsx.readFile(path)
  const out: ParsedFile = {}
  wb.eachSheet((ws) => {
    const width = ws.getRow(1).cellCount
    const cells = (i: number) => Array.from({ length: width }, (_, j) => text(ws.getRow(i).getCell(j + 1).value))
    const header = cells(1)
    const rows: string[][] = []
    for (let i = 2; i <= ws.rowCount; i++) rows.push(cells(i))
    out[ws.name] = { header, rows }
  })
  return out
}

export function readCsvFolder(dir: string): ParsedFile {
  const out: ParsedFile = {}
  for (const name of readdirSync(dir).filter((f) => f.endsWith('.csv')).sort()) {
    const [header, ...rows] = parse(readFileSync(join(dir, name), 'utf8'), { relax_column_count: false }) as string[][]
    out[name.replace(/\.csv$/, '')] = { header: header!, rows }
  }
  return out
}

export function readArrow(path: string): { metadata: Record<string, string>; table: ParsedTable } {
  const table = tableFromIPC(readFileSync(path))
  const header = table.schema.fields.map((f) => f.name)
  const rows = table.toArray().map((r) => header.map((h) => text((r as Record<string, unknown>)[h])))
  return { metadata: Object.fromEntries(table.schema.metadata), table: { header, rows } }
}

/** Every demo output in a folder, by relative path. */
export async function readDemoFolder(dir: string): Promise<Record<string, ParsedFile>> {
  const out: Record<string, ParsedFile> = {}
  for (const entry of readdirSync(dir).sort()) {
    const path = join(dir, entry)
    if (entry.endsWith('.xlsx')) out[entry] = await readXlsx(path)
    else if (entry.endsWith('.arrow')) {
      const { metadata, table } = readArrow(path)
      out[entry] = { [metadata.table ?? 'unknown']: table, schema_metadata: { header: Object.keys(metadata), rows: [Object.values(metadata)] } }
    } else if (existsSync(path) && statSync(path).isDirectory()) out[entry] = readCsvFolder(path)
  }
  return out
}

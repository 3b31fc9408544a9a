import { mkdirSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { Field, Float64, Schema, Table, Utf8, tableToIPC, vectorFromArray } from 'apache-arrow'
import { stringify } from 'csv-stringify/sync'
import ExcelJS from 'exceljs'
import { kipToKn } from '@shared/units/force'
import { renderReadme } from './readme'
import { roundTo } from './random'
import { COLUMNS, TABLE_NAMES, type Cell, type DemoTables, type Row, type TableName } from './tables'

/**
 * Split the demo tables into the files a firm would hand over, and write them:
 * - two XLSX workbooks (all tables of their projects, an `about` sheet, units `us`);
 * - a folder of CSV exports for 2020–2026, whose `levels.csv` carries `story_shear [kN]`
 *   (per-column SI override) and whose `brace_values.csv` covers 2020–2023 only;
 * - one Arrow IPC file with the brace_values of the 2024–2026 projects (schema metadata
 *   `table` = `brace_values`, `units` = `us`), merged with the CSV folder by project_code.
 */

export type FileFormat = 'xlsx' | 'csv' | 'arrow'

/** One output: a file (xlsx, arrow) or a folder of CSV files, relative to the output folder. */
export interface DemoFile {
  path: string
  format: FileFormat
  description: string
  tables: Partial<{ [T in TableName]: Row<T>[] }>
  /** Per-column unit overrides written as `name [unit]` headers, with converted values. */
  columnUnits: Partial<Record<TableName, Record<string, 'kN'>>>
}

/** Fixed workbook dates, so the workbook metadata does not depend on the clock. */
export const WORKBOOK_DATE = new Date('2026-06-30T00:00:00Z')
export const WORKBOOK_AUTHOR = 'Backsight demo-firm generator'
export const ARROW_FILE = 'analysis-export-2024-2026-brace_values.arrow'
export const CSV_FOLDER = 'csv-export-2020-2026'

type AnyRow = Record<string, Cell>

/** Which file each project's tables go to (pure; tests use it to compare with the committed files). */
export function planFiles(t: DemoTables): DemoFile[] {
  const year = new Map(t.projects.map((p) => [p.project_code, p.year_designed as number]))
  const office = new Map(t.projects.map((p) => [p.project_code, p.office]))
  const forProjects = (keep: (code: Cell) => boolean, names: readonly TableName[] = TABLE_NAMES) => {
    const tables: DemoFile['tables'] = {}
    const projects = t.projects.filter((p) => keep(p.project_code))
    const used = new Set(projects.map((p) => p.supplier_code))
    for (const name of names) {
      if (name === 'about') tables.about = t.about
      else if (name === 'suppliers') tables.suppliers = t.suppliers.filter((s) => used.has(s.supplier_code))
      else (tables as Record<string, AnyRow[]>)[name] = (t[name] as AnyRow[]).filter((r) => keep(r.project_code ?? null))
    }
    return tables
  }
  const y = (code: Cell) => year.get(code as string) ?? 0
  const early = (code: Cell) => y(code) <= 2019
  const allButBraceValues = TABLE_NAMES.filter((n) => n !== 'brace_values')
  const csvTables = forProjects((c) => y(c) >= 2020, allButBraceValues)
  csvTables.brace_values = t.brace_values.filter((r) => y(r.project_code) >= 2020 && y(r.project_code) <= 2023)
  return [
    {
      path: 'north-office-2008-2019.xlsx', format: 'xlsx', columnUnits: {},
      description: 'North office workbook, projects designed 2008–2019, all tables.',
      tables: forProjects((c) => early(c) && office.get(c as string) === 'North'),
    },
    {
      path: 'south-and-coast-2008-2019.xlsx', format: 'xlsx', columnUnits: {},
      description: 'South and Coast offices workbook, projects designed 2008–2019, all tables.',
      tables: forProjects((c) => early(c) && office.get(c as string) !== 'North'),
    },
    {
      path: CSV_FOLDER, format: 'csv', columnUnits: { levels: { story_shear: 'kN' } },
      description: 'CSV export, all offices, projects designed 2020–2026; brace_values only for 2020–2023 (the rest are in the Arrow file); `story_shear [kN]` in levels.csv.',
      tables: csvTables,
    },
    {
      path: ARROW_FILE, format: 'arrow', columnUnits: {},
      description: 'Arrow IPC file: brace_values of the projects designed 2024–2026 (their other tables are in the CSV folder).',
      tables: { brace_values: t.brace_values.filter((r) => y(r.project_code) >= 2024) },
    },
  ]
}

/** Header and cell values of one table in a file, with per-column unit overrides applied. */
export function tableCells(file: DemoFile, name: TableName): { header: string[]; rows: Cell[][] } {
  const columns = COLUMNS[name] as readonly string[]
  const units = file.columnUnits[name] ?? {}
  const header = columns.map((c) => (units[c] ? `${c} [${units[c]}]` : c))
  const rows = ((file.tables[name] ?? []) as AnyRow[]).map((r) =>
    columns.map((c) => {
      const v = r[c] ?? null
      // kip → kN (NIST SP 811 exact bases, shared/units), to 0.01 kN.
      return units[c] === 'kN' && typeof v === 'number' ? roundTo(kipToKn(v), 2) : v
    }),
  )
  return { header, rows }
}

async function writeXlsx(file: DemoFile, path: string): Promise<void> {
  const wb = new ExcelJS.Workbook()
  wb.creator = WORKBOOK_AUTHOR
  wb.lastModifiedBy = WORKBOOK_AUTHOR
  wb.created = WORKBOOK_DATE
  wb.modified = WORKBOOK_DATE
  for (const name of TABLE_NAMES) {
    if (!file.tables[name]) continue
    const ws = wb.addWorksheet(name)
    const { header, rows } = tableCells(file, name)
    ws.addRow(header)
    for (const row of rows) ws.addRow(row)
  }
  await wb.xlsx.writeFile(path)
}

function writeCsvFolder(file: DemoFile, dir: string): void {
  mkdirSync(dir, { recursive: true })
  for (const name of TABLE_NAMES) {
    if (!file.tables[name]) continue
    const { header, rows } = tableCells(file, name)
    writeFileSync(join(dir, `${name}.csv`), stringify([header, ...rows.map((r) => r.map((v) => (v === null ? '' : v)))]))
  }
}

function writeArrow(file: DemoFile, path: string): void {
  const [name] = Object.keys(file.tables) as TableName[]
  const { header, rows } = tableCells(file, name!)
  const vectors: Record<string, ReturnType<typeof vectorFromArray>> = {}
  const fields: Field[] = []
  header.forEach((column, j) => {
    const values = rows.map((r) => r[j] ?? null)
    const numeric = values.every((v) => v === null || typeof v === 'number')
    const type = numeric ? new Float64() : new Utf8()
    vectors[column] = vectorFromArray(values as (number | string | null)[], type as Float64 | Utf8) as ReturnType<typeof vectorFromArray>
    fields.push(new Field(column, type, true))
  })
  const table = new Table(vectors)
  const schema = new Schema(table.schema.fields, new Map([['format', 'backsight-history'], ['version', '1'], ['table', name!], ['units', 'us']]))
  writeFileSync(path, tableToIPC(new Table(schema, table.batches), 'file'))
}

/** Write every demo file and the README into `outDir`. Returns the files written. */
export async function writeDemoFirm(t: DemoTables, outDir: string): Promise<DemoFile[]> {
  mkdirSync(outDir, { recursive: true })
  const files = planFiles(t)
  for (const file of files) {
    const path = join(outDir, file.path)
    if (file.format === 'xlsx') await writeXlsx(file, path)
    else if (file.format === 'csv') writeCsvFolder(file, path)
    else writeArrow(file, path)
  }
  writeFileSync(join(outDir, 'README.md'), renderReadme(t, files))
  return files
}

import ExcelJS from 'exceljs'
import { stringify } from 'csv-stringify/sync'

type Rows = Record<string, string | number | boolean | null>[]

/** An XLSX workbook of import-format tables (one sheet each, plus `about`). */
export async function workbookOf(tables: Record<string, Rows>, about: Record<string, string> = { units: 'us' }): Promise<Buffer> {
  const wb = new ExcelJS.Workbook()
  const a = wb.addWorksheet('about')
  a.addRow(['key', 'value'])
  for (const [k, v] of Object.entries(about)) a.addRow([k, v])
  for (const [name, rows] of Object.entries(tables)) {
    const ws = wb.addWorksheet(name)
    const headers = [...new Set(rows.flatMap(r => Object.keys(r)))]
    ws.addRow(headers)
    for (const r of rows) ws.addRow(headers.map(h => r[h] ?? null))
  }
  return Buffer.from(await wb.xlsx.writeBuffer())
}

/** One table as CSV text, with an optional `# units:` line. */
export function csvOf(rows: Rows, units?: 'us' | 'si'): string {
  const headers = [...new Set(rows.flatMap(r => Object.keys(r)))]
  return (units ? `# units: ${units}\n` : '') + stringify([headers, ...rows.map(r => headers.map(h => r[h] ?? null))])
}

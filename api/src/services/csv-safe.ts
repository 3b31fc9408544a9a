import { stringify } from 'csv-stringify/sync'

/**
 * CSV for spreadsheets, with formula injection neutralised: a text cell starting with
 * = + - @ (or a tab or carriage return) gets a leading apostrophe so no spreadsheet runs it.
 * Numbers are written as numbers.
 */
export function toSafeCsv(header: string[], rows: unknown[][]): string {
  return stringify([header.map(neutralise), ...rows.map(r => r.map(neutralise))])
}

export function neutralise(cell: unknown): string | number | boolean | null {
  if (cell === null || cell === undefined) return null
  if (typeof cell === 'number' || typeof cell === 'boolean') return cell
  const s = String(cell)
  return /^[=+\-@\t\r]/.test(s) ? `'${s}` : s
}

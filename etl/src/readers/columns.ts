import { basename, extname } from 'node:path'
import type { RawCell, RawColumn, RawRow, RawTable, ReaderProblem } from './types'

/** The tables of the history format (docs/import-format.md), used to pick a table name out of a file name. */
export const KNOWN_TABLES = ['about', 'suppliers', 'projects', 'frames', 'levels', 'braces', 'brace_values', 'tonnage']

const UNIT_SUFFIX = /^(.*?)\s*\[([^\]]*)\]\s*$/

/**
 * Splits a header into name and unit: `' Story Shear [kN] '` → `{ header, name: 'story_shear', unit: 'kN' }`.
 * Only a trailing `[..]` is a unit; empty brackets give `unit: ''` so the validator can say so.
 */
export function normalizeHeader(header: string): RawColumn {
  const match = UNIT_SUFFIX.exec(header)
  const name = toName(match ? match[1]! : header)
  return match ? { header, name, unit: match[2]!.trim() } : { header, name }
}

/** Lowercased, trimmed, inner whitespace → `_`. Used for column, table and `about` key names. */
export function toName(text: string): string {
  return text.replace(/^\uFEFF/, '').trim().toLowerCase().replace(/\s+/g, '_')
}

/**
 * Table name from a file name: the base name without extension, or — when it has `-`/`_` separators — the last
 * segment (or pair of segments, for `brace_values`) that is a known table: `north-2019-levels.csv` → `levels`.
 */
export function tableNameFromFile(file: string): string {
  const base = toName(basename(file, extname(file)))
  if (KNOWN_TABLES.includes(base)) return base
  const parts = base.split(/[-_]+/)
  for (let i = parts.length - 1; i >= 0; i--) {
    const pair = i > 0 ? `${parts[i - 1]}_${parts[i]}` : ''
    if (KNOWN_TABLES.includes(pair)) return pair
    if (KNOWN_TABLES.includes(parts[i]!)) return parts[i]!
  }
  return base
}

/** Where a problem is, without the file (the bundle adds it). */
export type Place = Omit<ReaderProblem, 'file'>

/** Names that would reach into an object's prototype: never read as columns. */
const RESERVED_NAMES = new Set(['__proto__', 'constructor', 'prototype'])

type Slot = { kind: 'column'; column: RawColumn } | { kind: 'duplicate' } | { kind: 'blank' }

/**
 * Builds one table from positional headers and rows, shared by all four readers: reports duplicate
 * names (keeping the first column), data under a blank header, and cells beyond the header; skips empty rows.
 */
export class TableBuilder {
  readonly columns: RawColumn[] = []
  readonly rows: RawRow[] = []
  private readonly slots: Slot[] = []
  private readonly reported = new Set<number>()

  /**
   * @param place sheet (XLSX) added to every problem
   * @param label how a human names a column position: `column C` (XLSX), `column 3` (CSV)
   * @param problems where problems are collected
   */
  constructor(
    private readonly place: Pick<ReaderProblem, 'sheet'>,
    headers: (string | null)[],
    headerLine: number | undefined,
    private readonly label: (index: number) => string,
    private readonly problems: Place[],
  ) {
    const seen = new Map<string, number>()
    headers.forEach((header, index) => {
      const column = header === null || header.trim() === '' ? undefined : normalizeHeader(header)
      if (!column || column.name === '') {
        if (column) this.report(`${label(index)} header "${header}" has no name, only a unit`, headerLine)
        this.slots[index] = { kind: 'blank' }
        return
      }
      if (RESERVED_NAMES.has(column.name)) {
        this.report(`${label(index)} header "${header}" is a reserved word, not a column of the format; its values are ignored`, headerLine, column.name)
        this.slots[index] = { kind: 'duplicate' }
        return
      }
      const first = seen.get(column.name)
      if (first === undefined) {
        seen.set(column.name, index)
        this.columns.push(column)
        this.slots[index] = { kind: 'column', column }
        return
      }
      this.slots[index] = { kind: 'duplicate' }
      this.report(
        `duplicate column "${column.name}": ${label(first)} ("${headers[first]}") and ${label(index)} ("${header}"); ` +
          `the values of ${label(index)} are ignored`,
        headerLine,
        column.name,
      )
    })
  }

  /** Adds one row of cells (positional, like the headers); a row with no value is skipped. */
  add(line: number, cells: RawCell[]): void {
    if (cells.every((cell) => cell === null)) return
    const values: Record<string, RawCell> = {}
    for (const column of this.columns) values[column.name] = null
    let width = 0
    cells.forEach((cell, index) => {
      if (cell === null) return
      const slot = this.slots[index]
      if (!slot) width = index + 1
      else if (slot.kind === 'column') values[slot.column.name] = cell
      else if (slot.kind === 'blank' && !this.reported.has(index)) {
        this.reported.add(index)
        this.report(`${this.label(index)} has data but no header; its values are ignored`, line)
      }
    })
    if (width > 0) {
      this.report(`row has ${width} cells but the header has ${this.slots.length}; the extra cells are ignored`, line)
    }
    this.rows.push({ line, values })
  }

  /** The finished table. */
  table(table: string, file: string): RawTable {
    const sheet = this.place.sheet === undefined ? {} : { sheet: this.place.sheet }
    return { table, file, ...sheet, columns: this.columns, rows: this.rows }
  }

  private report(message: string, line?: number, column?: string): void {
    this.problems.push({
      ...this.place,
      ...(line === undefined ? {} : { line }),
      ...(column === undefined ? {} : { column }),
      message,
    })
  }
}

const ABOUT_KEYS = ['format', 'version', 'units']

/**
 * Reads an `about` table (columns `key`, `value`) into lowercased keys. A two-column table whose first header is
 * itself a key (`units,si` as the first line) is read as pairs from its header row on.
 */
export function aboutFromTable(table: RawTable): Record<string, string> {
  const about: Record<string, string> = {}
  const [first, second] = table.columns
  const byName = table.columns.some((c) => c.name === 'key') && table.columns.some((c) => c.name === 'value')
  const pairs: [RawCell, RawCell][] = byName
    ? table.rows.map((row) => [row.values.key ?? null, row.values.value ?? null])
    : first && second && table.columns.length === 2 && ABOUT_KEYS.includes(first.name)
      ? [[first.header, second.header], ...table.rows.map((row): [RawCell, RawCell] => [row.values[first.name] ?? null, row.values[second.name] ?? null])]
      : []
  for (const [key, value] of pairs) {
    if (key === null || value === null || String(key).trim() === '') continue
    about[toName(String(key))] = String(value).trim()
  }
  return about
}

/** A date as `YYYY-MM-DD` in UTC (Excel and Arrow dates carry no zone; both readers hand out UTC instants). */
export function toIsoDate(date: Date): string | null {
  return Number.isNaN(date.getTime()) ? null : date.toISOString().slice(0, 10)
}

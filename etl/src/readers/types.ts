/**
 * What the history readers hand to validation: every format (XLSX, CSV, Arrow IPC, JSON) becomes the same
 * {@link RawBundle} of {@link RawTable}s. Values are still raw — strings stay strings in CSV, numbers are not
 * converted between units — so the validator sees what the file says, with a line a human can find.
 */

/** One cell as read. Dates become `'YYYY-MM-DD'`; formulas their cached result; rich text plain text; empty `null`. */
export type RawCell = string | number | boolean | null

/** A column header, split into its name and its optional unit suffix (`story_shear [kN]`). */
export interface RawColumn {
  /** The header as written in the file. */
  header: string
  /** Lowercased, trimmed, unit suffix removed, inner whitespace → `_`: `Story Shear [kN]` → `story_shear`. */
  name: string
  /** The token inside `[..]`, trimmed, case kept (`kN`); absent when the header has no brackets. */
  unit?: string
}

/** One data row. */
export interface RawRow {
  /**
   * 1-based row number a human finds in the file: the Excel row number; the CSV line number (counting the header
   * line and any comment lines; for a quoted cell spanning lines, the line where the row starts); for JSON and
   * Arrow the index in its array + 1.
   */
  line: number
  /** Keyed by {@link RawColumn.name}; every column of the table is present (`null` when empty). */
  values: Record<string, RawCell>
}

/** One table: an XLSX sheet, a CSV file, an Arrow file or one array of a JSON document. */
export interface RawTable {
  /** Lowercased table name (`levels`, `brace_values`). */
  table: string
  file: string
  /** The sheet name as written (XLSX only). */
  sheet?: string
  columns: RawColumn[]
  rows: RawRow[]
}

/** Everything read from one file. */
export interface RawBundle {
  file: string
  /** The format found by content, whatever the extension says. */
  format: 'xlsx' | 'csv' | 'arrow' | 'json'
  /** File-level declarations with lowercased keys, e.g. `{ format: 'backsight-history', version: '1', units: 'si' }`. */
  about: Record<string, string>
  tables: RawTable[]
  /** Problems in parts of the file; the rest is still read. */
  problems: ReaderProblem[]
}

/** A problem in one place of a file, reported as `file:line column message`. */
export interface ReaderProblem {
  file: string
  sheet?: string
  line?: number
  /** The {@link RawColumn.name} concerned, when there is one. */
  column?: string
  message: string
  /** 'note' for what does not stop a value loading (an encoding guessed); errors otherwise. */
  severity?: 'note'
}

/**
 * The whole file cannot be read (missing, binary junk, a zip that is not a workbook, malformed JSON …).
 * `message` does not repeat the file name; print it as `${file}: ${message}`.
 */
export class ReadError extends Error {
  constructor(
    readonly file: string,
    message: string,
  ) {
    super(message)
    this.name = 'ReadError'
  }
}

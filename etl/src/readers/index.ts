import { readdir, readFile, stat } from 'node:fs/promises'
import { dirname, extname, join, resolve } from 'node:path'
import { readArrow } from './arrow'
import { tableNameFromFile, type Place } from './columns'
import { readCsv } from './csv'
import { readJson } from './json'
import { ReadError, type RawBundle } from './types'
import { readXlsx } from './xlsx'

export { normalizeHeader } from './columns'
export { ReadError } from './types'
export type { RawBundle, RawCell, RawColumn, RawRow, RawTable, ReaderProblem } from './types'

const startsWith = (data: Uint8Array, bytes: number[]) => bytes.every((byte, i) => data[i] === byte)
const ascii = (text: string) => [...text].map((c) => c.charCodeAt(0))

/** Whether a zip holds an Excel workbook: its part names are stored uncompressed, so look for `xl/workbook.xml`. */
const isWorkbookZip = (data: Uint8Array) => Buffer.from(data.buffer, data.byteOffset, data.byteLength).includes('xl/workbook.xml')

/** Text of a CSV or JSON file: BOM-aware (UTF-8, UTF-16 LE/BE), UTF-8 by default, Windows-1252 when not UTF-8. */
function decodeText(file: string, data: Uint8Array, problems: Place[]): string {
  if (startsWith(data, [0xef, 0xbb, 0xbf])) return new TextDecoder('utf-8').decode(data.subarray(3))
  if (startsWith(data, [0xff, 0xfe])) return new TextDecoder('utf-16le').decode(data.subarray(2))
  if (startsWith(data, [0xfe, 0xff])) {
    const swapped = new Uint8Array(data.length - 2 - (data.length % 2))
    for (let i = 0; i < swapped.length; i += 2) [swapped[i], swapped[i + 1]] = [data[i + 3]!, data[i + 2]!]
    return new TextDecoder('utf-16le').decode(swapped)
  }
  const sample = data.subarray(0, 4096)
  const control = sample.filter((b) => b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d && b !== 0x0c).length
  if (sample.includes(0) || control > sample.length / 100) {
    throw new ReadError(file, 'binary content that is not an XLSX workbook, an Arrow file, JSON or CSV text')
  }
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(data)
  } catch {
    problems.push({ severity: 'note', message: 'the text is not UTF-8; it was read as Windows-1252 (save it as UTF-8 to be sure)' })
    return new TextDecoder('windows-1252').decode(data)
  }
}

/**
 * Reads one history file, detecting the format by content: a zip with `xl/workbook.xml` is XLSX; `ARROW1` or an
 * Arrow IPC stream header is Arrow; text starting with `{` (after an optional BOM) is JSON; other text is CSV.
 * Reads `file` from disk when `data` is not given.
 * @throws ReadError when the file is missing or unreadable as a whole (binary junk, a zip that is not a workbook).
 */
export async function readBundle(file: string, data?: Uint8Array): Promise<RawBundle> {
  let bytes = data
  if (!bytes) {
    try {
      bytes = new Uint8Array(await readFile(file))
    } catch (error) {
      throw new ReadError(file, `cannot be read (${(error as NodeJS.ErrnoException).code ?? String(error)})`)
    }
  }
  if (bytes.length === 0) throw new ReadError(file, 'the file is empty')
  if (startsWith(bytes, ascii('PK\x03\x04'))) {
    if (!isWorkbookZip(bytes)) throw new ReadError(file, 'a zip archive that is not an XLSX workbook (it has no xl/workbook.xml)')
    return readXlsx(file, bytes)
  }
  if (startsWith(bytes, [0xd0, 0xcf, 0x11, 0xe0])) throw new ReadError(file, 'an old-style .xls workbook; save it as .xlsx')
  if (startsWith(bytes, ascii('FEA1'))) throw new ReadError(file, 'a Feather v1 file; save it as Feather v2 / Arrow IPC')
  // Arrow IPC file magic, or a stream starting with the 0xFFFFFFFF continuation marker of its schema message.
  if (startsWith(bytes, ascii('ARROW1')) || startsWith(bytes, [0xff, 0xff, 0xff, 0xff])) return readArrow(file, bytes)
  const problems: Place[] = []
  const text = decodeText(file, bytes, problems)
  if (/^\s*[{[]/.test(text)) {
    const bundle = readJson(file, text)
    return { ...bundle, problems: [...problems.map((p) => ({ file, ...p })), ...bundle.problems] }
  }
  return readCsv(file, text, problems)
}

const EXTENSIONS = new Set(['.xlsx', '.csv', '.arrow', '.feather', '.json'])

/** The files to read for one path: the path itself, or a folder's history files (not recursive, sorted). */
async function expand(path: string): Promise<string[]> {
  let info
  try {
    info = await stat(path)
  } catch (error) {
    throw new ReadError(path, `cannot be read (${(error as NodeJS.ErrnoException).code ?? String(error)})`)
  }
  if (!info.isDirectory()) return [path]
  const entries = await readdir(path, { withFileTypes: true })
  return entries
    .filter((e) => e.isFile() && EXTENSIONS.has(extname(e.name).toLowerCase()) && !/^(\.|~\$)/.test(e.name))
    .map((e) => e.name)
    .sort()
    .map((name) => join(path, name))
}

/**
 * Reads files and folders (each folder's `*.xlsx`, `*.csv`, `*.arrow`, `*.feather`, `*.json`, not recursive,
 * sorted), each file once. An `about.csv` (any CSV whose table is `about`) lends its declarations to the other CSV
 * files of its folder, without overriding their own `# key: value` lines; it is not returned itself unless it has
 * problems (then as a bundle without tables, so they are not lost).
 * @throws ReadError on the first path or file that cannot be read.
 */
export async function readPaths(paths: string[]): Promise<RawBundle[]> {
  const seen = new Set<string>()
  const bundles: RawBundle[] = []
  for (const path of paths) {
    for (const file of await expand(path)) {
      if (seen.has(resolve(file))) continue
      seen.add(resolve(file))
      bundles.push(await readBundle(file))
    }
  }
  return applyFolderAbout(bundles)
}

/**
 * An `about.csv` (any CSV whose table is `about`) lends its declarations to the other CSV files of its
 * folder, without overriding their own `# key: value` lines. The about bundles themselves are dropped
 * unless they have problems (then kept without tables, so the problems are not lost).
 */
export function applyFolderAbout(bundles: RawBundle[]): RawBundle[] {
  const isAbout = (b: RawBundle) => b.format === 'csv' && b.tables.length === 0 && tableNameFromFile(b.file) === 'about'
  const folderAbout = new Map<string, Record<string, string>>()
  for (const bundle of bundles.filter(isAbout)) {
    const folder = resolve(dirname(bundle.file))
    folderAbout.set(folder, { ...folderAbout.get(folder), ...bundle.about })
  }
  return bundles
    .filter((bundle) => !isAbout(bundle) || bundle.problems.length > 0)
    .map((bundle) => {
      const inherited = bundle.format === 'csv' && !isAbout(bundle) ? folderAbout.get(resolve(dirname(bundle.file))) : undefined
      return inherited ? { ...bundle, about: { ...inherited, ...bundle.about } } : bundle
    })
}

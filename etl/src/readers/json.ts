import { aboutFromTable, normalizeHeader, TableBuilder, toName, type Place } from './columns'
import { ReadError, type RawBundle, type RawCell } from './types'

const isObject = (value: unknown): value is Record<string, unknown> =>
  typeof value === 'object' && value !== null && !Array.isArray(value)

/** Deepest nesting read; the format needs three levels (document → table → row). */
export const MAX_JSON_DEPTH = 32

/** Deepest nesting of brackets and braces outside strings, in one pass over the text. */
function nestingDepth(text: string): number {
  let depth = 0
  let max = 0
  let inString = false
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i)
    if (inString) {
      if (c === 0x5c) i++ // backslash: skip the escaped character
      else if (c === 0x22) inString = false
    } else if (c === 0x22) inString = true
    else if (c === 0x7b || c === 0x5b) max = Math.max(max, ++depth)
    else if (c === 0x7d || c === 0x5d) depth--
  }
  return max
}

/** A JSON.parse message with its character position turned into a line number. */
function describeSyntaxError(text: string, error: unknown): string {
  const message = error instanceof Error ? error.message : String(error)
  const position = /at position (\d+)/.exec(message)
  if (!position || /line \d+/.test(message)) return message
  const line = text.slice(0, Number(position[1])).split('\n').length
  return `line ${line}: ${message}`
}

function toCell(value: unknown, problem: (message: string) => void): RawCell {
  if (value === null || value === undefined) return null
  if (typeof value === 'string') return value.trim() === '' ? null : value.trim()
  if (typeof value === 'number' || typeof value === 'boolean') return value
  problem(`a cell holds ${Array.isArray(value) ? 'an array' : 'an object'}; only text, numbers, true/false and null are read`)
  return null
}

/**
 * Reads one JSON document `{ "format": "backsight-history", "version": 1, "units": "us", "<table>": [{...}] }`.
 * Top-level strings, numbers and booleans go into `about` (an `"about"` object or key/value array too); each array of
 * objects is a table whose headers are the union of the row keys in first-seen order. Lines are the index + 1.
 */
export function readJson(file: string, text: string): RawBundle {
  const depth = nestingDepth(text)
  if (depth > MAX_JSON_DEPTH) throw new ReadError(file, `the JSON is nested ${depth} levels deep; a history document needs 3 (at most ${MAX_JSON_DEPTH} are read)`)
  let document: unknown
  try {
    document = JSON.parse(text)
  } catch (error) {
    throw new ReadError(file, `not readable as JSON (${describeSyntaxError(text, error)})`)
  }
  if (!isObject(document)) throw new ReadError(file, 'the JSON document is not an object')
  const bundle: RawBundle = { file, format: 'json', about: {}, tables: [], problems: [] }
  const problems: Place[] = []
  for (const [key, value] of Object.entries(document)) {
    const name = toName(key)
    if (typeof value === 'string' || typeof value === 'number' || typeof value === 'boolean') {
      bundle.about[name] = String(value).trim()
    } else if (name === 'about' && isObject(value)) {
      for (const [k, v] of Object.entries(value)) if (v !== null && !isObject(v)) bundle.about[toName(k)] = String(v).trim()
    } else if (Array.isArray(value)) {
      const headers = [...new Set(value.flatMap((row) => (isObject(row) ? Object.keys(row) : [])))]
      const builder = new TableBuilder({ sheet: key }, headers, undefined, (i) => `"${key}" key "${headers[i]}"`, problems)
      value.forEach((row, index) => {
        const line = index + 1
        if (!isObject(row)) {
          problems.push({ sheet: key, line, message: `"${key}"[${index}] is not an object; skipped` })
          return
        }
        const cells = headers.map((header) =>
          toCell(row[header], (message) => problems.push({ sheet: key, line, column: normalizeHeader(header).name, message: `"${key}"[${index}].${header}: ${message}` })),
        )
        builder.add(line, cells)
      })
      const table = builder.table(name, file)
      if (name === 'about') Object.assign(bundle.about, aboutFromTable(table))
      else bundle.tables.push(table)
    } else {
      problems.push({ message: `top-level "${key}" is neither a declaration (text, number) nor a table (array); ignored` })
    }
  }
  bundle.problems = problems.map((p) => ({ file, ...p }))
  return bundle
}

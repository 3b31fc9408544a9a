import { createLevelRow, type LevelRow } from './worksheet-form'

/**
 * "Paste a column from a spreadsheet": turns copied cells (lines, tab-separated) into numbers
 * and writes them into one column of the levels table. Pure, unit-tested in node.
 */

export interface PastedColumn {
  /** The numbers, in the order they were pasted. */
  values: number[]
  /** Cells that were not numbers, with their 1-based position in the paste. */
  rejected: { position: number; text: string }[]
}

const THOUSANDS = /^[+-]?\d{1,3}(,\d{3})+(\.\d+)?$/
const DECIMAL_COMMA = /^[+-]?\d+,\d+$/

/**
 * One spreadsheet cell as a number: trims, drops surrounding quotes, accepts thousands separators
 * ("1,250.5") and a decimal comma ("3,5"). Returns `undefined` for anything else (text, units).
 */
export function toCellNumber(cell: string): number | undefined {
  let text = cell.trim().replace(/^"(.*)"$/, '$1').replace(/\u00a0/g, '').trim()
  if (text === '') return undefined
  if (THOUSANDS.test(text)) text = text.replace(/,/g, '')
  else if (DECIMAL_COMMA.test(text)) text = text.replace(',', '.')
  if (!/^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(text)) return undefined
  const value = Number(text)
  return Number.isFinite(value) ? value : undefined
}

/**
 * The cells of a paste as one column. A column copied from a spreadsheet arrives as lines;
 * a row arrives as tab-separated cells on one line; a block of several columns keeps only its
 * first column. Blank lines are skipped. `topFirst` reverses the order, for sheets that list
 * the roof first (the worksheet lists the bottom story first).
 */
export function parsePastedColumn(text: string, options: { topFirst?: boolean } = {}): PastedColumn {
  const lines = text.replace(/\r\n?/g, '\n').split('\n').filter(l => l.trim() !== '')
  const cells = lines.length === 1 ? lines[0]!.split('\t') : lines.map(l => l.split('\t')[0]!)
  const values: number[] = []
  const rejected: PastedColumn['rejected'] = []
  cells.forEach((cell, i) => {
    if (cell.trim() === '') return
    const value = toCellNumber(cell)
    if (value === undefined) rejected.push({ position: i + 1, text: cell.trim() })
    else values.push(value)
  })
  if (options.topFirst) values.reverse()
  return { values, rejected }
}

/**
 * The levels with `values` written into `field`, from row `start` (0 = bottom story) upwards.
 * Rows are added (named L1, L2, …) when the paste runs past the table, up to `maxLevels`;
 * values beyond that are dropped. Rows outside the pasted range keep their values.
 */
export function applyColumn(
  levels: readonly LevelRow[],
  field: 'storyHeight' | 'storyShear',
  values: readonly number[],
  options: { start?: number; maxLevels?: number } = {},
): LevelRow[] {
  const start = Math.max(0, options.start ?? 0)
  const maxLevels = options.maxLevels ?? 60
  const count = Math.min(Math.max(levels.length, start + values.length), maxLevels)
  const out: LevelRow[] = []
  for (let i = 0; i < count; i++) {
    const row = levels[i] ?? createLevelRow(i)
    const v = values[i - start]
    out.push(i >= start && v !== undefined ? { ...row, [field]: v } : { ...row })
  }
  return out
}

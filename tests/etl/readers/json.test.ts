import { describe, expect, it } from 'vitest'
import { readBundle, ReadError } from '../../../etl/src/readers'
import { LEVEL_COLUMNS, LEVEL_HEADERS, LEVEL_ROWS, levelRows, PROJECT_COLUMNS, PROJECT_HEADERS, PROJECT_ROWS, projectRows } from '../../fixtures/etl/history-tables'

const utf8 = (text: string) => new TextEncoder().encode(text)
const objects = (headers: string[], rows: (string | number | null)[][]) =>
  rows.map((row) => Object.fromEntries(headers.map((header, i) => [header, row[i]])))

describe('readBundle (JSON)', () => {
  it('reads top-level strings and numbers into about and each array of objects as a table, lines = index + 1', async () => {
    const document = {
      format: 'backsight-history',
      version: 1,
      units: 'us',
      Projects: objects(PROJECT_HEADERS, PROJECT_ROWS),
      levels: objects(LEVEL_HEADERS, LEVEL_ROWS),
    }
    expect(await readBundle('history.json', utf8(`\uFEFF  ${JSON.stringify(document, null, 2)}`))).toEqual({
      file: 'history.json',
      format: 'json',
      about: { format: 'backsight-history', version: '1', units: 'us' },
      tables: [
        { table: 'projects', file: 'history.json', sheet: 'Projects', columns: PROJECT_COLUMNS, rows: projectRows([1, 2]) },
        { table: 'levels', file: 'history.json', sheet: 'levels', columns: LEVEL_COLUMNS, rows: levelRows([1, 2, 3]) },
      ],
      problems: [],
    })
  })

  it('takes headers from the union of row keys; a missing key is null', async () => {
    const text = JSON.stringify({ frames: [{ project_code: 'KR-2021-003', frame_line: 'A' }, { project_code: 'KR-2021-003', 'bay_width [m]': 9.1 }] })
    const bundle = await readBundle('frames.json', utf8(text))
    expect(bundle.tables[0]!.columns).toEqual([
      { header: 'project_code', name: 'project_code' },
      { header: 'frame_line', name: 'frame_line' },
      { header: 'bay_width [m]', name: 'bay_width', unit: 'm' },
    ])
    expect(bundle.tables[0]!.rows).toEqual([
      { line: 1, values: { project_code: 'KR-2021-003', frame_line: 'A', bay_width: null } },
      { line: 2, values: { project_code: 'KR-2021-003', frame_line: null, bay_width: 9.1 } },
    ])
  })

  it('reads a nested object or array in a cell as null, with a problem naming the cell', async () => {
    const text = JSON.stringify({ levels: [{ level: 'L2', story_shear: { value: 420, unit: 'kip' } }, { level: 'L3', story_shear: [310] }] })
    const bundle = await readBundle('levels.json', utf8(text))
    expect(bundle.tables[0]!.rows).toEqual([
      { line: 1, values: { level: 'L2', story_shear: null } },
      { line: 2, values: { level: 'L3', story_shear: null } },
    ])
    expect(bundle.problems).toEqual([
      {
        file: 'levels.json',
        sheet: 'levels',
        line: 1,
        column: 'story_shear',
        message: '"levels"[0].story_shear: a cell holds an object; only text, numbers, true/false and null are read',
      },
      {
        file: 'levels.json',
        sheet: 'levels',
        line: 2,
        column: 'story_shear',
        message: '"levels"[1].story_shear: a cell holds an array; only text, numbers, true/false and null are read',
      },
    ])
  })

  it('throws ReadError with the line for malformed JSON', async () => {
    const error = await readBundle('broken.json', utf8('{\n  "units": "si",\n  "levels": [ { "level": "L2", } ]\n}')).catch((e: unknown) => e)
    expect(error).toBeInstanceOf(ReadError)
    expect((error as ReadError).file).toBe('broken.json')
    expect((error as ReadError).message).toMatch(/^not readable as JSON \(.*line 3/)
  })
})

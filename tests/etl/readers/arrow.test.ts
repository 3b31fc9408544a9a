import { DateDay, Int64, Schema, Table, tableFromArrays, tableToIPC, TimestampMillisecond, vectorFromArray } from 'apache-arrow'
import { describe, expect, it } from 'vitest'
import { readBundle } from '../../../etl/src/readers'
import { LEVEL_COLUMNS, levelRows, PROJECT_COLUMNS, projectRows } from '../../fixtures/etl/history-tables'

/** The same table with schema metadata, as pyarrow's `replace_schema_metadata` writes it. */
const withMetadata = (table: Table, metadata: Record<string, string>) =>
  new Table(new Schema(table.schema.fields, new Map(Object.entries(metadata))), table.batches)

const PROJECTS = tableFromArrays({
  project_code: ['KR-2021-003', 'KR-2022-011'],
  Name: ['Alder Street Clinic', 'Quarry Hill School'],
  year_designed: Int32Array.from([2021, 2022]),
  height: Float64Array.from([58.5, 44]),
})

const LEVELS = tableFromArrays({
  project_code: ['KR-2021-003', 'KR-2021-003', 'KR-2021-003'],
  frame_line: ['A', 'A', 'B'],
  level: ['L2', 'L3', 'L2'],
  level_index: Int32Array.from([1, 2, 1]),
  story_height: [15, 13, 15],
  'Story Shear [kN]': [1870, 1380, 1655.5],
  design_drift: [1.8, null, 1.6],
})

describe('readBundle (Arrow IPC)', () => {
  it('names the table from schema metadata `table` and puts the other keys into about', async () => {
    const data = tableToIPC(withMetadata(PROJECTS, { table: 'Projects', format: 'backsight-history', version: '1', units: 'us' }), 'file')
    expect(await readBundle('export-0001.arrow', data)).toEqual({
      file: 'export-0001.arrow',
      format: 'arrow',
      about: { format: 'backsight-history', version: '1', units: 'us' },
      tables: [{ table: 'projects', file: 'export-0001.arrow', columns: PROJECT_COLUMNS, rows: projectRows([1, 2]) }],
      problems: [],
    })
  })

  it('falls back to the file name rule without `table` metadata, and reads the stream format too', async () => {
    const data = tableToIPC(withMetadata(LEVELS, { units: 'us' }), 'stream')
    expect(await readBundle('north-2019-levels.feather', data)).toEqual({
      file: 'north-2019-levels.feather',
      format: 'arrow',
      about: { units: 'us' },
      tables: [{ table: 'levels', file: 'north-2019-levels.feather', columns: LEVEL_COLUMNS, rows: levelRows([1, 2, 3]) }],
      problems: [],
    })
  })

  it('reads dates and timestamps as YYYY-MM-DD, safe 64-bit integers as numbers, large ones as text with a problem', async () => {
    const table = new Table({
      date: vectorFromArray([new Date(Date.UTC(2021, 8, 30)), null], new DateDay()),
      approved_at: vectorFromArray([new Date(Date.UTC(2022, 0, 14, 23, 15)), new Date(Date.UTC(2022, 1, 1))], new TimestampMillisecond()),
      revision: vectorFromArray([2n, 2n ** 60n], new Int64()),
      governing: vectorFromArray([true, false]),
    })
    const bundle = await readBundle('brace_values.arrow', tableToIPC(table, 'file'))
    expect(bundle.tables[0]!.rows).toEqual([
      { line: 1, values: { date: '2021-09-30', approved_at: '2022-01-14', revision: 2, governing: true } },
      { line: 2, values: { date: null, approved_at: '2022-02-01', revision: '1152921504606846976', governing: false } },
    ])
    expect(bundle.problems).toEqual([
      { file: 'brace_values.arrow', line: 2, column: 'revision', message: 'integer 1152921504606846976 is too large to read exactly; kept as text' },
    ])
  })
})

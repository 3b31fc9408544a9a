import { describe, expect, it } from 'vitest'
import { readBundle, type RawRow } from '../../../etl/src/readers'
import { LEVEL_COLUMNS, PROJECT_COLUMNS } from '../../fixtures/etl/history-tables'

const utf8 = (text: string) => new TextEncoder().encode(text)

/** UTF-16 bytes with their BOM, as spreadsheet programs save "Unicode text". */
function utf16(text: string, order: 'le' | 'be'): Uint8Array {
  const bytes = new Uint8Array(2 + text.length * 2)
  bytes.set(order === 'le' ? [0xff, 0xfe] : [0xfe, 0xff])
  for (let i = 0; i < text.length; i++) {
    const code = text.charCodeAt(i)
    bytes.set(order === 'le' ? [code & 0xff, code >> 8] : [code >> 8, code & 0xff], 2 + i * 2)
  }
  return bytes
}

const PROJECTS_CSV = ['# units: us', 'project_code,Name,year_designed,height', 'KR-2021-003,Alder Street Clinic,2021,58.5', 'KR-2022-011, Quarry Hill School ,2022,44', ''].join('\n')

const LEVELS_CSV = [
  '# format: backsight-history',
  '# units: us',
  '# exported from the firm archive',
  'project_code,frame_line,level,level_index,story_height,Story Shear [kN],design_drift',
  'KR-2021-003,A,L2,1,15,1870,1.8',
  'KR-2021-003,A,L3,2,13,1380,',
  '',
  'KR-2021-003,B,L2,1,15,1655.5,1.6',
].join('\r\n')

/** The level rows of LEVELS_CSV: values stay text, number parsing is the validator's job. */
const LEVEL_TEXT_ROWS: RawRow[] = [
  { line: 5, values: { project_code: 'KR-2021-003', frame_line: 'A', level: 'L2', level_index: '1', story_height: '15', story_shear: '1870', design_drift: '1.8' } },
  { line: 6, values: { project_code: 'KR-2021-003', frame_line: 'A', level: 'L3', level_index: '2', story_height: '13', story_shear: '1380', design_drift: null } },
  { line: 8, values: { project_code: 'KR-2021-003', frame_line: 'B', level: 'L2', level_index: '1', story_height: '15', story_shear: '1655.5', design_drift: '1.6' } },
]

describe('readBundle (CSV)', () => {
  it('reads projects.csv: header line 2 after the units comment, trimmed text values', async () => {
    expect(await readBundle('projects.csv', utf8(PROJECTS_CSV))).toEqual({
      file: 'projects.csv',
      format: 'csv',
      about: { units: 'us' },
      tables: [
        {
          table: 'projects',
          file: 'projects.csv',
          columns: PROJECT_COLUMNS,
          rows: [
            { line: 3, values: { project_code: 'KR-2021-003', name: 'Alder Street Clinic', year_designed: '2021', height: '58.5' } },
            { line: 4, values: { project_code: 'KR-2022-011', name: 'Quarry Hill School', year_designed: '2022', height: '44' } },
          ],
        },
      ],
      problems: [],
    })
  })

  it('names north-2019-levels.csv `levels`, counts comment and empty lines, reads # key: value into about', async () => {
    expect(await readBundle('exports/north-2019-levels.csv', utf8(LEVELS_CSV))).toEqual({
      file: 'exports/north-2019-levels.csv',
      format: 'csv',
      about: { format: 'backsight-history', units: 'us' },
      tables: [{ table: 'levels', file: 'exports/north-2019-levels.csv', columns: LEVEL_COLUMNS, rows: LEVEL_TEXT_ROWS }],
      problems: [],
    })
  })

  it('gives the starting line of a row whose quoted cell spans lines, and skips # comment lines between rows', async () => {
    const text = 'project_code,source_document,phase\nKR-2021-003,"Submittal R1\nsheet 4",submittal\n# checked 2022-03-01\nKR-2021-003,Coupon report,coupon\n'
    const bundle = await readBundle('brace_values.csv', utf8(text))
    expect(bundle.tables[0]!.table).toBe('brace_values')
    expect(bundle.tables[0]!.rows).toEqual([
      { line: 2, values: { project_code: 'KR-2021-003', source_document: 'Submittal R1\nsheet 4', phase: 'submittal' } },
      { line: 5, values: { project_code: 'KR-2021-003', source_document: 'Coupon report', phase: 'coupon' } },
    ])
  })

  it('strips a UTF-8 BOM from the first header', async () => {
    const bundle = await readBundle('levels.csv', utf8('\uFEFFproject_code,level\nKR-2021-003,L2\n'))
    expect(bundle.tables[0]!.columns).toEqual([
      { header: 'project_code', name: 'project_code' },
      { header: 'level', name: 'level' },
    ])
    expect(bundle.tables[0]!.rows).toEqual([{ line: 2, values: { project_code: 'KR-2021-003', level: 'L2' } }])
  })

  it.each(['le', 'be'] as const)('decodes UTF-16 %s text with a BOM', async (order) => {
    const bundle = await readBundle('levels.csv', utf16('# units: si\r\nproject_code,Story Shear [kN]\r\nKR-2021-003,1870\r\n', order))
    expect(bundle.about).toEqual({ units: 'si' })
    expect(bundle.tables[0]!.columns).toEqual([
      { header: 'project_code', name: 'project_code' },
      { header: 'Story Shear [kN]', name: 'story_shear', unit: 'kN' },
    ])
    expect(bundle.tables[0]!.rows).toEqual([{ line: 3, values: { project_code: 'KR-2021-003', story_shear: '1870' } }])
    expect(bundle.problems).toEqual([])
  })

  it('reads semicolon-separated files', async () => {
    const bundle = await readBundle('tonnage.csv', utf8('project_code;stage;weight [tonne]\nKR-2021-003;final;41,5\n'))
    expect(bundle.tables[0]!.rows).toEqual([{ line: 2, values: { project_code: 'KR-2021-003', stage: 'final', weight: '41,5' } }])
  })

  it('reports a row with more cells than headers, and ignores trailing empty cells', async () => {
    const bundle = await readBundle('levels.csv', utf8('project_code,level\nKR-2021-003,L2,,\nKR-2021-003,L3,extra\n'))
    expect(bundle.tables[0]!.rows).toEqual([
      { line: 2, values: { project_code: 'KR-2021-003', level: 'L2' } },
      { line: 3, values: { project_code: 'KR-2021-003', level: 'L3' } },
    ])
    expect(bundle.problems).toEqual([
      { file: 'levels.csv', line: 3, message: 'row has 3 cells but the header has 2; the extra cells are ignored' },
    ])
  })

  it('reports duplicate headers naming both columns', async () => {
    const bundle = await readBundle('levels.csv', utf8('level,story_shear,Story_Shear [kN]\nL2,420,1870\n'))
    expect(bundle.tables[0]!.rows).toEqual([{ line: 2, values: { level: 'L2', story_shear: '420' } }])
    expect(bundle.problems).toEqual([
      {
        file: 'levels.csv',
        line: 1,
        column: 'story_shear',
        message: 'duplicate column "story_shear": column 2 ("story_shear") and column 3 ("Story_Shear [kN]"); the values of column 3 are ignored',
      },
    ])
  })

  it('reads text that is not UTF-8 as Windows-1252, with a problem', async () => {
    const bytes = Uint8Array.from([...utf8('project_code,name\nKR-2021-003,Caf'), 0xe9, ...utf8(' Annex\n')])
    const bundle = await readBundle('projects.csv', bytes)
    expect(bundle.tables[0]!.rows).toEqual([{ line: 2, values: { project_code: 'KR-2021-003', name: 'Café Annex' } }])
    expect(bundle.problems).toEqual([
      { file: 'projects.csv', severity: 'note', message: 'the text is not UTF-8; it was read as Windows-1252 (save it as UTF-8 to be sure)' },
    ])
  })

  it('reads about.csv into about, not as a table', async () => {
    const bundle = await readBundle('about.csv', utf8('key,value\nformat,backsight-history\nversion,1\nunits,si\n'))
    expect(bundle).toEqual({
      file: 'about.csv',
      format: 'csv',
      about: { format: 'backsight-history', version: '1', units: 'si' },
      tables: [],
      problems: [],
    })
  })
})

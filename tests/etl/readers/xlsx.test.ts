import ExcelJS from 'exceljs'
import { describe, expect, it } from 'vitest'
import { readBundle } from '../../../etl/src/readers'
import { LEVEL_COLUMNS, LEVEL_HEADERS, LEVEL_ROWS, levelRows, PROJECT_COLUMNS, PROJECT_HEADERS, PROJECT_ROWS, projectRows } from '../../fixtures/etl/history-tables'

/** A workbook written by exceljs, as the bytes a user would upload. */
async function workbook(build: (wb: ExcelJS.Workbook) => void): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook()
  build(wb)
  return new Uint8Array(await wb.xlsx.writeBuffer())
}

describe('readBundle (XLSX)', () => {
  it('reads the about sheet into about and one table per sheet, with Excel row numbers as lines', async () => {
    const data = await workbook((wb) => {
      const about = wb.addWorksheet('about')
      about.addRows([['key', 'value'], ['format', 'backsight-history'], ['version', 1], ['units', 'us']])
      wb.addWorksheet(' Projects ').addRows([PROJECT_HEADERS, ...PROJECT_ROWS])
      const levels = wb.addWorksheet('levels')
      levels.addRows([LEVEL_HEADERS, LEVEL_ROWS[0]!, LEVEL_ROWS[1]!])
      levels.addRow([]) // row 4 left empty: skipped, and the next row keeps its number 5
      levels.addRow(LEVEL_ROWS[2]!)
      wb.addWorksheet('Sheet3') // empty sheets are not tables
    })
    expect(await readBundle('north-history.xlsx', data)).toEqual({
      file: 'north-history.xlsx',
      format: 'xlsx',
      about: { format: 'backsight-history', version: '1', units: 'us' },
      tables: [
        { table: 'projects', file: 'north-history.xlsx', sheet: ' Projects ', columns: PROJECT_COLUMNS, rows: projectRows([2, 3]) },
        { table: 'levels', file: 'north-history.xlsx', sheet: 'levels', columns: LEVEL_COLUMNS, rows: levelRows([2, 3, 5]) },
      ],
      problems: [],
    })
  })

  it('reads formulas as their saved result, rich text and hyperlinks as text, dates as YYYY-MM-DD', async () => {
    const data = await workbook((wb) => {
      const sheet = wb.addWorksheet('brace_values')
      sheet.addRow(['project_code', 'date', 'core_area [in2]', 'governing', 'source_document'])
      sheet.addRow([
        { richText: [{ text: 'KR-2021-' }, { text: '003', font: { bold: true } }] },
        new Date(Date.UTC(2021, 8, 30)),
        { formula: '2*3.25', result: 6.5 },
        true,
        { text: 'Submittal R1', hyperlink: 'https://example.invalid/r1' },
      ])
      sheet.addRow(['  KR-2022-011  ', '   ', 4.25, false, null])
    })
    const bundle = await readBundle('values.xlsx', data)
    expect(bundle.problems).toEqual([])
    expect(bundle.tables[0]!.columns).toEqual([
      { header: 'project_code', name: 'project_code' },
      { header: 'date', name: 'date' },
      { header: 'core_area [in2]', name: 'core_area', unit: 'in2' },
      { header: 'governing', name: 'governing' },
      { header: 'source_document', name: 'source_document' },
    ])
    expect(bundle.tables[0]!.rows).toEqual([
      { line: 2, values: { project_code: 'KR-2021-003', date: '2021-09-30', core_area: 6.5, governing: true, source_document: 'Submittal R1' } },
      { line: 3, values: { project_code: 'KR-2022-011', date: null, core_area: 4.25, governing: false, source_document: null } },
    ])
  })

  it('reads an error result or a formula without a saved result as null, with a problem at the cell', async () => {
    const data = await workbook((wb) => {
      const sheet = wb.addWorksheet('tonnage')
      sheet.addRow(['project_code', 'weight [ton]'])
      sheet.addRow(['KR-2021-003', { formula: '1/0', result: { error: '#DIV/0!' } }])
      sheet.addRow(['KR-2022-011', { formula: 'B2*2' } as ExcelJS.CellFormulaValue])
    })
    const bundle = await readBundle('tonnage.xlsx', data)
    expect(bundle.tables[0]!.rows).toEqual([
      { line: 2, values: { project_code: 'KR-2021-003', weight: null } },
      { line: 3, values: { project_code: 'KR-2022-011', weight: null } },
    ])
    expect(bundle.problems).toEqual([
      { file: 'tonnage.xlsx', sheet: 'tonnage', line: 2, column: 'weight', message: 'B2: formula =1/0 gives the error #DIV/0!' },
      {
        file: 'tonnage.xlsx',
        sheet: 'tonnage',
        line: 3,
        column: 'weight',
        message: 'B3: formula =B2*2 has no saved result; open and save the workbook in a spreadsheet program',
      },
    ])
  })

  it('reports duplicate headers naming both columns, and data under a blank header, keeping the first column', async () => {
    const data = await workbook((wb) => {
      const sheet = wb.addWorksheet('levels')
      sheet.addRow(['project_code', 'story_shear', 'level', 'Story Shear [kN]'])
      sheet.addRow(['KR-2021-003', 420, 'L2', 1870, 'note'])
      sheet.addRow(['KR-2021-003', 310, 'L3', 1380, 'note'])
    })
    const bundle = await readBundle('levels.xlsx', data)
    expect(bundle.tables[0]!.columns.map((c) => c.name)).toEqual(['project_code', 'story_shear', 'level'])
    expect(bundle.tables[0]!.rows[0]).toEqual({ line: 2, values: { project_code: 'KR-2021-003', story_shear: 420, level: 'L2' } })
    expect(bundle.problems).toEqual([
      {
        file: 'levels.xlsx',
        sheet: 'levels',
        line: 1,
        column: 'story_shear',
        message: 'duplicate column "story_shear": column B ("story_shear") and column D ("Story Shear [kN]"); the values of column D are ignored',
      },
      { file: 'levels.xlsx', sheet: 'levels', line: 2, message: 'column E has data but no header; its values are ignored' },
    ])
  })
})

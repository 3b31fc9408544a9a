import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import ExcelJS from 'exceljs'
import { Schema, Table, tableFromArrays, tableToIPC } from 'apache-arrow'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { readBundle, readPaths, ReadError } from '../../../etl/src/readers'

let dir: string
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'backsight-readers-'))
})
afterAll(async () => {
  await rm(dir, { recursive: true, force: true })
})

const utf8 = (text: string) => new TextEncoder().encode(text)

async function levelsWorkbook(): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook()
  wb.addWorksheet('levels').addRows([
    ['project_code', 'level'],
    ['KR-2021-003', 'L2'],
  ])
  return new Uint8Array(await wb.xlsx.writeBuffer())
}

/** A minimal zip holding one stored file `readme.txt` (local header, central directory, end record). */
function zipWithReadme(): Uint8Array {
  const name = utf8('readme.txt')
  const body = utf8('not a workbook')
  const local = Buffer.alloc(30)
  local.writeUInt32LE(0x04034b50, 0)
  local.writeUInt16LE(10, 4)
  local.writeUInt32LE(body.length, 18)
  local.writeUInt32LE(body.length, 22)
  local.writeUInt16LE(name.length, 26)
  const central = Buffer.alloc(46)
  central.writeUInt32LE(0x02014b50, 0)
  central.writeUInt16LE(10, 6)
  central.writeUInt32LE(body.length, 20)
  central.writeUInt32LE(body.length, 24)
  central.writeUInt16LE(name.length, 28)
  const end = Buffer.alloc(22)
  end.writeUInt32LE(0x06054b50, 0)
  end.writeUInt16LE(1, 8)
  end.writeUInt16LE(1, 10)
  end.writeUInt32LE(central.length + name.length, 12)
  end.writeUInt32LE(local.length + name.length + body.length, 16)
  return Buffer.concat([local, name, body, central, name, end])
}

const readError = (promise: Promise<unknown>) => promise.then(() => undefined, (e: unknown) => e)

describe('readBundle sniffs the format by content', () => {
  it('reads a CSV saved as .xlsx as CSV', async () => {
    const file = join(dir, 'levels.xlsx')
    await writeFile(file, 'project_code,level\nKR-2021-003,L2\n')
    const bundle = await readBundle(file)
    expect(bundle.format).toBe('csv')
    expect(bundle.tables).toEqual([
      {
        table: 'levels',
        file,
        columns: [
          { header: 'project_code', name: 'project_code' },
          { header: 'level', name: 'level' },
        ],
        rows: [{ line: 2, values: { project_code: 'KR-2021-003', level: 'L2' } }],
      },
    ])
  })

  it('reads an XLSX workbook named .csv as XLSX', async () => {
    const file = join(dir, 'projects.csv')
    await writeFile(file, await levelsWorkbook())
    const bundle = await readBundle(file)
    expect(bundle.format).toBe('xlsx')
    expect(bundle.tables.map((t) => [t.table, t.sheet, t.rows])).toEqual([
      ['levels', 'levels', [{ line: 2, values: { project_code: 'KR-2021-003', level: 'L2' } }]],
    ])
  })

  it('reads Arrow IPC bytes named .json as Arrow', async () => {
    const plain = tableFromArrays({ level: ['L2'] })
    const table = new Table(new Schema(plain.schema.fields, new Map([['table', 'levels']])), plain.batches)
    const bundle = await readBundle('levels.json', tableToIPC(table, 'file'))
    expect(bundle.format).toBe('arrow')
    expect(bundle.tables[0]!.rows).toEqual([{ line: 1, values: { level: 'L2' } }])
  })

  it('throws ReadError for a zip that is not a workbook', async () => {
    const error = await readError(readBundle('history.xlsx', zipWithReadme()))
    expect(error).toBeInstanceOf(ReadError)
    expect(error).toMatchObject({ file: 'history.xlsx', message: 'a zip archive that is not an XLSX workbook (it has no xl/workbook.xml)' })
  })

  it('throws ReadError for binary junk, an empty file and a missing file', async () => {
    const junk = Uint8Array.from({ length: 256 }, (_, i) => (i * 37) % 256)
    expect(await readError(readBundle('levels.csv', junk))).toMatchObject({
      file: 'levels.csv',
      message: 'binary content that is not an XLSX workbook, an Arrow file, JSON or CSV text',
    })
    expect(await readError(readBundle('levels.csv', new Uint8Array()))).toMatchObject({ file: 'levels.csv', message: 'the file is empty' })
    const missing = join(dir, 'nowhere.csv')
    expect(await readError(readBundle(missing))).toMatchObject({ file: missing, message: 'cannot be read (ENOENT)' })
  })
})

describe('readPaths', () => {
  it("reads a folder's history files in name order and lends about.csv `units: si` to CSVs without their own", async () => {
    const folder = join(dir, 'north')
    await mkdir(folder)
    await writeFile(join(folder, 'about.csv'), 'key,value\nformat,backsight-history\nunits,si\n')
    await writeFile(join(folder, 'levels.csv'), 'project_code,level,story_shear\nKR-2021-003,L2,1870\n')
    await writeFile(join(folder, 'frames.csv'), '# units: us\nproject_code,frame_line,bay_width\nKR-2021-003,A,30\n')
    await writeFile(join(folder, 'projects.json'), JSON.stringify({ projects: [{ project_code: 'KR-2021-003' }] }))
    await writeFile(join(folder, 'notes.txt'), 'not a history file')
    await writeFile(join(folder, '~$history.xlsx'), 'lock file of an open workbook')
    const bundles = await readPaths([folder, join(folder, 'levels.csv')])
    expect(bundles.map((b) => [b.file, b.format, b.about, b.tables.map((t) => t.table)])).toEqual([
      [join(folder, 'frames.csv'), 'csv', { format: 'backsight-history', units: 'us' }, ['frames']],
      [join(folder, 'levels.csv'), 'csv', { format: 'backsight-history', units: 'si' }, ['levels']],
      [join(folder, 'projects.json'), 'json', {}, ['projects']],
    ])
  })

  it('applies about.csv to CSV files of its folder also when they are listed one by one', async () => {
    const folder = join(dir, 'south')
    await mkdir(folder)
    await writeFile(join(folder, 'south-about.csv'), 'key,value\nunits,si\n')
    await writeFile(join(folder, 'south-2020-tonnage.csv'), 'project_code,stage,category,weight\nKR-2020-007,final,braces,38.2\n')
    const bundles = await readPaths([join(folder, 'south-2020-tonnage.csv'), join(folder, 'south-about.csv')])
    expect(bundles.map((b) => [b.tables.map((t) => t.table), b.about])).toEqual([[['tonnage'], { units: 'si' }]])
  })

  it('throws ReadError for a path that does not exist', async () => {
    const missing = join(dir, 'absent')
    expect(await readError(readPaths([missing]))).toMatchObject({ file: missing, message: 'cannot be read (ENOENT)' })
  })
})

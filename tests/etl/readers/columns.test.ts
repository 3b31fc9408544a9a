import { describe, expect, it } from 'vitest'
import { normalizeHeader } from '../../../etl/src/readers'
import { tableNameFromFile } from '../../../etl/src/readers/columns'

describe('normalizeHeader', () => {
  it.each([
    ['story_shear [kN]', { header: 'story_shear [kN]', name: 'story_shear', unit: 'kN' }],
    ['  Story  Shear[ kN ] ', { header: '  Story  Shear[ kN ] ', name: 'story_shear', unit: 'kN' }],
    ['Work Point Length [ft]', { header: 'Work Point Length [ft]', name: 'work_point_length', unit: 'ft' }],
    ['Project_Code', { header: 'Project_Code', name: 'project_code' }],
    ['core_area []', { header: 'core_area []', name: 'core_area', unit: '' }],
    ['\uFEFFlevel', { header: '\uFEFFlevel', name: 'level' }],
  ])('normalizeHeader(%j)', (header, expected) => {
    expect(normalizeHeader(header)).toEqual(expected)
  })
})

describe('tableNameFromFile', () => {
  it.each([
    ['north-2019-levels.csv', 'levels'],
    ['exports/brace_values.csv', 'brace_values'],
    ['north-2019-brace-values.csv', 'brace_values'],
    ['Projects.CSV', 'projects'],
    ['levels_v2.csv', 'levels'],
    ['site-notes.csv', 'site-notes'],
  ])('tableNameFromFile(%j) is %j', (file, table) => {
    expect(tableNameFromFile(file)).toBe(table)
  })
})

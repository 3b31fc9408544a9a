import { describe, expect, it } from 'vitest'
import { sizeFrame } from '@shared/engineering/size-frame'
import { FALLBACK_SIZING_DEFAULTS } from '@shared/schemas/settings'
import { buildResultsCsv, csvCell, csvFileName } from '../../../dashboard/src/utils/results-csv'
import { createLevelRow, createWorksheetForm, toSizingRequest } from '../../../dashboard/src/utils/worksheet-form'

function sample(label = 'Grid 7') {
  const form = createWorksheetForm(FALLBACK_SIZING_DEFAULTS, 'us')
  form.label = label
  form.bayWidth = 28
  form.bracedBays = 2
  form.levels = [createLevelRow(0, { storyHeight: 15, storyShear: 260 }), createLevelRow(1, { name: '-L2', storyHeight: 13, storyShear: 190 })]
  return { form, result: sizeFrame(toSizingRequest(form)) }
}

describe('csvCell(value)', () => {
  // OWASP CSV-injection advice (common practice): text starting with = + - @ tab or CR gets a leading quote mark.
  it.each([
    ['=HYPERLINK("http://x")', `"'=HYPERLINK(""http://x"")"`],
    ['+1', "'+1"],
    ['-2', "'-2"],
    ['@SUM(A1)', "'@SUM(A1)"],
    ['\tcmd', "'\tcmd"],
    ['\rcmd', `"'\rcmd"`],
  ])('neutralises the text %j', (text, cell) => {
    expect(csvCell(text)).toBe(cell)
  })
  it('writes numbers as numbers, negative ones included', () => {
    expect(csvCell(-2.5)).toBe('-2.5')
    expect(csvCell(0)).toBe('0')
    expect(csvCell(Number.NaN)).toBe('')
  })
  it('quotes commas, quotes and line breaks (RFC 4180)', () => {
    expect(csvCell('Asc,req (in²)')).toBe('"Asc,req (in²)"')
    expect(csvCell('say "hi"')).toBe('"say ""hi"""')
    expect(csvCell('a\nb')).toBe('"a\nb"')
    expect(csvCell('plain')).toBe('plain')
    expect(csvCell(null)).toBe('')
  })
})

describe('buildResultsCsv(input)', () => {
  const { form, result } = sample('=cmd|calc')
  const csv = buildResultsCsv({ form, result, generatedAt: '2030-01-02T03:04:05.000Z', serverCheck: 'matches' })
  const lines = csv.split('\r\n')

  it('carries every design caution of the result in its header block', () => {
    for (const caution of result.cautions) expect(csv).toContain(caution.includes(',') ? `"${caution}"` : caution)
    expect(csv).toContain('preliminary design aid')
    expect(csv).toContain('The engineer of record decides')
    expect(csv).toContain('supplier’s qualified values')
    expect(lines.indexOf('Cautions')).toBeLessThan(lines.findIndex(l => l.startsWith('Level,')))
  })

  it('lists the inputs with their units', () => {
    expect(lines).toContain('Bay width,28,ft')
    expect(lines).toContain('"Fysc,min",38,ksi')
    expect(lines).toContain('Braced bays,2,')
    expect(lines).toContain('Server check,matches')
  })

  it('names the unit of each column from the result’s units map', () => {
    const header = lines.find(l => l.startsWith('Level,'))!
    expect(header).toContain('Story height (ft)')
    expect(header).toContain('Pu (kip)')
    expect(header).toContain('"Asc,req (in²)"')
    expect(header).toContain('K (kip/in)')
  })

  it('writes one row per story with the numbers of the result', () => {
    const row = lines.find(l => l.startsWith('L1,'))!
    // Story 1 hand check (derived: statics; AISC 341 F4.5b): Pu = 95.2635 kip, Asc,req = 2.78548 in², Asc = 3 in².
    expect(row).toMatch(/^L1,15,260,46\.97\d+,4,95\.263\d+,2\.785481\d*,3,/)
    expect(row.endsWith(',up')).toBe(true) // chevron: unbalanced load pushes up on the beam above
  })

  it('neutralises formula-looking text from the user (label, story name) but not the numbers', () => {
    expect(lines).toContain("Frame,'=cmd|calc,")
    expect(lines.some(l => l.startsWith("'-L2,13,190,"))).toBe(true)
    expect(lines.some(l => /^=|^\+|^@/.test(l))).toBe(false)
  })

  it('ends every line with CRLF and shows the totals', () => {
    expect(csv.endsWith('\r\n')).toBe(true)
    expect(lines).toContain('Braces,8,')
  })
})

describe('csvFileName(label, date)', () => {
  it('keeps letters, digits and dashes only', () => {
    expect(csvFileName('=Grid 7 / East', '2030-01-02T03:04:05Z')).toBe('grid-7-east-2030-01-02.csv')
    expect(csvFileName('  ', '2030-01-02')).toBe('new-frame-2030-01-02.csv')
  })
})

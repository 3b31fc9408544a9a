import { describe, expect, it } from 'vitest'
import { describeGroup, formatTonnage, proposalSheet, proposalSheetCsv } from '@shared/benchmarks/proposal-sheet'
import type { ProposalResponse } from '@shared/schemas/benchmarks'

// A proposal answer worked by hand: lateral P25/P50/P75 = 1.625/2.25/2.875 lb/ft² on 40 000 ft²
// → × 40 000 / 2000 lb per ton = 32.5 / 45 / 57.5 tons.
const result: ProposalResponse = {
  group: { criteria: { use: 'office', heightBand: '1–3 stories' }, n: 6 },
  lateralPerFloorArea: { n: 6, p10: 1.25, p25: 1.625, p50: 2.25, p75: 2.875, p90: 3.25 },
  structuralPerFloorArea: null,
  perFloorAreaUnit: 'lb/ft²',
  expectedLateral: { low: 32.5, median: 45, high: 57.5, unit: 'ton' },
  expectedStructural: null,
  cautions: ['Preliminary design aid: verify with the supplier’s qualified values and the governing code; the engineer of record decides.'],
}
const profile = { use: 'office' as const, stories: 2, floorArea: 40_000, units: 'us' as const }

describe('proposalSheet(profile, result)', () => {
  it('lists the building, the group used, the expected tonnage and the cautions', () => {
    const s = proposalSheet(profile, result)
    expect(s.profile).toEqual([
      { label: 'Building use', value: 'Office' },
      { label: 'Stories above grade', value: '2' },
      { label: 'Gross floor area', value: '40,000 ft²' },
      { label: 'Seismic design category', value: 'not given' },
      { label: 'Region', value: 'not given' },
    ])
    expect(s.basis).toMatch(/^6 finished past projects of the firm: Office, 1–3 stories\./)
    expect(s.expected).toEqual([{ label: 'Lateral-system steel', unit: 'tons', low: '32.5', median: '45.0', high: '57.5' }])
    expect(s.bands).toHaveLength(1) // no structural band: no row
    expect(s.bands[0]).toMatchObject({ p25: '1.63', p50: '2.25', p75: '2.88', n: 6 })
    expect(s.cautions).toEqual(result.cautions)
  })

  it('says plainly when there is no benchmark', () => {
    const s = proposalSheet(profile, { ...result, group: null, lateralPerFloorArea: null, expectedLateral: null })
    expect(s.basis).toMatch(/^No benchmark/)
    expect(s.expected).toEqual([])
  })
})

describe('proposalSheetCsv(sheet, generatedAt)', () => {
  it('writes one row per item, quotes fields with commas and neutralises a leading formula sign', () => {
    const csv = proposalSheetCsv(proposalSheet({ ...profile, region: '=HYPERLINK("x")' }, result), '2026-01-02T03:04:05Z')
    const lines = csv.trimEnd().split('\r\n')
    expect(lines[0]).toBe('section,item,unit,n,P10,P25,median,P75,P90')
    expect(lines).toContain('profile,Gross floor area,"40,000 ft²",,,,,,')
    expect(lines).toContain('expected tonnage,Lateral-system steel,tons,,,32.5,45.0,57.5,')
    // OWASP CSV injection: a cell starting with = is prefixed with ' so it stays text.
    expect(lines).toContain(`profile,Region,"'=HYPERLINK(""x"")",,,,,,`)
  })
})

describe('formatTonnage and describeGroup', () => {
  it('rounds to whole tons from 100 up and names the criteria in words', () => {
    expect(formatTonnage(1234.56)).toBe('1,235')
    expect(formatTonnage(57.46)).toBe('57.5')
    expect(describeGroup({ use: 'healthcare', heightBand: '4–7 stories', sdc: 'D' })).toBe('Healthcare, 4–7 stories, SDC D')
    expect(describeGroup({})).toBe('all projects')
  })
})

import { describe, expect, it } from 'vitest'
import type { CheckItem } from '@shared/schemas/projects'
import { checkItemText, feet, floorArea, fmt, quantity, signedPercent, tons } from '../../../dashboard/src/utils/project-format'
import { patchBodyOf, projectFormOf, snapshotBodyOf, emptySnapshotForm, checkSnapshot } from '../../../dashboard/src/utils/project-forms'

const item = (over: Partial<CheckItem>): CheckItem => ({ item: 'tmax', status: 'exceeds', design: 579.6, supplier: 638, unit: 'kip', excess: 58.4, excessRatio: 58.4 / 579.6, message: '', ...over })

describe('project formatting', () => {
  it('formats numbers with a true minus and signed percentages', () => {
    expect(fmt(-1.234, 2)).toBe('−1.23')
    expect(fmt(-0.001, 2)).toBe('0.00')
    expect(fmt(null, 2)).toBe('—')
    expect(signedPercent(0.10076)).toBe('+10.1 %')
    expect(signedPercent(-0.05)).toBe('−5.0 %')
    expect(signedPercent(0)).toBe('±0.0 %')
  })
  it('converts stored US values for SI display', () => {
    // 1 in² = 645.16 mm² exactly (25.4 mm/in, NIST SP 811); 6.5 in² = 4193.54 mm².
    expect(quantity('area', 6.5, 'si')).toBe('4194 mm²')
    expect(quantity('area', 6.5, 'us')).toBe('6.50 in²')
    // 1 kip = 4.4482216152605 kN (NIST SP 811): 100 kip = 444.8 kN.
    expect(quantity('force', 100, 'si')).toBe('445 kN')
    // 71 ft × 0.3048 = 21.6408 m.
    expect(feet(71, 'si')).toBe('21.64 m')
    expect(feet(71, 'us')).toBe('71.0 ft')
    // 162,000 ft² × 0.09290304 = 15,050.3 m².
    expect(floorArea(162000, 'si')).toBe('15,050 m²')
    // 1 short ton = 0.90718474 t: 10 tons = 9.07 t.
    expect(tons(10, 'si')).toBe('9.1 t')
  })
  it('says each check item with a mark and words, in the user’s units', () => {
    // 58.4 / 579.6 = 10.08 %.
    expect(checkItemText(item({}), 'us')).toEqual({ mark: '✗', verdict: 'Exceeds', detail: '+58.4 kip (+10.1 %)' })
    // 58.4 kip × 4.4482 = 259.8 kN.
    expect(checkItemText(item({}), 'si').detail).toBe('+260 kN (+10.1 %)')
    expect(checkItemText(item({ item: 'coreArea', status: 'pass', excess: -0.25, excessRatio: -0.25 / 6.5, unit: 'in²' }), 'us')).toEqual({ mark: '✓', verdict: 'Passes', detail: '−0.25 in² (−3.8 %)' })
    expect(checkItemText(item({ status: 'missing', excess: null }), 'us').mark).toBe('?')
  })
})

describe('project edit bodies', () => {
  const project = { name: 'A', client: null, clientConfidential: false, benchmarkPermitted: true, office: null, region: null, buildingUse: 'office', riskCategory: 'II', sdc: 'D', siteClass: 'D', stories: 5, heightFt: 71, floorAreaFt2: 162000, yearDesigned: 2025, yearCompleted: null, phaseReached: 'cd', supplierCode: 'SUP-B', draft: true } as never
  it('sends only the changed fields, in stored units', () => {
    const initial = projectFormOf(project, 'si')
    // 71 ft = 21.6408 m shown; typed 30 m → 30 / 0.3048 = 98.425 ft.
    expect(initial.height).toBeCloseTo(21.641, 3)
    const body = patchBodyOf({ ...initial, height: 30, client: '  ', draft: false }, initial, 'si')
    expect(Object.keys(body).sort()).toEqual(['client', 'draft', 'heightFt'])
    expect(body.heightFt as number).toBeCloseTo(98.4252, 4)
    expect(body.client).toBeNull()
  })
  it('converts SI supplier values to in² and ksi, and names missing fields with the shared messages', () => {
    const f = { ...emptySnapshotForm('A', 'L2'), coreArea: 6451.6, fysc: 310.26, fyscBasis: 'coupon' as const, beta: 1.1, omega: 1.4 }
    const body = snapshotBodyOf(f, 'si')
    // 6451.6 mm² / 645.16 = 10 in²; 310.26 MPa / 6.894757 = 45.0 ksi (NIST SP 811: 1 ksi = 6.894757 MPa).
    expect(body.coreAreaIn2 as number).toBeCloseTo(10, 9)
    expect(body.fyscKsi as number).toBeCloseTo(45, 2)
    expect(checkSnapshot(body)).toEqual({})
    const empty = checkSnapshot(snapshotBodyOf(emptySnapshotForm('A', 'L2'), 'us'))
    expect(empty.coreArea).toBe('must be a number (core area in in²).')
    expect(empty.fysc).toBe('must be a number (core yield stress in ksi).')
  })
})

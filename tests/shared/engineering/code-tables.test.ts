import { describe, expect, it } from 'vitest'
import { BRBF_SYSTEM_ROWS, findBrbfSystemRow, heightLimitFt, type Asce7Edition } from '@shared/engineering'

describe('findBrbfSystemRow({edition, systemType, beamColumnConnection})', () => {
  it.each([
    // ASCE 7-05 Table 12.2-1 (partly verified): two BRBF rows split by beam-column connection
    ['7-05', 'non_moment_resisting', 'B.25', 7, 2, 5.5, 'P'],
    ['7-05', 'moment_resisting', 'B.26', 8, 2.5, 5, 'P'],
    // ASCE 7-10 Table 12.2-1: one row (values partly verified, row label from memory)
    ['7-10', undefined, 'B.26', 8, 2.5, 5, 'P'],
    // ASCE 7-16 Table 12.2-1 B.26 (partly verified)
    ['7-16', undefined, 'B.26', 8, 2.5, 5, 'P'],
    // ASCE 7-22 Table 12.2-1 (from memory; believed unchanged from 7-16)
    ['7-22', undefined, 'B.26', 8, 2.5, 5, 'M'],
  ] as const)('%s %s → %s, R=%d, Ω0=%d, Cd=%d', (edition, connection, row, r, omega0, cd, status) => {
    const found = findBrbfSystemRow({ edition, ...(connection ? { beamColumnConnection: connection } : {}) })
    expect(found?.row).toBe(row) // ASCE 7 Table 12.2-1 (status per row comment)
    expect(found?.r).toBe(r) // ASCE 7 Table 12.2-1
    expect(found?.omega0).toBe(omega0) // ASCE 7 Table 12.2-1
    expect(found?.cd).toBe(cd) // ASCE 7 Table 12.2-1
    expect(found?.status).toBe(status) // engineering reference §2 status tag
  })

  it('returns undefined for 7-05 when the connection type is not given (two rows)', () => {
    expect(findBrbfSystemRow({ edition: '7-05' })).toBeUndefined() // ASCE 7-05 Table 12.2-1: ambiguous without connection type
  })

  it('finds the 7-16 dual-system row with no height limits', () => {
    const row = findBrbfSystemRow({ edition: '7-16', systemType: 'dual_smf' })
    expect(row?.row).toBe('D.3') // ASCE 7-16 Table 12.2-1 D.3, from memory
    expect(row && heightLimitFt(row, 'F')).toBeNull() // from memory: NL
  })

  it('throws for an unknown edition', () => {
    expect(() => findBrbfSystemRow({ edition: '7-98' as Asce7Edition })).toThrowError(expect.objectContaining({ field: 'edition' })) // derived
  })
})

describe('heightLimitFt(row, sdc)', () => {
  it.each([
    ['B', null], // ASCE 7-16 Table 12.2-1 B.26 (partly verified): NL
    ['C', null], // NL
    ['D', 160], // 160 ft
    ['E', 160], // 160 ft
    ['F', 100], // 100 ft
  ] as const)('7-16 building frame, SDC %s → %s', (sdc, limit) => {
    expect(heightLimitFt(findBrbfSystemRow({ edition: '7-16' })!, sdc)).toBe(limit) // ASCE 7-16 Table 12.2-1 B.26, partly verified
  })

  it('every building-frame row has the same limits NL/NL/160/160/100', () => {
    for (const row of BRBF_SYSTEM_ROWS.filter((r) => r.systemType === 'building_frame')) {
      expect(row.heightLimitFt).toEqual({ B: null, C: null, D: 160, E: 160, F: 100 }) // engineering reference §2 (P for 7-05/7-16, M for 7-22)
    }
  })
})

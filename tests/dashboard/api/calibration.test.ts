import { tableFromArrays, tableFromIPC, tableToIPC } from 'apache-arrow'
import { describe, expect, it } from 'vitest'
import { CalibrationPoints } from '@shared/schemas/calibration'
import { rowsOfArrowTable } from '../../../dashboard/src/api/calibration'

describe('rowsOfArrowTable', () => {
  it('turns an Arrow IPC stream of points back into rows the shared schema accepts, BigInt ids included', () => {
    // Built and decoded with apache-arrow itself (the library the API uses to write the stream).
    const table = tableFromArrays({
      braceId: new BigInt64Array([7n, 12n]),
      projectCode: ['P-001', 'P-002'],
      projectName: ['Harbor Annex', 'Mill Street'],
      frameLine: ['A', '3'],
      level: ['L1', 'L2'],
      group: ['SUP-A', 'SUP-B'],
      basis: ['2% drift', '2% drift'],
      assumed: new Float64Array([1.1, 1.25]),
      final: new Float64Array([1.18, 1.2]),
    })
    const decoded = tableFromIPC(tableToIPC(table, 'stream'))
    const rows = rowsOfArrowTable(decoded)
    expect(rows).toHaveLength(2)
    expect(rows[0]).toEqual({ braceId: 7, projectCode: 'P-001', projectName: 'Harbor Annex', frameLine: 'A', level: 'L1', group: 'SUP-A', basis: '2% drift', assumed: 1.1, final: 1.18 })
    expect(typeof rows[1]!.braceId).toBe('number')
    expect(CalibrationPoints.safeParse({ quantity: 'beta', points: rows }).success).toBe(true)
  })

  it('reads Int32 ids as they are, and an empty table as no rows', () => {
    const t = tableFromArrays({ braceId: new Int32Array([3]), assumed: new Float64Array([2]) })
    expect(rowsOfArrowTable(tableFromIPC(tableToIPC(t, 'stream')))).toEqual([{ braceId: 3, assumed: 2 }])
    const empty = tableFromArrays({ braceId: new Int32Array([]) })
    expect(rowsOfArrowTable(empty)).toEqual([])
  })
})

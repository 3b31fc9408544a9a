import { tableFromIPC, type Table } from 'apache-arrow'
import {
  ARROW_STREAM_TYPE,
  CalibrationCost,
  CalibrationMisses,
  CalibrationOptions,
  CalibrationPoints,
  CalibrationSummary,
  CalibrationTrend,
  StartingFactors,
  type CalibrationFilters,
  type CalibrationGrouping,
  type CalibrationQuantity,
  type StartingFactorsQuery,
} from '@shared/schemas/calibration'
import { apiQueryString } from '../utils/calibration-query'
import { ApiError, apiErrorFrom, request, safeJson } from './client'
import { noteFreshness } from './freshness'

/** The Calibration review and Starting factors endpoints, one function each (contract: shared/schemas/calibration.ts). */

export type MissSort = 'ratio' | 'project' | 'year' | 'supplier'
export interface MissesParams {
  sort: MissSort
  dir: 'asc' | 'desc'
  limit: number
}

export const getCalibrationOptions = () => request('/api/calibration/options', { response: CalibrationOptions })

export const getCalibrationSummary = (quantity: CalibrationQuantity, groupBy: CalibrationGrouping, filters: CalibrationFilters) =>
  request(`/api/calibration/summary${apiQueryString(filters, { quantity, groupBy })}`, { response: CalibrationSummary })

export const getCalibrationTrend = (quantity: CalibrationQuantity, filters: CalibrationFilters) =>
  request(`/api/calibration/trend${apiQueryString(filters, { quantity })}`, { response: CalibrationTrend })

export const getCalibrationCost = (filters: CalibrationFilters) => request(`/api/calibration/cost${apiQueryString(filters)}`, { response: CalibrationCost })

export const getCalibrationMisses = (quantity: CalibrationQuantity, params: MissesParams, filters: CalibrationFilters) =>
  request(`/api/calibration/misses${apiQueryString(filters, { quantity, ...params })}`, { response: CalibrationMisses })

/** The address of the misses as CSV (fetched through `useApiDownload`, so a refusal is shown). */
export const missesCsvUrl = (quantity: CalibrationQuantity, params: MissesParams, filters: CalibrationFilters) =>
  `/api/calibration/misses.csv${apiQueryString(filters, { quantity, sort: params.sort, dir: params.dir, limit: 1000 })}`

export function getStartingFactors(query: Partial<StartingFactorsQuery>) {
  const params = new URLSearchParams()
  for (const [k, v] of Object.entries(query)) if (v !== undefined && v !== null && v !== '') params.set(k, String(v))
  const s = params.toString()
  return request(`/api/starting-factors${s ? `?${s}` : ''}`, { response: StartingFactors })
}

/**
 * The rows of an Arrow table of points as plain objects: integers that Arrow hands back as
 * BigInt (Int64 columns) become numbers, so the shared schema can check them.
 */
export function rowsOfArrowTable(table: Table): Record<string, unknown>[] {
  const names = table.schema.fields.map(f => f.name)
  const columns = names.map(n => table.getChild(n))
  const rows: Record<string, unknown>[] = new Array(table.numRows)
  for (let i = 0; i < table.numRows; i++) {
    const row: Record<string, unknown> = {}
    for (let c = 0; c < names.length; c++) {
      const v: unknown = columns[c]?.get(i)
      row[names[c]!] = typeof v === 'bigint' ? Number(v) : v
    }
    rows[i] = row
  }
  return rows
}

/**
 * GET /api/calibration/points as an Arrow IPC stream (compact for many thousand braces), decoded
 * with apache-arrow; a server that answers JSON instead is read as JSON. Either way the points are
 * checked against the shared schema.
 */
export async function getCalibrationPoints(quantity: CalibrationQuantity, groupBy: CalibrationGrouping, filters: CalibrationFilters): Promise<CalibrationPoints> {
  const url = `/api/calibration/points${apiQueryString(filters, { quantity, groupBy })}`
  let res: Response
  try {
    res = await fetch(url, { headers: { accept: `${ARROW_STREAM_TYPE}, application/json;q=0.5` }, credentials: 'same-origin' })
  } catch {
    throw new ApiError(0, 'NETWORK', 'The server could not be reached.')
  }
  noteFreshness(res)
  if (!res.ok) {
    const text = await res.text()
    throw apiErrorFrom(res.status, text ? safeJson(text) : undefined)
  }
  let body: unknown
  if ((res.headers.get('content-type') ?? '').includes(ARROW_STREAM_TYPE)) {
    try {
      body = { quantity, points: rowsOfArrowTable(tableFromIPC(new Uint8Array(await res.arrayBuffer()))) }
    } catch (e) {
      console.error('Arrow points could not be decoded', url, e)
      throw new ApiError(res.status, 'BAD_RESPONSE', 'The server answered in an unexpected way.')
    }
  } else {
    const text = await res.text()
    body = text ? safeJson(text) : undefined
  }
  const parsed = CalibrationPoints.safeParse(body)
  if (!parsed.success) {
    console.error('Response did not match its contract', url, parsed.error.issues)
    throw new ApiError(res.status, 'BAD_RESPONSE', 'The server answered in an unexpected way.')
  }
  return parsed.data
}

import {
  CALIBRATION_GROUPINGS,
  CALIBRATION_QUANTITIES,
  CalibrationFilters,
  type CalibrationGrouping,
  type CalibrationQuantity,
} from '@shared/schemas/calibration'

/**
 * The Calibration review screen's state as URL query parameters and back: the shared filters
 * (same names as `CalibrationFilters`, lists comma-separated), the quantity and the grouping.
 * Pure, no Vue: a bookmarked or e-mailed address opens the same view.
 */

export interface CalibrationViewState {
  filters: CalibrationFilters
  quantity: CalibrationQuantity
  groupBy: CalibrationGrouping
}

export const DEFAULT_VIEW_STATE: CalibrationViewState = Object.freeze({
  filters: { phase: 'sd' },
  quantity: 'cmax',
  groupBy: 'supplier',
}) as CalibrationViewState

/** A query value as vue-router gives it (string, null, or an array of them). */
type QueryValue = string | null | undefined | (string | null)[]
export type QueryLike = Record<string, QueryValue>

const LIST_KEYS = ['supplier', 'use', 'sdc', 'codeEdition', 'configuration'] as const
const NUMBER_KEYS = ['yearFrom', 'yearTo', 'storiesMin', 'storiesMax', 'coreAreaMin', 'coreAreaMax'] as const
const FILTER_KEYS = [...NUMBER_KEYS, ...LIST_KEYS, 'phase'] as const

function first(v: QueryValue): string | undefined {
  const s = Array.isArray(v) ? v.find(x => x !== null) : v
  return s === null || s === undefined ? undefined : s
}

/**
 * The filters of a URL query. Each field is checked on its own with the shared schema, so one
 * bad value (a hand-edited address) drops only that field instead of the whole view.
 */
export function filtersFromQuery(query: QueryLike): CalibrationFilters {
  const out: Record<string, unknown> = {}
  for (const key of FILTER_KEYS) {
    const raw = query[key]
    if (raw === undefined) continue
    const value = LIST_KEYS.includes(key as (typeof LIST_KEYS)[number]) && Array.isArray(raw) ? raw.filter(x => x !== null).join(',') : first(raw)
    if (value === undefined || value === '') continue
    const single = CalibrationFilters.safeParse({ [key]: value })
    if (single.success) out[key] = (single.data as Record<string, unknown>)[key]
  }
  return CalibrationFilters.parse(out)
}

/** The query parameters of some filters: empty lists, missing values and the default phase are left out. */
export function filtersToQuery(filters: Partial<CalibrationFilters>): Record<string, string> {
  const out: Record<string, string> = {}
  for (const key of NUMBER_KEYS) {
    const v = filters[key]
    if (typeof v === 'number' && Number.isFinite(v)) out[key] = String(v)
  }
  for (const key of LIST_KEYS) {
    const v = filters[key]
    if (v && v.length > 0) out[key] = v.join(',')
  }
  if (filters.phase && filters.phase !== 'sd') out.phase = filters.phase
  return out
}

/** The whole view state of a URL query; unknown quantities and groupings fall back to the defaults. */
export function viewStateFromQuery(query: QueryLike): CalibrationViewState {
  const q = first(query.quantity)
  const g = first(query.groupBy)
  return {
    filters: filtersFromQuery(query),
    quantity: (CALIBRATION_QUANTITIES as readonly string[]).includes(q ?? '') ? (q as CalibrationQuantity) : DEFAULT_VIEW_STATE.quantity,
    groupBy: (CALIBRATION_GROUPINGS as readonly string[]).includes(g ?? '') ? (g as CalibrationGrouping) : DEFAULT_VIEW_STATE.groupBy,
  }
}

/** The URL query of a view state (defaults left out, so the plain address is the default view). */
export function viewStateToQuery(state: CalibrationViewState): Record<string, string> {
  const out = filtersToQuery(state.filters)
  if (state.quantity !== DEFAULT_VIEW_STATE.quantity) out.quantity = state.quantity
  if (state.groupBy !== DEFAULT_VIEW_STATE.groupBy) out.groupBy = state.groupBy
  return out
}

/** An API query string (`?a=b&…`, or '' when empty) from filters plus endpoint parameters. */
export function apiQueryString(filters: Partial<CalibrationFilters>, extra: Record<string, string | number | undefined> = {}): string {
  const params = new URLSearchParams()
  for (const [k, v] of Object.entries(extra)) if (v !== undefined) params.set(k, String(v))
  for (const [k, v] of Object.entries(filtersToQuery(filters))) params.set(k, v)
  const s = params.toString()
  return s ? `?${s}` : ''
}

/** How many filters differ from the defaults (for the "n filters" badge and the reset button). */
export function activeFilterCount(filters: Partial<CalibrationFilters>): number {
  const q = filtersToQuery(filters)
  let n = Object.keys(q).length
  // A range given at both ends is one filter.
  if (q.yearFrom && q.yearTo) n -= 1
  if (q.storiesMin && q.storiesMax) n -= 1
  if (q.coreAreaMin && q.coreAreaMax) n -= 1
  return n
}

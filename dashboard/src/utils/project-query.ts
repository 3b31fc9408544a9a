import { ProjectListQuery } from '@shared/schemas/projects'

/**
 * The project list's state (page, sort, search and filters) as URL query parameters and back.
 * Pure, no Vue: a bookmarked or shared address opens the same page of the same list. The names
 * are those of `GET /api/projects` (`ProjectListQuery`), lists comma-separated; defaults are left
 * out of the URL. A parameter the contract refuses is dropped, the rest kept.
 */

/** A query value as vue-router gives it (string, null, or an array of them). */
type QueryValue = string | null | undefined | (string | null)[]
export type QueryLike = Record<string, QueryValue>

export type ProjectListState = ProjectListQuery

export const LIST_KEYS = ['supplier', 'use', 'sdc', 'configuration'] as const
const KEYS = ['page', 'pageSize', 'sort', 'order', 'q', 'yearFrom', 'yearTo', 'storiesMin', 'storiesMax', 'status', ...LIST_KEYS] as const

/** The defaults, as the contract gives them. */
export const DEFAULT_LIST_STATE: ProjectListState = Object.freeze(ProjectListQuery.parse({})) as ProjectListState

function first(v: QueryValue): string | undefined {
  const s = Array.isArray(v) ? v.find(x => x !== null) : v
  return s === null || s === undefined || s === '' ? undefined : s
}

/** The list state of a URL query. Unknown keys are ignored; a refused value falls back to its default. */
export function listStateFromQuery(query: QueryLike): ProjectListState {
  const raw: Record<string, string> = {}
  for (const k of KEYS) {
    const v = first(query[k])
    if (v !== undefined) raw[k] = v
  }
  for (let attempt = 0; attempt < KEYS.length; attempt++) {
    const parsed = ProjectListQuery.safeParse(raw)
    if (parsed.success) return parsed.data
    for (const issue of parsed.error.issues) delete raw[String(issue.path[0])]
  }
  return { ...DEFAULT_LIST_STATE }
}

/** The URL query of a list state: only what differs from the defaults, lists comma-joined. */
export function queryFromListState(state: Partial<ProjectListState>): Record<string, string> {
  const out: Record<string, string> = {}
  for (const k of KEYS) {
    const v = state[k]
    if (v === undefined || v === null || v === '') continue
    if (Array.isArray(v)) {
      if (v.length) out[k] = v.join(',')
      continue
    }
    if (v === DEFAULT_LIST_STATE[k]) continue
    out[k] = String(v)
  }
  return out
}

/** A change of search or filters starts again at page 1; paging and sorting keep the rest. */
export function withChange(state: ProjectListState, change: Partial<ProjectListState>): ProjectListState {
  const filterChanged = Object.keys(change).some(k => k !== 'page' && k !== 'sort' && k !== 'order' && k !== 'pageSize')
  return { ...state, ...change, ...(filterChanged && change.page === undefined ? { page: 1 } : {}) }
}

/** How many filters (search excluded) are set, for the "n filters" badge. */
export function activeFilterCount(state: ProjectListState): number {
  let n = 0
  if (state.yearFrom !== undefined || state.yearTo !== undefined) n++
  if (state.storiesMin !== undefined || state.storiesMax !== undefined) n++
  if (state.status !== 'all') n++
  for (const k of LIST_KEYS) if (state[k]?.length) n++
  return n
}

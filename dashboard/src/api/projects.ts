import { z } from 'zod'
import {
  CreateSnapshotBody,
  PatchProjectBody,
  ProjectDetail,
  ProjectList,
  SnapshotCreated,
  SubmittalCheckResponse,
  type ProjectListQuery,
  type SubmittalCheckQuery,
} from '@shared/schemas/projects'
import { request } from './client'

/** Project records (`/api/projects…`, principal and engineer). */

const enc = encodeURIComponent

/** A query string from a partial list query (lists comma-joined, empty values left out). */
export function listQueryString(q: Partial<ProjectListQuery>): string {
  const p = new URLSearchParams()
  for (const [k, v] of Object.entries(q)) {
    if (v === undefined || v === null || v === '' || (Array.isArray(v) && v.length === 0)) continue
    p.set(k, Array.isArray(v) ? v.join(',') : String(v))
  }
  const s = p.toString()
  return s ? `?${s}` : ''
}

const checkQueryString = (q: SubmittalCheckQuery) => listQueryString({ ...(q.phase ? { phase: q.phase } : {}), ...(q.revision !== undefined ? { revision: q.revision } : {}) } as never)

export const listProjects = (q: Partial<ProjectListQuery>) => request(`/api/projects${listQueryString(q)}`, { response: ProjectList })

export const getProject = (code: string) => request(`/api/projects/${enc(code)}`, { response: ProjectDetail })

export const getSubmittalCheck = (code: string, q: SubmittalCheckQuery = {}) =>
  request(`/api/projects/${enc(code)}/submittal-check${checkQueryString(q)}`, { response: SubmittalCheckResponse })

/** The submittal check as CSV (formula-safe, written by the server). */
export const submittalCheckCsvUrl = (code: string, q: SubmittalCheckQuery = {}) => `/api/projects/${enc(code)}/submittal-check.csv${checkQueryString(q)}`

export const patchProject = (code: string, body: PatchProjectBody) =>
  request(`/api/projects/${enc(code)}`, { method: 'PATCH', body: PatchProjectBody.parse(body), response: ProjectDetail })

/** Sends the body as given: the server's 400 names each bad field (the form shows the shared schema's messages first). */
export const createSnapshot = (code: string, body: z.input<typeof CreateSnapshotBody>) =>
  request(`/api/projects/${enc(code)}/snapshots`, { method: 'POST', body, response: SnapshotCreated })

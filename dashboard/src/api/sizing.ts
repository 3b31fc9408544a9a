import { CreateDraftBody, DraftCreated } from '@shared/schemas/imports'
import { SaveWorksheetBody, SizingDefaults, WorksheetResponse, type WorksheetKind } from '@shared/schemas/settings'
import { SizingRequest, SizingResponse, type SizingRequestInput } from '@shared/schemas/sizing'
import { request } from './client'

/** The firm's default sizing basis (US units: ksi, in²). Any signed-in user. */
export const getSizingDefaults = () => request('/api/settings/sizing', { response: SizingDefaults })

/** Save the firm's defaults (principal, admin). Answers with what was stored. */
export const saveSizingDefaults = (body: SizingDefaults) =>
  request('/api/settings/sizing', { method: 'PUT', body: SizingDefaults.parse(body), response: SizingDefaults })

/** The authoritative sizing of one frame line; the dashboard runs the same engine locally for previews. */
export const sizeFrameOnServer = (body: SizingRequestInput) =>
  request('/api/sizing/frame', { method: 'POST', body: SizingRequest.parse(body), response: SizingResponse })

/** The signed-in user's saved worksheet of one kind, `{ state: null }` when none was saved. */
export const getWorksheet = (kind: WorksheetKind) => request(`/api/worksheets/${kind}`, { response: WorksheetResponse })

/** Keep the signed-in user's worksheet (at most 64 KB of JSON). */
export const saveWorksheet = (kind: WorksheetKind, state: Record<string, unknown>) =>
  request(`/api/worksheets/${kind}`, { method: 'PUT', body: SaveWorksheetBody.parse({ state }), response: WorksheetResponse })

/** Save the worksheet as a draft project of the history (engineer, principal). */
export const saveDraftProject = (name: string, body: SizingRequestInput) =>
  request('/api/projects/drafts', { method: 'POST', body: CreateDraftBody.parse({ name, request: SizingRequest.parse(body) }), response: DraftCreated })

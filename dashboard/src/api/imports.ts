import {
  DataQuality,
  ImportRun,
  ImportRunDetail,
  ImportRunList,
  ResolveReviewBody,
  ReviewItem,
  ReviewItemList,
} from '@shared/schemas/imports'
import { ApiError, apiErrorFrom, getCsrfToken, request, safeJson } from './client'

export type ReviewStatusFilter = 'open' | 'confirmed' | 'corrected' | 'discarded' | 'all'
export type ExportFormat = 'xlsx' | 'json' | 'csv' | 'arrow'

export const listRuns = () => request('/api/imports', { response: ImportRunList })

export const getRun = (runId: number) => request(`/api/imports/${runId}`, { response: ImportRunDetail })

export const replayRun = (runId: number) => request(`/api/imports/${runId}/replay`, { method: 'POST', body: {}, response: ImportRun })

export const getQuality = () => request('/api/imports/quality', { response: DataQuality })

export const listReviewItems = (status: ReviewStatusFilter) =>
  request(`/api/review-items?status=${encodeURIComponent(status)}`, { response: ReviewItemList })

export const resolveReviewItem = (itemId: number, body: ResolveReviewBody) =>
  request(`/api/review-items/${itemId}/resolve`, { method: 'POST', body: ResolveReviewBody.parse(body), response: ReviewItem })

/** Download addresses; fetched by `fetchFile` so that a refusal reaches the user as a message. */
export const FILE_URLS = {
  problems: (runId: number) => `/api/imports/${runId}/problems.csv`,
  template: '/api/imports/template.xlsx',
  tableTemplate: (table: string) => `/api/imports/templates/${encodeURIComponent(table)}.csv`,
  export: (format: ExportFormat) => `/api/history/export?format=${format}`,
}

/**
 * Uploads one file as the multipart field `file`. XMLHttpRequest rather than fetch, for the upload
 * progress events (`onProgress` gets 0…1). Resolves with the queued run; rejects with an ApiError.
 */
export async function uploadImport(file: File, onProgress: (share: number) => void): Promise<ImportRun> {
  const token = await getCsrfToken()
  const { status, text } = await new Promise<{ status: number; text: string }>((resolve, reject) => {
    const xhr = new XMLHttpRequest()
    xhr.open('POST', '/api/imports')
    xhr.withCredentials = true
    xhr.setRequestHeader('accept', 'application/json')
    xhr.setRequestHeader('x-csrf-token', token)
    xhr.upload.onprogress = e => {
      if (e.lengthComputable && e.total > 0) onProgress(e.loaded / e.total)
    }
    xhr.onload = () => resolve({ status: xhr.status, text: xhr.responseText })
    xhr.onerror = () => reject(new ApiError(0, 'NETWORK', 'The server could not be reached.'))
    xhr.onabort = () => reject(new ApiError(0, 'NETWORK', 'The upload was interrupted.'))
    const form = new FormData()
    form.append('file', file, file.name)
    xhr.send(form)
  })
  const json: unknown = text ? safeJson(text) : undefined
  if (status < 200 || status >= 300) throw apiErrorFrom(status, json)
  const parsed = ImportRun.safeParse(json)
  if (!parsed.success) {
    console.error('Response did not match its contract', '/api/imports', parsed.error.issues)
    throw new ApiError(status, 'BAD_RESPONSE', 'The server answered in an unexpected way.')
  }
  onProgress(1)
  return parsed.data
}

/** A file from the API, with the name the server gave it; failures become ApiErrors. */
export async function fetchFile(url: string, fallbackName: string): Promise<{ blob: Blob; fileName: string }> {
  let res: Response
  try {
    res = await fetch(url, { credentials: 'same-origin' })
  } catch {
    throw new ApiError(0, 'NETWORK', 'The server could not be reached.')
  }
  if (!res.ok) {
    const text = await res.text()
    throw apiErrorFrom(res.status, text ? safeJson(text) : undefined)
  }
  return { blob: await res.blob(), fileName: fileNameOf(res.headers.get('content-disposition')) ?? fallbackName }
}

/** The file name of a `Content-Disposition: attachment; filename="…"` header. */
export function fileNameOf(header: string | null): string | undefined {
  if (!header) return undefined
  const star = /filename\*\s*=\s*UTF-8''([^;]+)/i.exec(header)
  if (star) return decodeURIComponent(star[1]!.trim())
  const plain = /filename\s*=\s*"?([^";]+)"?/i.exec(header)
  return plain?.[1]?.trim()
}

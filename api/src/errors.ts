import type { ErrorCode } from '@shared/schemas/api-error'

/** An error the API answers with its own status and code; the message is shown to the user. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode,
    message: string,
    readonly fields?: Record<string, string>,
  ) {
    super(message)
    this.name = 'HttpError'
  }
}

export const notFound = (what = 'That item') => new HttpError(404, 'NOT_FOUND', `${what} was not found.`)
export const conflict = (message: string) => new HttpError(409, 'CONFLICT', message)
export const badRequest = (message: string, fields?: Record<string, string>) =>
  new HttpError(400, 'VALIDATION_FAILED', message, fields)
export const unauthenticated = () => new HttpError(401, 'UNAUTHENTICATED', 'Please sign in.')
export const forbidden = () => new HttpError(403, 'FORBIDDEN', 'Your role does not allow this.')

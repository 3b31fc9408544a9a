import type { ErrorRequestHandler, RequestHandler } from 'express'
import { ZodError } from 'zod'
import { toFieldMessages, type ApiErrorBody } from '@shared/schemas/api-error'
import { EngineeringInputError } from '@shared/engineering/errors'
import { toSizingErrorFields } from '@shared/schemas/sizing'
import { HttpError } from '../errors'

/**
 * The driver's error under `err`: Drizzle wraps what node-postgres throws in a DrizzleQueryError
 * ("Failed query: …") with the original as its `cause`; raw pool queries throw it directly.
 */
function driverError(err: unknown): { code?: string; message: string } | null {
  for (let e = err, depth = 0; e && typeof e === 'object' && depth < 4; e = (e as { cause?: unknown }).cause, depth++) {
    const code = (e as { code?: unknown }).code
    if (typeof code === 'string' || (e instanceof Error && !(e as { cause?: unknown }).cause)) return { code: typeof code === 'string' ? code : undefined, message: e instanceof Error ? e.message : '' }
  }
  return null
}

function isDatabaseDown(err: unknown): boolean {
  const e = driverError(err)
  if (!e) return false
  return (
    e.code === 'ECONNREFUSED' ||
    e.code === '57P01' || // admin_shutdown
    e.code === '57P03' || // cannot_connect_now
    /Connection terminated|connection timeout|timeout exceeded when trying to connect/i.test(e.message)
  )
}

// Express recognises error middleware by its four parameters; keep `_next`.
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  let status = 500
  let body: ApiErrorBody = { error: { code: 'INTERNAL', message: 'Something went wrong on our side. It has been logged.' } }
  if (err instanceof ZodError) {
    status = 400
    body = { error: { code: 'VALIDATION_FAILED', message: 'Some fields are invalid.', fields: toFieldMessages(err.issues) } }
  } else if (err instanceof EngineeringInputError) {
    status = 400
    body = { error: { code: 'VALIDATION_FAILED', message: 'Some inputs cannot describe a real frame.', fields: toSizingErrorFields(err) ?? {} } }
  } else if (err instanceof HttpError) {
    status = err.status
    body = { error: { code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) } }
  } else if (err?.code === 'EBADCSRFTOKEN' || err?.message === 'invalid csrf token') {
    status = 403
    body = { error: { code: 'CSRF_INVALID', message: 'Your session’s security token is missing or out of date. Reload the page and try again.' } }
  } else if (err?.name === 'MulterError') {
    status = err.code === 'LIMIT_FILE_SIZE' ? 413 : 400
    body = {
      error: {
        code: status === 413 ? 'PAYLOAD_TOO_LARGE' : 'VALIDATION_FAILED',
        message: status === 413 ? 'The file is larger than the 20 MB an import accepts. Split it by office or era.' : `The upload was not understood (${err.message}).`,
      },
    }
  } else if (err?.type === 'entity.too.large') {
    status = 413
    body = { error: { code: 'PAYLOAD_TOO_LARGE', message: 'The request is larger than the server accepts.' } }
  } else if (err?.type === 'entity.parse.failed') {
    status = 400
    body = { error: { code: 'VALIDATION_FAILED', message: 'The request body is not valid JSON.' } }
  } else if (driverError(err)?.code === '23505') {
    // unique_violation: two requests raced to create the same thing
    status = 409
    body = { error: { code: 'CONFLICT', message: 'That already exists (someone may have just created it).' } }
  } else if (isDatabaseDown(err)) {
    status = 503
    body = { error: { code: 'SERVICE_UNAVAILABLE', message: 'The database is not reachable right now. Try again in a moment.' } }
    req.log?.warn({ err }, 'database unavailable')
  } else {
    req.log?.error({ err }, 'unhandled error')
  }
  if (res.headersSent) return
  res.status(status).json(body)
}

export const apiNotFound: RequestHandler = (_req, _res, next) => {
  next(new HttpError(404, 'NOT_FOUND', 'No such API route.'))
}

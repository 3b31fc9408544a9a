import type { ClientErrorCode } from '../api/client'

/** What the user reads for each error code when the server's own message is not shown. */
export const ERROR_MESSAGES: Record<ClientErrorCode, string> = {
  VALIDATION_FAILED: 'Some fields need attention.',
  UNAUTHENTICATED: 'Please sign in.',
  FORBIDDEN: 'Your role does not allow this.',
  CSRF_INVALID: 'Your session’s security token is out of date. Reload the page and try again.',
  NOT_FOUND: 'That was not found.',
  CONFLICT: 'That conflicts with what is already stored.',
  PAYLOAD_TOO_LARGE: 'That is larger than the server accepts.',
  RATE_LIMITED: 'Too many attempts. Wait a few minutes and try again.',
  SERVICE_UNAVAILABLE: 'The service is not reachable right now. Try again in a moment.',
  INTERNAL: 'Something went wrong on our side.',
  NETWORK: 'The server could not be reached. Check your connection.',
  BAD_RESPONSE: 'The server answered in an unexpected way. Reload the page; if it persists, tell your administrator.',
}

import { z } from 'zod'

/** Error codes the API answers with. The dashboard maps each to friendly text. */
export const ErrorCode = z.enum([
  'VALIDATION_FAILED',
  'UNAUTHENTICATED',
  'FORBIDDEN',
  'CSRF_INVALID',
  'NOT_FOUND',
  'CONFLICT',
  'PAYLOAD_TOO_LARGE',
  'RATE_LIMITED',
  'SERVICE_UNAVAILABLE',
  'INTERNAL',
])
export type ErrorCode = z.infer<typeof ErrorCode>

/**
 * The one error envelope: `{ error: { code, message, fields? } }`.
 * `fields` maps a dotted field path (`levels.2.storyHeight`) to what was wrong with it.
 */
export const ApiErrorBody = z.object({
  error: z.object({
    code: ErrorCode,
    message: z.string(),
    fields: z.record(z.string(), z.string()).optional(),
  }),
})
export type ApiErrorBody = z.infer<typeof ApiErrorBody>

/** Turns zod issues into the envelope's `fields` map; the first message per path wins. */
export function toFieldMessages(issues: readonly { path: readonly PropertyKey[]; message: string }[]): Record<string, string> {
  const fields: Record<string, string> = {}
  for (const issue of issues) {
    const key = issue.path.map(p => String(p)).join('.') || '(body)'
    if (!(key in fields)) fields[key] = issue.message
  }
  return fields
}

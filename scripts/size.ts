/**
 * `npm run size -- request.json` (or `-` for standard input): the same computation as
 * `POST /api/sizing/frame`, printed as the same JSON response, so a firm can script it.
 * Invalid input prints the API's error envelope on standard error and exits with 1.
 */
import { readFileSync } from 'node:fs'
import { sizeFrame } from '@shared/engineering/size-frame'
import type { ApiErrorBody } from '@shared/schemas/api-error'
import { SizingRequest, toSizingErrorFields } from '@shared/schemas/sizing'

function fail(body: ApiErrorBody): never {
  process.stderr.write(JSON.stringify(body, null, 2) + '\n')
  process.exit(1)
}

const file = process.argv[2]
if (!file) fail({ error: { code: 'VALIDATION_FAILED', message: 'Usage: npm run size -- <request.json | ->' } })

let raw: unknown
try {
  raw = JSON.parse(readFileSync(file === '-' ? 0 : file, 'utf8'))
} catch (err) {
  fail({ error: { code: 'VALIDATION_FAILED', message: `${file}: not readable JSON (${err instanceof Error ? err.message : String(err)})` } })
}

try {
  process.stdout.write(JSON.stringify(sizeFrame(SizingRequest.parse(raw)), null, 2) + '\n')
} catch (err) {
  const fields = toSizingErrorFields(err)
  if (!fields) throw err
  fail({ error: { code: 'VALIDATION_FAILED', message: `${file}: some fields are invalid.`, fields } })
}

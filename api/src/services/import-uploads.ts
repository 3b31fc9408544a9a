import { createHash } from 'node:crypto'
import { eq } from 'drizzle-orm'
import type { Db } from '../db'
import { importRuns } from '../db/history-schema'
import { HttpError, notFound } from '../errors'

/**
 * What an upload may be, judged by its first bytes (never by its name): an XLSX (zip) workbook,
 * an Arrow IPC file or stream, or text (CSV or JSON). Anything else — an executable renamed
 * .xlsx, an image, an old binary .xls — is refused before it is stored.
 */
export function sniffUpload(data: Uint8Array): 'zip' | 'arrow' | 'text' | undefined {
  const starts = (bytes: number[]) => bytes.every((b, i) => data[i] === b)
  if (starts([0x50, 0x4b, 0x03, 0x04])) return 'zip'
  if (starts([0x41, 0x52, 0x52, 0x4f, 0x57, 0x31])) return 'arrow' // ARROW1
  if (starts([0xff, 0xff, 0xff, 0xff])) return 'arrow' // IPC stream continuation marker
  if (starts([0xef, 0xbb, 0xbf]) || starts([0xff, 0xfe]) || starts([0xfe, 0xff])) return 'text'
  const sample = data.subarray(0, 4096)
  if (sample.includes(0)) return undefined
  const control = sample.filter(b => b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d).length
  return control > sample.length / 100 ? undefined : 'text'
}

/** Stores the upload as a queued import run (original kept for audit and replay). */
export async function createUploadRun(db: Db, userId: number, fileName: string, data: Uint8Array): Promise<number> {
  if (data.byteLength === 0) throw new HttpError(400, 'VALIDATION_FAILED', `${fileName} is empty.`, { file: 'The file is empty.' })
  if (!sniffUpload(data)) {
    throw new HttpError(400, 'VALIDATION_FAILED', `${fileName} is not an XLSX workbook, a CSV or JSON text file, or an Arrow file (judged by its content, not its name).`, {
      file: 'Unsupported file content.',
    })
  }
  const [run] = await db
    .insert(importRuns)
    .values({
      userId,
      source: 'upload',
      fileName: fileName.slice(0, 260),
      sha256: createHash('sha256').update(data).digest('hex'),
      original: Buffer.from(data).toString('base64'),
    })
    .returning({ id: importRuns.id })
  return run!.id
}

/** A new queued run from the kept original of an earlier one (after fixing the cause, or to audit). */
export async function replayRun(db: Db, userId: number, runId: number): Promise<number> {
  const [run] = await db.select().from(importRuns).where(eq(importRuns.id, runId))
  if (!run) throw notFound('That import run')
  if (!run.original) throw new HttpError(409, 'CONFLICT', 'This run kept no original file to run again.')
  const [next] = await db
    .insert(importRuns)
    .values({ userId, source: 'upload', fileName: run.fileName, sha256: run.sha256, original: run.original })
    .returning({ id: importRuns.id })
  return next!.id
}

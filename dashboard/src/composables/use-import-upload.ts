import { onScopeDispose, shallowRef } from 'vue'
import type { ImportProblemRow, ImportRun } from '@shared/schemas/imports'
import { ApiError } from '../api/client'
import { getRun, uploadImport } from '../api/imports'

/** Largest upload the server accepts (api/src/routes/imports.ts). */
export const MAX_UPLOAD_BYTES = 20 * 1024 * 1024
const POLL_MS = 600

export type UploadPhase = 'idle' | 'uploading' | 'loading' | 'done' | 'failed'

/**
 * One upload at a time: sends the file (with upload progress), then follows the loader's run until it
 * finishes or fails. Keeps the run and its problems for the screen.
 */
export function useImportUpload(onFinished?: (run: ImportRun) => void) {
  const phase = shallowRef<UploadPhase>('idle')
  const fileName = shallowRef<string>()
  /** Share of the file sent, 0…1. */
  const sent = shallowRef(0)
  const run = shallowRef<ImportRun>()
  const problems = shallowRef<ImportProblemRow[]>([])
  const error = shallowRef<string>()
  let timer: ReturnType<typeof setTimeout> | undefined
  let ticket = 0

  function stop() {
    if (timer) clearTimeout(timer)
    timer = undefined
  }
  onScopeDispose(() => {
    ticket++
    stop()
  })

  function fail(message: string) {
    phase.value = 'failed'
    error.value = message
  }

  async function start(file: File) {
    stop()
    const mine = ++ticket
    fileName.value = file.name
    sent.value = 0
    run.value = undefined
    problems.value = []
    error.value = undefined
    if (file.size > MAX_UPLOAD_BYTES) return fail(`${file.name} is ${(file.size / 1024 / 1024).toFixed(1)} MB; the largest file accepted is 20 MB. Split it into several files.`)
    if (file.size === 0) return fail(`${file.name} is empty.`)
    phase.value = 'uploading'
    try {
      const queued = await uploadImport(file, share => {
        if (mine === ticket) sent.value = share
      })
      if (mine !== ticket) return
      run.value = queued
      phase.value = 'loading'
      await follow(queued.id, mine)
    } catch (e) {
      if (mine === ticket) fail(e instanceof ApiError ? e.message : 'The file could not be uploaded.')
    }
  }

  /** Follows a run already queued (an upload, or "Run again"). */
  async function watch(runId: number) {
    stop()
    const mine = ++ticket
    phase.value = 'loading'
    error.value = undefined
    problems.value = []
    try {
      await follow(runId, mine)
    } catch (e) {
      if (mine === ticket) fail(e instanceof ApiError ? e.message : 'The import could not be followed.')
    }
  }

  async function follow(runId: number, mine: number) {
    const detail = await getRun(runId)
    if (mine !== ticket) return
    run.value = detail.run
    fileName.value = detail.run.fileName
    if (detail.run.status === 'finished' || detail.run.status === 'failed') {
      problems.value = detail.problems
      phase.value = detail.run.status === 'finished' ? 'done' : 'failed'
      if (detail.run.status === 'failed') error.value = detail.run.error ?? 'The loader stopped without finishing this file.'
      onFinished?.(detail.run)
      return
    }
    await new Promise<void>(resolve => {
      timer = setTimeout(resolve, POLL_MS)
    })
    if (mine === ticket) await follow(runId, mine)
  }

  return { phase, fileName, sent, run, problems, error, start, watch }
}

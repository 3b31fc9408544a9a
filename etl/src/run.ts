import { createHash } from 'node:crypto'
import { readFile } from 'node:fs/promises'
import { eq, inArray, sql } from 'drizzle-orm'
import type { ImportProblem, ProjectRecord } from '@shared/history/types'
import type { Db } from '../../api/src/db'
import { importProblems, importRuns, projects, suppliers } from '../../api/src/db/history-schema'
import { refreshCalibrationPairs } from '../../api/src/db/calibration'
import { loadProjects, upsertSuppliers } from './load'
import { applyFolderAbout, readBundle, ReadError } from './readers'
import type { RawBundle } from './readers/types'
import { transform } from './transform'

export interface ImportInput {
  /** Name shown in reports (a path for the CLI, the uploaded name for uploads). */
  file: string
  data: Uint8Array
}

export interface RunOptions {
  userId?: number | null
  source: 'cli' | 'upload'
  dryRun?: boolean
  /** An import run created beforehand (an upload): the run is recorded there. */
  runId?: number
  onProgress?: (stage: string, done: number, total: number) => void
  /** Let the file replace projects changed in Backsight since their last import (refused otherwise). */
  replaceEdited?: boolean
}

/** Largest original kept with a run, so it can be audited or replayed. */
export const KEEP_ORIGINAL_BYTES = 25 * 1024 * 1024

/** The original of a run, to run (or replay) it. */
export async function originalOf(db: Db, runId: number): Promise<ImportInput> {
  const [run] = await db.select({ fileName: importRuns.fileName, original: importRuns.original }).from(importRuns).where(eq(importRuns.id, runId))
  if (!run) throw new Error(`Import run ${runId} does not exist.`)
  if (!run.original) throw new Error(`Import run ${runId} kept no original file.`)
  return { file: run.fileName, data: new Uint8Array(Buffer.from(run.original, 'base64')) }
}

export interface RunSummary {
  runId: number | null
  dryRun: boolean
  files: string[]
  projects: number
  loaded: number
  updated: number
  unchanged: number
  rejected: number
  queued: number
  problems: ImportProblem[]
  durationMs: number
}

/** Reads every input (by content), validates, and — unless a dry run — loads and records the run. */
export async function runImport(db: Db, inputs: ImportInput[], options: RunOptions): Promise<RunSummary> {
  const t0 = Date.now()
  const progress = options.onProgress ?? (() => {})
  const bundles: RawBundle[] = []
  const readProblems: ImportProblem[] = []
  for (const [i, input] of inputs.entries()) {
    progress('read', i, inputs.length)
    try {
      bundles.push(await readBundle(input.file, input.data))
    } catch (err) {
      if (!(err instanceof ReadError)) throw err
      readProblems.push({ severity: 'error', file: input.file, message: `${input.file}: ${err.message}` })
    }
  }
  progress('read', inputs.length, inputs.length)
  const assembled = transform(applyFolderAbout(bundles))
  assembled.problems = [...readProblems, ...assembled.problems]
  await flagDuplicates(db, assembled.projects)
  const queued = assembled.projects.reduce((n, p) => n + p.reviews.length, 0)
  for (const p of assembled.projects) {
    for (const r of p.reviews) {
      const at = r.at ?? p.source
      assembled.problems.push({ severity: 'review', projectCode: p.fields.code, file: at.file, sheet: at.sheet, row: at.row, column: r.field, value: r.value, message: r.reason })
    }
  }

  const summary: RunSummary = {
    runId: null,
    dryRun: !!options.dryRun,
    files: inputs.map(i => i.file),
    projects: assembled.projects.length + assembled.rejected.size,
    loaded: 0,
    updated: 0,
    unchanged: 0,
    rejected: assembled.rejected.size,
    queued,
    problems: assembled.problems,
    durationMs: 0,
  }
  if (options.dryRun) {
    summary.durationMs = Date.now() - t0
    return summary
  }

  let runId = options.runId
  if (runId === undefined) {
    const sha = createHash('sha256')
    for (const i of inputs) sha.update(i.data)
    const [run] = await db
      .insert(importRuns)
      .values({ userId: options.userId ?? null, source: options.source, fileName: inputs.map(i => i.file).join(', ').slice(0, 260), sha256: sha.digest('hex'), status: 'running' })
      .returning({ id: importRuns.id })
    runId = run!.id
  } else {
    await db.update(importRuns).set({ status: 'running' }).where(eq(importRuns.id, runId))
  }
  const run = { id: runId }
  summary.runId = run.id

  const suppliersBefore = await supplierCodes(db)
  await upsertSuppliers(db, assembled.suppliers)
  const suppliersAfter = await supplierCodes(db)
  progress('load', 0, assembled.projects.length)
  const result = await loadProjects(db, assembled.projects, { runId: run.id, replaceEdited: options.replaceEdited, onProgress: (d, t) => progress('load', d, t) })
  progress('load', assembled.projects.length, assembled.projects.length)
  for (const f of result.failed) summary.problems.push({ severity: 'error', projectCode: f.code, file: inputs[0]?.file ?? '', message: `Could not be stored: ${f.message}` })
  summary.loaded = result.loaded.length
  summary.updated = result.updated.length
  summary.unchanged = result.unchanged.length
  summary.rejected += result.failed.length
  // Analytics read the calibration pairs: rewrite the rows of the projects just stored (loaded or
  // replaced; unchanged and refused ones did not change). Pairs carry their supplier's code, so a
  // stored supplier whose code changed or vanished reaches projects outside the file: refresh all.
  const supplierMoved = [...suppliersBefore].some(([id, code]) => suppliersAfter.get(id) !== code)
  await refreshCalibrationPairs(db, supplierMoved ? null : await projectIdsOf(db, [...result.loaded, ...result.updated]))
  summary.durationMs = Date.now() - t0

  for (let i = 0; i < summary.problems.length; i += 2_000) {
    const chunk = summary.problems.slice(i, i + 2_000)
    await db.insert(importProblems).values(
      chunk.map(p => ({ runId: run.id, projectCode: p.projectCode ?? null, severity: p.severity, file: p.file.slice(0, 260), sheet: p.sheet ?? null, row: p.row ?? null, column: p.column?.slice(0, 80) ?? null, value: p.value?.slice(0, 500) ?? null, message: p.message })),
    )
  }
  await db
    .update(importRuns)
    .set({ status: 'finished', loaded: summary.loaded, updated: summary.updated, unchanged: summary.unchanged, rejected: summary.rejected, queued: summary.queued, finishedAt: new Date() })
    .where(eq(importRuns.id, run.id))
  return summary
}

async function supplierCodes(db: Db): Promise<Map<number, string>> {
  return new Map((await db.select({ id: suppliers.id, code: suppliers.code }).from(suppliers)).map(s => [s.id, s.code]))
}

async function projectIdsOf(db: Db, codes: string[]): Promise<number[]> {
  const ids: number[] = []
  for (let i = 0; i < codes.length; i += 5_000) {
    const rows = await db.select({ id: projects.id }).from(projects).where(inArray(projects.code, codes.slice(i, i + 5_000)))
    ids.push(...rows.map(r => r.id))
  }
  return ids
}

/** Reads files from disk for the CLI. */
export async function readInputs(files: string[]): Promise<ImportInput[]> {
  return Promise.all(files.map(async file => ({ file, data: new Uint8Array(await readFile(file)) })))
}

/**
 * A project whose name, stories and floor area match another project under a different code —
 * already stored or earlier in this run — is a probable duplicate: it loads, but none of its values
 * count in analytics until someone confirms it (review queue).
 */
async function flagDuplicates(db: Db, records: ProjectRecord[]) {
  const stored = await db
    .select({ code: projects.code, name: sql<string>`lower(${projects.name})`, stories: projects.stories, area: projects.floorAreaFt2 })
    .from(projects)
  const seen = new Map<string, string>()
  const keyOf = (name: string, stories: number | null, area: number | null) => `${name.trim().toLowerCase()}|${stories ?? ''}|${area === null ? '' : Math.round(area / 100)}`
  for (const s of stored) seen.set(keyOf(s.name, s.stories, s.area), s.code)
  for (const r of records) {
    const k = keyOf(r.fields.name, r.fields.stories, r.fields.floorAreaFt2)
    const other = seen.get(k)
    if (other && other !== r.fields.code) {
      r.reviews.push({ field: 'project', value: r.fields.code, at: r.source, reason: `Probable duplicate of project ${other} (same name, stories and floor area under another code).` })
      for (const f of r.frames) for (const l of f.levels) for (const s of l.brace?.snapshots ?? []) s.confirmed = false
    } else seen.set(k, r.fields.code)
  }
}

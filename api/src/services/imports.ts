import { and, count, desc, eq, inArray, sql } from 'drizzle-orm'
import type { DataQuality, ImportProblemRow, ImportRun } from '@shared/schemas/imports'
import type { Db } from '../db'
import { braces, braceSnapshots, frames, importProblems, importRuns, levels, projects, reviewItems } from '../db/history-schema'
import { users } from '../db/schema'
import { notFound } from '../errors'

type RunRow = typeof importRuns.$inferSelect

function toRun(r: RunRow & { userName: string | null }): ImportRun {
  return {
    id: r.id,
    source: r.source,
    fileName: r.fileName,
    sha256: r.sha256,
    status: r.status as ImportRun['status'],
    progressStage: r.progressStage,
    progressDone: r.progressDone,
    progressTotal: r.progressTotal,
    loaded: r.loaded,
    updated: r.updated,
    unchanged: r.unchanged,
    rejected: r.rejected,
    queued: r.queued,
    startedAt: r.startedAt.toISOString(),
    finishedAt: r.finishedAt?.toISOString() ?? null,
    userName: r.userName,
    error: r.error,
    hasOriginal: r.original !== null,
  } satisfies ImportRun
}

const runColumns = {
  id: importRuns.id,
  userId: importRuns.userId,
  source: importRuns.source,
  fileName: importRuns.fileName,
  sha256: importRuns.sha256,
  status: importRuns.status,
  dryRun: importRuns.dryRun,
  progressStage: importRuns.progressStage,
  progressDone: importRuns.progressDone,
  progressTotal: importRuns.progressTotal,
  error: importRuns.error,
  loaded: importRuns.loaded,
  updated: importRuns.updated,
  unchanged: importRuns.unchanged,
  rejected: importRuns.rejected,
  queued: importRuns.queued,
  startedAt: importRuns.startedAt,
  finishedAt: importRuns.finishedAt,
  // Only whether an original exists; the file itself is not sent with the list.
  original: sql<string | null>`case when ${importRuns.original} is null then null else '' end`,
  userName: users.name,
}

export async function listRuns(db: Db, limit = 100): Promise<ImportRun[]> {
  const rows = await db.select(runColumns).from(importRuns).leftJoin(users, eq(users.id, importRuns.userId)).orderBy(desc(importRuns.id)).limit(limit)
  return rows.map(toRun)
}

export async function getRun(db: Db, runId: number): Promise<ImportRun> {
  const [row] = await db.select(runColumns).from(importRuns).leftJoin(users, eq(users.id, importRuns.userId)).where(eq(importRuns.id, runId))
  if (!row) throw notFound('That import run')
  return toRun(row)
}

export async function listProblems(db: Db, runId: number, limit = 5_000): Promise<ImportProblemRow[]> {
  const rows = await db.select().from(importProblems).where(eq(importProblems.runId, runId)).orderBy(importProblems.id).limit(limit)
  return rows.map(r => ({
    id: r.id,
    severity: r.severity as ImportProblemRow['severity'],
    projectCode: r.projectCode,
    file: r.file,
    sheet: r.sheet,
    row: r.row,
    column: r.column,
    value: r.value,
    message: r.message,
  }))
}

/** Completeness of the history for the Imports screen's data-quality panel. */
export async function dataQuality(db: Db): Promise<DataQuality> {
  const [{ n: projectCount }] = (await db.select({ n: count() }).from(projects)) as [{ n: number }]
  const [{ n: awaiting }] = (await db.select({ n: count() }).from(reviewItems).where(eq(reviewItems.status, 'open'))) as [{ n: number }]
  const perProject = await db
    .select({
      code: projects.code,
      name: projects.name,
      phaseReached: projects.phaseReached,
      braces: sql<number>`count(distinct ${braces.id})`.mapWith(Number),
      withFinal: sql<number>`count(distinct ${braces.id}) filter (where ${braceSnapshots.governing})`.mapWith(Number),
    })
    .from(projects)
    .leftJoin(frames, eq(frames.projectId, projects.id))
    .leftJoin(levels, eq(levels.frameId, frames.id))
    .leftJoin(braces, eq(braces.levelId, levels.id))
    .leftJoin(braceSnapshots, and(eq(braceSnapshots.braceId, braces.id)))
    .groupBy(projects.id)
    .orderBy(projects.code)
  return {
    projects: projectCount,
    awaitingReview: awaiting,
    withoutFinals: perProject.filter(p => p.braces > 0 && p.withFinal === 0).map(p => ({ code: p.code, name: p.name, phaseReached: p.phaseReached })),
    completeness: perProject.map(p => ({ code: p.code, name: p.name, braces: p.braces, withFinal: p.withFinal, share: p.braces ? p.withFinal / p.braces : 0 })),
  }
}

/** Closes a run whose loader ended without finishing it. */
export async function markRunFailed(db: Db, runId: number, reason: string): Promise<void> {
  await db
    .update(importRuns)
    .set({ status: 'failed', error: reason, finishedAt: new Date() })
    .where(and(eq(importRuns.id, runId), inArray(importRuns.status, ['queued', 'running'])))
}

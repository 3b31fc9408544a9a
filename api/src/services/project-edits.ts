import { and, eq, sql } from 'drizzle-orm'
import { adjustedStrengthsOf } from '@shared/history/snapshot'
import { DESIGN_CAUTIONS, type CreateSnapshotBody, type PatchProjectBody, type ProjectDetail, type SnapshotCreated } from '@shared/schemas/projects'
import { checkFactorRanges } from '@shared/engineering/adjusted-strength'
import type { Db } from '../db'
import { braces, braceSnapshots, frames, levels, projects, suppliers } from '../db/history-schema'
import { auditLog } from '../db/schema'
import { badRequest, conflict, notFound } from '../errors'
import { getProject, projectByCode, toSnapshotView } from './projects'
import { refreshCalibrationPairs } from '../db/calibration'

/**
 * The two edits of a project record, each in one transaction with its `audit_log` entry:
 * project fields (whitelisted by `PatchProjectBody`) and a new supplier snapshot of one brace.
 */

function changedMeanwhile(code: string) {
  return conflict(`Project ${code} was changed after you opened it (by an import or another user). Nothing was saved: reload it and make your change again.`)
}

/** 409 when the editor saw an older version of the project than the one stored. */
function assertUnchangedSince(project: { updatedAt: Date }, expected: string | undefined, code: string) {
  if (expected !== undefined && new Date(expected).getTime() !== project.updatedAt.getTime()) throw changedMeanwhile(code)
}

/** `PATCH /api/projects/:code`. Audit detail: the changed fields, before and after. */
export async function patchProject(db: Db, actorId: number, code: string, body: PatchProjectBody): Promise<ProjectDetail> {
  let projectId: number | undefined
  await db.transaction(async tx => {
    const before = await projectByCode(tx, code)
    projectId = before.id
    const { supplierCode, expectedUpdatedAt, ...fields } = body
    assertUnchangedSince(before, expectedUpdatedAt, code)
    const set: Partial<typeof projects.$inferInsert> = { ...fields }
    if (supplierCode !== undefined) {
      if (supplierCode === null) set.supplierId = null
      else {
        const [s] = await tx.select({ id: suppliers.id }).from(suppliers).where(eq(suppliers.code, supplierCode))
        if (!s) throw badRequest('Some fields are invalid.', { supplierCode: `No supplier has the code ${supplierCode}.` })
        set.supplierId = s.id
      }
    }
    const year = set.yearDesigned ?? before.yearDesigned
    const completed = set.yearCompleted === undefined ? before.yearCompleted : set.yearCompleted
    if (year !== null && completed !== null && completed < year) throw badRequest('Some fields are invalid.', { yearCompleted: 'must not be before the year designed.' })
    const changedBefore: Record<string, unknown> = {}
    const changedAfter: Record<string, unknown> = {}
    for (const [k, v] of Object.entries(set)) {
      const old = (before as Record<string, unknown>)[k]
      if (old !== v) {
        changedBefore[k] = old
        changedAfter[k] = v
      }
    }
    if (Object.keys(changedAfter).length === 0) return
    const now = new Date()
    // Conditional on the version read above: a concurrent writer in between makes this a 409, not a lost update.
    const done = await tx.update(projects).set({ ...set, updatedAt: now, editedAt: now }).where(and(eq(projects.id, before.id), sql`date_trunc('milliseconds', ${projects.updatedAt}) = ${before.updatedAt.toISOString()}::timestamptz`)).returning({ id: projects.id })
    if (!done.length) throw changedMeanwhile(code)
    await tx.insert(auditLog).values({ actorId, action: 'project.update', entity: 'project', entityId: code, detail: { before: changedBefore, after: changedAfter } })
  })
  // Analytics and the history caches follow the edit (a new data version; only this project's pairs are rewritten).
  await refreshCalibrationPairs(db, projectId === undefined ? [] : [projectId])
  return getProject(db, code)
}

/** `POST /api/projects/:code/snapshots`: records the supplier's values for one brace; adjusted strengths by the engine. */
export async function createSnapshot(db: Db, actorId: number, code: string, body: CreateSnapshotBody): Promise<SnapshotCreated> {
  const created = await db.transaction(async tx => {
    const project = await projectByCode(tx, code)
    assertUnchangedSince(project, body.expectedUpdatedAt, code)
    const [target] = await tx
      .select({ braceId: braces.id })
      .from(braces)
      .innerJoin(levels, eq(levels.id, braces.levelId))
      .innerJoin(frames, eq(frames.id, levels.frameId))
      .where(and(eq(frames.projectId, project.id), eq(frames.frameLine, body.frameLine), eq(levels.name, body.level)))
      .for('update')
    if (!target) throw notFound(`Braces at frame line ${body.frameLine}, level ${body.level} of ${code}`)
    const [{ next }] = (await tx
      .select({ next: sql<number>`coalesce(max(${braceSnapshots.revision}) + 1, 0)`.mapWith(Number) })
      .from(braceSnapshots)
      .where(and(eq(braceSnapshots.braceId, target.braceId), eq(braceSnapshots.phase, body.phase)))) as [{ next: number }]
    const revision = body.revision ?? next
    const [taken] = await tx
      .select({ id: braceSnapshots.id })
      .from(braceSnapshots)
      .where(and(eq(braceSnapshots.braceId, target.braceId), eq(braceSnapshots.phase, body.phase), eq(braceSnapshots.revision, revision)))
    if (taken) throw conflict(`${body.phase} revision ${revision} is already recorded for these braces; the next free revision is ${next}.`)
    const values = {
      coreAreaIn2: body.coreAreaIn2,
      fyscKsi: body.fyscKsi,
      fyscBasis: body.fyscBasis,
      fyscMaxKsi: body.fyscMaxKsi ?? null,
      ry: body.ry ?? null,
      beta: body.beta,
      omega: body.omega,
    }
    const strengths = adjustedStrengthsOf(values)
    if (strengths.tensionKip === null) throw badRequest('Some fields are invalid.', { fyscBasis: 'The yield basis and its values do not give an expected yield stress.' })
    if (body.governing) await tx.update(braceSnapshots).set({ governing: false }).where(eq(braceSnapshots.braceId, target.braceId))
    const [row] = await tx
      .insert(braceSnapshots)
      .values({
        braceId: target.braceId,
        phase: body.phase,
        revision,
        date: body.date ?? null,
        sourceDocument: body.sourceDocument ?? null,
        ...values,
        factorDriftMultiple: body.factorDriftMultiple ?? null,
        stiffnessFactor: body.stiffnessFactor ?? null,
        yieldLengthRatio: body.yieldLengthRatio ?? null,
        adjustedTensionKip: strengths.tensionKip,
        adjustedCompressionKip: strengths.compressionKip,
        governing: body.governing,
        confirmed: true,
      })
      .returning()
    const now = new Date()
    await tx.update(projects).set({ updatedAt: now, editedAt: now }).where(eq(projects.id, project.id))
    const snapshot = toSnapshotView(row!)
    await tx.insert(auditLog).values({
      actorId,
      action: 'snapshot.create',
      entity: 'brace_snapshot',
      entityId: String(row!.id),
      detail: { projectCode: code, frameLine: body.frameLine, level: body.level, phase: body.phase, revision, governing: body.governing, values: { ...values, adjustedTensionKip: strengths.tensionKip, adjustedCompressionKip: strengths.compressionKip } },
    })
    const warnings = checkFactorRanges({ beta: body.beta, omega: body.omega, ...(body.stiffnessFactor ? { stiffnessFactor: body.stiffnessFactor } : {}), ...(body.ry && body.fyscBasis === 'specified_min' ? { ry: body.ry } : {}) })
    return { projectId: project.id, view: { code, frameLine: body.frameLine, level: body.level, snapshot, cautions: [...warnings.map(w => w.message), ...DESIGN_CAUTIONS] } satisfies SnapshotCreated }
  })
  // The new supplier values count in analytics at once (a new data version; this project's pairs only).
  await refreshCalibrationPairs(db, [created.projectId])
  return created.view
}

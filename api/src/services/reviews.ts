import { and, eq, inArray, ne } from 'drizzle-orm'
import { adjustedStrengthsOf } from '@shared/history/snapshot'
import type { ResolveReviewBody, ReviewItem } from '@shared/schemas/imports'
import type { Db, DbOrTx } from '../db'
import { braces, braceSnapshots, frames, levels, projects, reviewItems } from '../db/history-schema'
import { auditLog } from '../db/schema'
import { conflict, notFound } from '../errors'
import { refreshCalibrationPairs } from '../db/calibration'

/** Snapshot columns a reviewer may correct, by the import format's column name. */
const CORRECTABLE = {
  fysc: 'fyscKsi',
  fysc_max: 'fyscMaxKsi',
  core_area: 'coreAreaIn2',
  required_core_area: 'requiredCoreAreaIn2',
  ry: 'ry',
  beta: 'beta',
  omega: 'omega',
  stiffness_factor: 'stiffnessFactor',
  yield_length_ratio: 'yieldLengthRatio',
  factor_drift_multiple: 'factorDriftMultiple',
} as const

export async function listReviewItems(db: Db, status: ReviewItem['status'] | 'all'): Promise<ReviewItem[]> {
  const rows = await db
    .select({ item: reviewItems, frameLine: frames.frameLine, level: levels.name, phase: braceSnapshots.phase, revision: braceSnapshots.revision })
    .from(reviewItems)
    .leftJoin(braceSnapshots, eq(braceSnapshots.id, reviewItems.snapshotId))
    .leftJoin(braces, eq(braces.id, braceSnapshots.braceId))
    .leftJoin(levels, eq(levels.id, braces.levelId))
    .leftJoin(frames, eq(frames.id, levels.frameId))
    .where(status === 'all' ? undefined : eq(reviewItems.status, status))
    .orderBy(reviewItems.projectCode, reviewItems.id)
    .limit(2_000)
  return rows.map(r => ({
    id: r.item.id,
    runId: r.item.runId,
    projectCode: r.item.projectCode,
    field: r.item.field,
    value: r.item.value,
    reason: r.item.reason,
    status: r.item.status as ReviewItem['status'],
    location: r.frameLine && r.level && r.phase ? { frameLine: r.frameLine, level: r.level, phase: r.phase, revision: r.revision ?? 0 } : null,
  }))
}

/**
 * Confirm, correct or discard one queued value, with an audit entry. A snapshot counts in analytics
 * again once none of its items is open. For a probable duplicate project, "discard" removes the
 * duplicate and "confirm" keeps it as a project of its own.
 */
export async function resolveReviewItem(db: Db, actorId: number, itemId: number, body: ResolveReviewBody): Promise<ReviewItem> {
  const changed: number[] = []
  const resolved = await db.transaction(async tx => {
    const [item] = await tx.select().from(reviewItems).where(eq(reviewItems.id, itemId)).for('update')
    if (!item) throw notFound('That review item')
    // The item's project (read before a discard deletes it): the only one whose pairs change.
    changed.push(...(await tx.select({ id: projects.id }).from(projects).where(eq(projects.code, item.projectCode))).map(p => p.id))
    if (item.status !== 'open') throw conflict(`This item was already ${item.status}.`)
    const status = body.action === 'confirm' ? 'confirmed' : body.action === 'correct' ? 'corrected' : 'discarded'
    const detail: Record<string, unknown> = { field: item.field, value: item.value, action: body.action }

    if (item.field === 'project') {
      if (body.action === 'correct') throw conflict('A probable duplicate can be confirmed (a project of its own) or discarded (removed).')
      if (body.action === 'discard') await tx.delete(projects).where(eq(projects.code, item.projectCode))
      else await confirmProject(tx, item.projectCode)
    } else if (item.snapshotId) {
      const column = CORRECTABLE[item.field as keyof typeof CORRECTABLE]
      if (body.action !== 'confirm') {
        if (!column) throw conflict(`${item.field} cannot be changed here; correct it in the source file and import it again.`)
        const [snap] = await tx.select().from(braceSnapshots).where(eq(braceSnapshots.id, item.snapshotId))
        if (!snap) throw notFound('The brace value of that item')
        const next = { ...snap, [column]: body.action === 'correct' ? body.value : null }
        const strengths = adjustedStrengthsOf(next)
        detail.from = snap[column]
        detail.to = next[column]
        await tx
          .update(braceSnapshots)
          .set({ [column]: next[column], adjustedTensionKip: strengths.tensionKip, adjustedCompressionKip: strengths.compressionKip })
          .where(eq(braceSnapshots.id, snap.id))
      }
    } else if (body.action !== 'confirm') {
      throw conflict(`${item.field} cannot be changed here; correct it in the source file and import it again.`)
    }

    await tx.update(reviewItems).set({ status, resolution: detail, resolvedBy: actorId, resolvedAt: new Date() }).where(eq(reviewItems.id, itemId))
    if (item.snapshotId) await confirmSnapshotIfClear(tx, item.snapshotId)
    await tx.insert(auditLog).values({ actorId, action: `review.${body.action}`, entity: 'review_item', entityId: String(itemId), detail: { projectCode: item.projectCode, ...detail } })
    const [after] = await listReviewItemsByIds(tx, [itemId])
    return after!
  })
  // What analytics see changed (a value confirmed, corrected or discarded): rewrite that project's calibration pairs.
  await refreshCalibrationPairs(db, changed)
  return resolved
}

async function confirmSnapshotIfClear(tx: DbOrTx, snapshotId: number) {
  const open = await tx.select({ id: reviewItems.id }).from(reviewItems).where(and(eq(reviewItems.snapshotId, snapshotId), eq(reviewItems.status, 'open')))
  const projectOpen = await tx
    .select({ id: reviewItems.id })
    .from(reviewItems)
    .innerJoin(projects, eq(projects.code, reviewItems.projectCode))
    .innerJoin(frames, eq(frames.projectId, projects.id))
    .innerJoin(levels, eq(levels.frameId, frames.id))
    .innerJoin(braces, eq(braces.levelId, levels.id))
    .innerJoin(braceSnapshots, eq(braceSnapshots.braceId, braces.id))
    .where(and(eq(braceSnapshots.id, snapshotId), eq(reviewItems.field, 'project'), eq(reviewItems.status, 'open')))
  if (open.length === 0 && projectOpen.length === 0) await tx.update(braceSnapshots).set({ confirmed: true }).where(eq(braceSnapshots.id, snapshotId))
}

/** After a duplicate is confirmed as its own project, its snapshots count unless they have open items of their own. */
async function confirmProject(tx: DbOrTx, code: string) {
  const snaps = await tx
    .select({ id: braceSnapshots.id })
    .from(braceSnapshots)
    .innerJoin(braces, eq(braces.id, braceSnapshots.braceId))
    .innerJoin(levels, eq(levels.id, braces.levelId))
    .innerJoin(frames, eq(frames.id, levels.frameId))
    .innerJoin(projects, eq(projects.id, frames.projectId))
    .where(eq(projects.code, code))
  const ids = snaps.map(s => s.id)
  if (!ids.length) return
  const blocked = new Set(
    (await tx.select({ id: reviewItems.snapshotId }).from(reviewItems).where(and(inArray(reviewItems.snapshotId, ids), eq(reviewItems.status, 'open'), ne(reviewItems.field, 'project')))).map(r => r.id),
  )
  const clear = ids.filter(id => !blocked.has(id))
  if (clear.length) await tx.update(braceSnapshots).set({ confirmed: true }).where(inArray(braceSnapshots.id, clear))
}

async function listReviewItemsByIds(tx: DbOrTx, ids: number[]): Promise<ReviewItem[]> {
  const rows = await tx.select().from(reviewItems).where(inArray(reviewItems.id, ids))
  return rows.map(r => ({ id: r.id, runId: r.runId, projectCode: r.projectCode, field: r.field, value: r.value, reason: r.reason, status: r.status as ReviewItem['status'], location: null }))
}

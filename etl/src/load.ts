import { createHash } from 'node:crypto'
import { getTableColumns, inArray, sql } from 'drizzle-orm'
import type { ProjectRecord, SupplierRecord } from '@shared/history/types'
import type { Db, DbOrTx } from '../../api/src/db'
import { braces, braceSnapshots, frames, levels, projects, reviewItems, suppliers, tonnage } from '../../api/src/db/history-schema'

/** PostgreSQL takes at most 65,535 parameters a statement; keep each multi-row insert under that. */
const MAX_PARAMS = 60_000
const PROJECT_COLUMNS = getTableColumns(projects)

/** Projects per transaction on the fast path; a failing batch is retried one project at a time. */
const BATCH = 100

export interface LoadResult {
  loaded: string[]
  updated: string[]
  unchanged: string[]
  failed: { code: string; message: string }[]
}

/** A stable fingerprint of what a project would store. */
export function hashProject(r: ProjectRecord): string {
  return createHash('sha256').update(JSON.stringify({ f: r.fields, fr: r.frames, t: r.tonnage, rv: r.reviews })).digest('hex')
}

export async function upsertSuppliers(db: DbOrTx, list: SupplierRecord[]): Promise<void> {
  if (!list.length) return
  await db
    .insert(suppliers)
    .values(list.map(s => ({ code: s.code, displayName: s.displayName, notes: s.notes })))
    .onConflictDoUpdate({ target: suppliers.code, set: { displayName: sql`excluded.display_name`, notes: sql`excluded.notes` } })
}

async function insertChunked<T extends Record<string, unknown>, R>(rows: T[], columns: number, insert: (chunk: T[]) => Promise<R[]>): Promise<R[]> {
  const size = Math.max(1, Math.floor(MAX_PARAMS / columns))
  const out: R[] = []
  for (let i = 0; i < rows.length; i += size) out.push(...(await insert(rows.slice(i, i + size))))
  return out
}

/**
 * Loads project records by natural key. Unchanged projects (same content hash) are skipped;
 * changed ones are replaced whole; each project is all-or-nothing. Batches of projects share one
 * transaction and multi-row statements (the fast path); if a batch fails, its projects are retried
 * one by one so one bad project cannot take good ones with it.
 */
export async function loadProjects(
  db: Db,
  records: ProjectRecord[],
  { runId, onProgress }: { runId?: number; onProgress?: (done: number, total: number) => void } = {},
): Promise<LoadResult> {
  const result: LoadResult = { loaded: [], updated: [], unchanged: [], failed: [] }
  const hashes = new Map(records.map(r => [r.fields.code, hashProject(r)]))
  const existing = new Map<string, string | null>()
  for (let i = 0; i < records.length; i += 5_000) {
    const codes = records.slice(i, i + 5_000).map(r => r.fields.code)
    const rows = await db.select({ code: projects.code, hash: projects.contentHash }).from(projects).where(inArray(projects.code, codes))
    for (const row of rows) existing.set(row.code, row.hash)
  }
  const todo = records.filter(r => {
    if (existing.get(r.fields.code) === hashes.get(r.fields.code)) {
      result.unchanged.push(r.fields.code)
      return false
    }
    return true
  })
  const supplierIds = new Map((await db.select({ id: suppliers.id, code: suppliers.code }).from(suppliers)).map(s => [s.code, s.id]))

  for (let i = 0; i < todo.length; i += BATCH) {
    const batch = todo.slice(i, i + BATCH)
    try {
      await db.transaction(tx => writeProjects(tx, batch, hashes, supplierIds, runId))
      for (const r of batch) (existing.has(r.fields.code) ? result.updated : result.loaded).push(r.fields.code)
    } catch {
      for (const r of batch) {
        try {
          await db.transaction(tx => writeProjects(tx, [r], hashes, supplierIds, runId))
          ;(existing.has(r.fields.code) ? result.updated : result.loaded).push(r.fields.code)
        } catch (err) {
          result.failed.push({ code: r.fields.code, message: err instanceof Error ? err.message : String(err) })
        }
      }
    }
    onProgress?.(result.unchanged.length + i + batch.length, records.length)
  }
  return result
}

async function writeProjects(tx: DbOrTx, batch: ProjectRecord[], hashes: Map<string, string>, supplierIds: Map<string, number>, runId?: number) {
  for (const r of batch) {
    if (r.fields.supplierCode && !supplierIds.has(r.fields.supplierCode)) {
      throw new Error(`Project ${r.fields.code} names supplier ${r.fields.supplierCode}, which is neither in the file's suppliers table nor already stored.`)
    }
  }
  const now = new Date()
  const projectRows = batch.map(r => {
    const { supplierCode, ...f } = r.fields
    return { ...f, supplierId: supplierCode ? supplierIds.get(supplierCode)! : null, contentHash: hashes.get(r.fields.code)!, importRunId: runId ?? null, updatedAt: now, draft: false }
  })
  const ids = await tx
    .insert(projects)
    .values(projectRows)
    .onConflictDoUpdate({
      target: projects.code,
      set: Object.fromEntries(Object.keys(projectRows[0]!).map(k => [k, sql.raw(`excluded."${PROJECT_COLUMNS[k as keyof typeof PROJECT_COLUMNS].name}"`)])),
    })
    .returning({ id: projects.id, code: projects.code })
  const idOf = new Map(ids.map(x => [x.code, x.id]))
  const projectIds = ids.map(x => x.id)
  // Replace the children whole: a project is the unit of loading.
  await tx.delete(frames).where(inArray(frames.projectId, projectIds))
  await tx.delete(tonnage).where(inArray(tonnage.projectId, projectIds))
  await tx.delete(reviewItems).where(inArray(reviewItems.projectCode, batch.map(b => b.fields.code)))

  const frameRows = batch.flatMap(r => r.frames.map(f => ({ projectId: idOf.get(r.fields.code)!, frameLine: f.frameLine, configuration: f.configuration, bays: f.bays, bayWidthIn: f.bayWidthIn })))
  const frameIds = await insertChunked(frameRows, 5, c => tx.insert(frames).values(c).returning({ id: frames.id, projectId: frames.projectId, frameLine: frames.frameLine }))
  const frameKey = new Map(frameIds.map(f => [`${f.projectId}|${f.frameLine}`, f.id]))

  const levelRows = batch.flatMap(r =>
    r.frames.flatMap(f =>
      f.levels.map(l => ({ frameId: frameKey.get(`${idOf.get(r.fields.code)}|${f.frameLine}`)!, name: l.name, levelIndex: l.levelIndex, storyHeightIn: l.storyHeightIn, storyShearKip: l.storyShearKip, designDriftIn: l.designDriftIn })),
    ),
  )
  const levelIds = await insertChunked(levelRows, 6, c => tx.insert(levels).values(c).returning({ id: levels.id, frameId: levels.frameId, name: levels.name }))
  const levelKey = new Map(levelIds.map(l => [`${l.frameId}|${l.name}`, l.id]))

  const braceInputs = batch.flatMap(r =>
    r.frames.flatMap(f =>
      f.levels
        .filter(l => l.brace)
        .map(l => ({ r, f, l, levelId: levelKey.get(`${frameKey.get(`${idOf.get(r.fields.code)}|${f.frameLine}`)}|${l.name}`)! })),
    ),
  )
  const braceIds = await insertChunked(
    braceInputs.map(b => ({ levelId: b.levelId, braceCount: b.l.brace!.braceCount, angleDeg: b.l.brace!.angleDeg, workPointLengthIn: b.l.brace!.workPointLengthIn, requiredStrengthKip: b.l.brace!.requiredStrengthKip, method: b.l.brace!.method })),
    6,
    c => tx.insert(braces).values(c).returning({ id: braces.id, levelId: braces.levelId }),
  )
  const braceOfLevel = new Map(braceIds.map(b => [b.levelId, b.id]))

  const snapshotRows = braceInputs.flatMap(b => b.l.brace!.snapshots.map(s => ({ braceId: braceOfLevel.get(b.levelId)!, ...s })))
  const snapIds = await insertChunked(snapshotRows, 22, c =>
    tx.insert(braceSnapshots).values(c).returning({ id: braceSnapshots.id, braceId: braceSnapshots.braceId, phase: braceSnapshots.phase, revision: braceSnapshots.revision }),
  )
  const snapKey = new Map(snapIds.map(s => [`${s.braceId}|${s.phase}|${s.revision}`, s.id]))

  const tonnageRows = batch.flatMap(r => r.tonnage.map(t => ({ projectId: idOf.get(r.fields.code)!, ...t })))
  await insertChunked(tonnageRows, 5, c => tx.insert(tonnage).values(c).returning({ id: tonnage.id }))

  const reviewRows = batch.flatMap(r =>
    r.reviews.map(rv => {
      let snapshotId: number | null = null
      if (rv.snapshot) {
        const frameId = frameKey.get(`${idOf.get(r.fields.code)}|${rv.snapshot.frameLine}`)
        const braceId = braceOfLevel.get(levelKey.get(`${frameId}|${rv.snapshot.level}`)!)
        snapshotId = snapKey.get(`${braceId}|${rv.snapshot.phase}|${rv.snapshot.revision}`) ?? null
      }
      return { runId: runId ?? null, snapshotId, projectCode: r.fields.code, field: rv.field.slice(0, 80), value: rv.value, reason: rv.reason }
    }),
  )
  await insertChunked(reviewRows, 6, c => tx.insert(reviewItems).values(c).returning({ id: reviewItems.id }))
}

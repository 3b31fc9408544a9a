import { createHash } from 'node:crypto'
import { Readable } from 'node:stream'
import { pipeline } from 'node:stream/promises'
import { getTableColumns, inArray, sql } from 'drizzle-orm'
import type pg from 'pg'
import { from as copyFrom } from 'pg-copy-streams'
import type { ProjectRecord, SupplierRecord } from '@shared/history/types'
import type { Db, DbOrTx } from '../../api/src/db'
import { projects, suppliers } from '../../api/src/db/history-schema'

const PROJECT_COLUMNS = getTableColumns(projects)

/** Projects per transaction on the fast path; a failing batch is retried one project at a time. */
const BATCH = 250

/** Batches written at once, each in its own transaction on its own connection. */
const WRITERS = 3

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

/**
 * Loads project records by natural key. Unchanged projects (same content hash) are skipped;
 * changed ones are replaced whole; each project is all-or-nothing. Batches of projects share one
 * transaction: a multi-row upsert and COPY (the fast path); if a batch fails, its projects are
 * retried one by one so one bad project cannot take good ones with it.
 */
export async function loadProjects(
  db: Db,
  records: ProjectRecord[],
  { runId, onProgress, replaceEdited = false }: { runId?: number; onProgress?: (done: number, total: number) => void; replaceEdited?: boolean } = {},
): Promise<LoadResult> {
  const result: LoadResult = { loaded: [], updated: [], unchanged: [], failed: [] }
  const hashes = new Map(records.map(r => [r.fields.code, hashProject(r)]))
  const existing = new Map<string, string | null>()
  const edited = new Map<string, Date>()
  for (let i = 0; i < records.length; i += 5_000) {
    const codes = records.slice(i, i + 5_000).map(r => r.fields.code)
    const rows = await db.select({ code: projects.code, hash: projects.contentHash, editedAt: projects.editedAt }).from(projects).where(inArray(projects.code, codes))
    for (const row of rows) {
      existing.set(row.code, row.hash)
      if (row.editedAt) edited.set(row.code, row.editedAt)
    }
  }
  const todo = records.filter(r => {
    if (existing.get(r.fields.code) === hashes.get(r.fields.code)) {
      result.unchanged.push(r.fields.code)
      return false
    }
    // The rule for an edit racing an import: the edit made in Backsight is never overwritten
    // silently. The project is refused (the file keeps it) until the file carries the edit, or
    // the import is run on purpose to replace it (`--replace-edits`).
    const at = edited.get(r.fields.code)
    if (at && !replaceEdited) {
      result.failed.push({
        code: r.fields.code,
        message: `it was changed in Backsight on ${at.toISOString().slice(0, 16).replace('T', ' ')} UTC, after its last import, and this file would overwrite that change. Export the project, bring the file up to date, and import again — or run the import with --replace-edits to let the file win.`,
      })
      return false
    }
    return true
  })
  const supplierIds = new Map((await db.select({ id: suppliers.id, code: suppliers.code }).from(suppliers)).map(s => [s.code, s.id]))

  const batches: ProjectRecord[][] = []
  for (let i = 0; i < todo.length; i += BATCH) batches.push(todo.slice(i, i + BATCH))
  const landed = (r: ProjectRecord) => (existing.has(r.fields.code) ? result.updated : result.loaded).push(r.fields.code)
  let next = 0
  let done = 0
  // A few writers on their own connections: while one batch waits on the server's constraint and
  // index work, the next is being encoded. Batches hold different projects, so they never contend.
  const writer = async () => {
    while (next < batches.length) {
      const batch = batches[next++]!
      try {
        await writeProjects(db, batch, hashes, supplierIds, runId)
        batch.forEach(landed)
      } catch {
        for (const r of batch) {
          try {
            await writeProjects(db, [r], hashes, supplierIds, runId)
            landed(r)
          } catch (err) {
            result.failed.push({ code: r.fields.code, message: err instanceof Error ? err.message : String(err) })
          }
        }
      }
      done += batch.length
      onProgress?.(result.unchanged.length + done, records.length)
    }
  }
  await Promise.all(Array.from({ length: Math.min(WRITERS, batches.length) }, writer))
  return result
}

/** Column order of each COPY, by SQL name. */
const COPY_COLUMNS = {
  frames: ['id', 'project_id', 'frame_line', 'configuration', 'bays', 'bay_width_in'],
  levels: ['id', 'frame_id', 'name', 'level_index', 'story_height_in', 'story_shear_kip', 'design_drift_in'],
  braces: ['id', 'level_id', 'brace_count', 'angle_deg', 'work_point_length_in', 'required_strength_kip', 'method'],
  brace_snapshots: [
    'id', 'brace_id', 'phase', 'revision', 'date', 'source_document', 'required_core_area_in2', 'core_area_in2', 'fysc_ksi', 'fysc_basis',
    'fysc_max_ksi', 'ry', 'beta', 'omega', 'factor_drift_multiple', 'stiffness_factor', 'yield_length_ratio', 'adjusted_tension_kip',
    'adjusted_compression_kip', 'governing', 'confirmed',
  ],
  tonnage: ['project_id', 'stage', 'category', 'tons_short', 'scope'],
  review_items: ['run_id', 'snapshot_id', 'project_code', 'field', 'value', 'reason'],
} as const

type Cell = string | number | boolean | null

/** One CSV field as COPY reads it: unquoted empty is NULL; text is always quoted. */
function csvField(v: Cell): string {
  if (v === null) return ''
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : ''
  if (typeof v === 'boolean') return v ? 't' : 'f'
  return `"${v.replace(/"/g, '""')}"`
}

async function copyRows(client: pg.PoolClient, table: keyof typeof COPY_COLUMNS, rows: Cell[][]) {
  if (!rows.length) return
  const cols = COPY_COLUMNS[table].map(c => `"${c}"`).join(', ')
  const sink = client.query(copyFrom(`copy ${table} (${cols}) from stdin with (format csv)`))
  const lines = function* () {
    for (let i = 0; i < rows.length; i += 1_000) yield rows.slice(i, i + 1_000).map(r => r.map(csvField).join(',')).join('\n') + '\n'
  }
  await pipeline(Readable.from(lines()), sink)
}

async function reserveIds(client: pg.PoolClient, sequence: string, n: number): Promise<number[]> {
  if (n === 0) return []
  const r = await client.query<{ id: string }>(`select nextval('${sequence}') as id from generate_series(1, $1)`, [n])
  return r.rows.map(x => Number(x.id))
}

/**
 * Writes a batch of projects in one transaction: one multi-row upsert of the projects, then their
 * children replaced whole through COPY with ids reserved up front (no row-at-a-time inserts).
 */
async function writeProjects(db: Db, batch: ProjectRecord[], hashes: Map<string, string>, supplierIds: Map<string, number>, runId?: number) {
  for (const r of batch) {
    if (r.fields.supplierCode && !supplierIds.has(r.fields.supplierCode)) {
      throw new Error(`Project ${r.fields.code} names supplier ${r.fields.supplierCode}, which is neither in the file's suppliers table nor already stored.`)
    }
  }
  // drizzle(pool) keeps the pool as $client; COPY needs a client of its own.
  const pool = (db as unknown as { $client: pg.Pool }).$client
  const client = await pool.connect()
  try {
    await client.query('begin')
    const now = new Date()
    const rows = batch.map(r => {
      const { supplierCode, ...f } = r.fields
      return { ...f, supplierId: supplierCode ? supplierIds.get(supplierCode)! : null, contentHash: hashes.get(r.fields.code)!, importRunId: runId ?? null, updatedAt: now, editedAt: null, draft: false }
    })
    const keys = Object.keys(rows[0]!) as (keyof (typeof rows)[number])[]
    const sqlCols = keys.map(k => `"${PROJECT_COLUMNS[k as keyof typeof PROJECT_COLUMNS].name}"`)
    const params: unknown[] = []
    const tuples = rows.map(row => `(${keys.map(k => `$${params.push(row[k])}`).join(', ')})`)
    const upsert = await client.query<{ id: number; code: string }>(
      `insert into projects (${sqlCols.join(', ')}) values ${tuples.join(', ')}
       on conflict (code) do update set ${sqlCols.filter(c => c !== '"code"').map(c => `${c} = excluded.${c}`).join(', ')}
       returning id, code`,
      params,
    )
    const idOf = new Map(upsert.rows.map(x => [x.code, x.id]))
    const projectIds = upsert.rows.map(x => x.id)
    // Replace the children whole: a project is the unit of loading.
    await client.query('delete from frames where project_id = any($1)', [projectIds])
    await client.query('delete from tonnage where project_id = any($1)', [projectIds])
    await client.query('delete from review_items where project_code = any($1)', [batch.map(b => b.fields.code)])

    const frameList = batch.flatMap(r => r.frames.map(f => ({ r, f })))
    const levelList = frameList.flatMap(x => x.f.levels.map(l => ({ ...x, l })))
    const braceList = levelList.filter(x => x.l.brace)
    const snapList = braceList.flatMap(x => x.l.brace!.snapshots.map(s => ({ ...x, s })))
    const frameIds = await reserveIds(client, 'frames_id_seq', frameList.length)
    const levelIds = await reserveIds(client, 'levels_id_seq', levelList.length)
    const braceIds = await reserveIds(client, 'braces_id_seq', braceList.length)
    const snapIds = await reserveIds(client, 'brace_snapshots_id_seq', snapList.length)
    const frameId = new Map(frameList.map((x, i) => [x.f, frameIds[i]!]))
    const levelId = new Map(levelList.map((x, i) => [x.l, levelIds[i]!]))
    const braceId = new Map(braceList.map((x, i) => [x.l, braceIds[i]!]))
    const snapId = new Map<string, number>()
    snapList.forEach((x, i) => snapId.set(`${x.r.fields.code}|${x.f.frameLine}|${x.l.name}|${x.s.phase}|${x.s.revision}`, snapIds[i]!))

    await copyRows(client, 'frames', frameList.map(({ r, f }) => [frameId.get(f)!, idOf.get(r.fields.code)!, f.frameLine, f.configuration, f.bays, f.bayWidthIn]))
    await copyRows(client, 'levels', levelList.map(({ f, l }) => [levelId.get(l)!, frameId.get(f)!, l.name, l.levelIndex, l.storyHeightIn, l.storyShearKip, l.designDriftIn]))
    await copyRows(client, 'braces', braceList.map(({ l }) => {
      const b = l.brace!
      return [braceId.get(l)!, levelId.get(l)!, b.braceCount, b.angleDeg, b.workPointLengthIn, b.requiredStrengthKip, b.method]
    }))
    await copyRows(client, 'brace_snapshots', snapList.map(({ r, f, l, s }) => [
      snapId.get(`${r.fields.code}|${f.frameLine}|${l.name}|${s.phase}|${s.revision}`)!, braceId.get(l)!, s.phase, s.revision, s.date, s.sourceDocument,
      s.requiredCoreAreaIn2, s.coreAreaIn2, s.fyscKsi, s.fyscBasis, s.fyscMaxKsi, s.ry, s.beta, s.omega, s.factorDriftMultiple, s.stiffnessFactor,
      s.yieldLengthRatio, s.adjustedTensionKip, s.adjustedCompressionKip, s.governing, s.confirmed,
    ]))
    await copyRows(client, 'tonnage', batch.flatMap(r => r.tonnage.map(t => [idOf.get(r.fields.code)!, t.stage, t.category, t.tons, t.scope])))
    await copyRows(client, 'review_items', batch.flatMap(r => r.reviews.map(rv => {
      const sid = rv.snapshot ? (snapId.get(`${r.fields.code}|${rv.snapshot.frameLine}|${rv.snapshot.level}|${rv.snapshot.phase}|${rv.snapshot.revision}`) ?? null) : null
      return [runId ?? null, sid, r.fields.code, rv.field.slice(0, 80), rv.value, rv.reason]
    })))
    await client.query('commit')
  } catch (err) {
    await client.query('rollback').catch(() => {})
    throw err
  } finally {
    client.release()
  }
}

import { sql } from 'drizzle-orm'
import type pg from 'pg'
import type { Db, DbOrTx } from './index'
import { sharedRead } from './shared-read'

/**
 * The `calibration_pairs` table (migrations 0004, 0007): one row per brace and assumed phase with
 * both snapshots' values. `refreshCalibrationPairs` rewrites the rows of the projects that changed
 * and bumps `calibration_state.version` (logging the projects in `calibration_changes`), which the
 * API's in-process analytics cache compares on every request.
 * Call it after anything that changes snapshots, their confirmation or the projects: an import run,
 * a review-queue resolution, a draft save, a project edit. Pass the ids of every project whose
 * rows may have changed (deleted projects included); pass nothing (a full refresh) when a change
 * can reach projects beyond those — e.g. a supplier's code changing.
 */
export async function refreshCalibrationPairs(db: DbOrTx, projectIds?: readonly number[] | null): Promise<number> {
  const ids = projectIds ? idArrayLiteral([...new Set(projectIds)]) : null
  const res = await db.execute<{ v: string }>(sql`select refresh_calibration_pairs(${ids}::integer[])::text as v`)
  return Number(res.rows[0]!.v)
}

/** `{1,2,3}`: integer ids as a PostgreSQL array literal (whole numbers, so nothing to escape). */
export const idArrayLiteral = (ids: readonly number[]): string => `{${ids.map(id => String(Math.trunc(id))).join(',')}}`

/**
 * The node-postgres pool under a Drizzle handle (drizzle() keeps it as `$client`; the `Db` type
 * does not show it). Analytics read the pairs with array rows in batches, which Drizzle does not offer.
 */
export function poolOf(db: Db): pg.Pool {
  return (db as unknown as { $client: pg.Pool }).$client
}

const readVersion = sharedRead(async (pool: pg.Pool): Promise<number> => {
  const res = await pool.query<{ v: string }>('select version::text as v from calibration_state where id = 1')
  return Number(res.rows[0]?.v ?? 0)
})

/**
 * The current data version of the calibration pairs. Every analytics request asks for it, so
 * concurrent callers share queries (see sharedRead: never an answer from a query sent before the call).
 */
export function calibrationVersion(db: Db): Promise<number> {
  return readVersion(poolOf(db))
}

/** A read-only REPEATABLE READ transaction: every query sees one snapshot, so one data version. */
export async function inSnapshot<T>(db: Db, work: (client: pg.PoolClient) => Promise<T>): Promise<T> {
  const client = await poolOf(db).connect()
  try {
    await client.query('begin isolation level repeatable read read only')
    const out = await work(client)
    await client.query('commit')
    return out
  } catch (err) {
    await client.query('rollback').catch(() => {})
    throw err
  } finally {
    client.release()
  }
}

/** The data version as `client`'s transaction sees it. */
export async function readVersionIn(client: pg.PoolClient): Promise<number> {
  const res = await client.query<{ v: string }>('select version::text as v from calibration_state where id = 1')
  return Number(res.rows[0]?.v ?? 0)
}

/**
 * The projects changed after version `from` up to `to`, from `calibration_changes`; null when the
 * log cannot say (a full refresh in between, or versions missing: pruned or never logged).
 */
export async function changedSince(client: pg.PoolClient, from: number, to: number): Promise<number[] | null> {
  if (to < from) return null
  const { rows } = await client.query<{ version: string; project_ids: number[] | null }>(
    'select version::text as version, project_ids from calibration_changes where version > $1 and version <= $2',
    [from, to],
  )
  if (rows.length !== to - from || rows.some(r => r.project_ids === null)) return null
  return [...new Set(rows.flatMap(r => r.project_ids!))].sort((a, b) => a - b)
}

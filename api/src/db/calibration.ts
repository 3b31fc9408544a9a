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
  const ids = projectIds ? `{${[...new Set(projectIds)].map(id => String(Math.trunc(id))).join(',')}}` : null
  const res = await db.execute<{ v: string }>(sql`select refresh_calibration_pairs(${ids}::integer[])::text as v`)
  return Number(res.rows[0]!.v)
}

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

import { sql } from 'drizzle-orm'
import type pg from 'pg'
import type { Db, DbOrTx } from './index'
import { sharedRead } from './shared-read'

/**
 * The `calibration_pairs` materialized view (migration 0004): one row per brace and assumed phase
 * with both snapshots' values. `refreshCalibrationPairs` rebuilds it and bumps
 * `calibration_state.version`, which the API's in-process analytics cache compares on every request.
 * Call it after anything that changes snapshots, their confirmation or the projects: an import run,
 * a review-queue resolution, a draft save.
 */
export async function refreshCalibrationPairs(db: DbOrTx): Promise<number> {
  const res = await db.execute<{ v: string }>(sql`select refresh_calibration_pairs()::text as v`)
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

import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres'
import { migrate } from 'drizzle-orm/node-postgres/migrator'
import { fileURLToPath } from 'node:url'
import pg from 'pg'
import * as historySchema from './history-schema'
import * as authSchema from './schema'

const schema = { ...authSchema, ...historySchema }

export { schema }
export type Db = NodePgDatabase<typeof schema>

export const MIGRATIONS_FOLDER = fileURLToPath(new URL('../../../drizzle', import.meta.url))

export interface DbHandle {
  db: Db
  pool: pg.Pool
  close: () => Promise<void>
}

/** Opens a pool and a Drizzle handle on `databaseUrl`. */
export function openDb(databaseUrl: string, { max = 10 }: { max?: number } = {}): DbHandle {
  const pool = new pg.Pool({ connectionString: databaseUrl, max, connectionTimeoutMillis: 5_000 })
  // An idle client that loses its server (PostgreSQL restarted) emits 'error'; without a
  // listener that would crash the process. The next query gets a fresh client.
  pool.on('error', () => {})
  const db = drizzle(pool, { schema })
  return { db, pool, close: () => pool.end() }
}

/** Applies the committed migrations in `drizzle/`. Safe to run again. */
export async function migrateDb(db: Db): Promise<void> {
  await migrate(db, { migrationsFolder: MIGRATIONS_FOLDER })
}

/** A handle or an open transaction: services that may run inside either take this. */
export type DbOrTx = Db | Parameters<Parameters<Db['transaction']>[0]>[0]

import { randomBytes } from 'node:crypto'
import pg from 'pg'
import { migrateDb, openDb, type DbHandle } from '../../api/src/db'

/** The throwaway cluster `npm test` started. */
export function adminUrl(): string {
  const url = process.env.TEST_PG_ADMIN_URL
  if (!url) throw new Error('TEST_PG_ADMIN_URL is not set: run the suite with `npm test`, which starts a throwaway PostgreSQL.')
  return url
}

export interface TestDb extends DbHandle {
  url: string
  name: string
  drop: () => Promise<void>
}

/** A fresh, migrated database of its own for one test file. */
export async function createTestDb(): Promise<TestDb> {
  const name = `t_${randomBytes(6).toString('hex')}`
  const admin = new pg.Client({ connectionString: adminUrl() })
  await admin.connect()
  await admin.query(`create database ${name}`)
  await admin.end()
  const url = adminUrl().replace(/\/[^/]*$/, `/${name}`)
  const handle = openDb(url, { max: 5 })
  await migrateDb(handle.db)
  return {
    ...handle,
    url,
    name,
    drop: async () => {
      await handle.close()
      const c = new pg.Client({ connectionString: adminUrl() })
      await c.connect()
      await c.query(`drop database if exists ${name} with (force)`)
      await c.end()
    },
  }
}

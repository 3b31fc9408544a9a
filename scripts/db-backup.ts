/**
 * `npm run db:backup [-- file]` and `npm run db:restore -- file`: pg_dump / pg_restore of the
 * database the app uses — DATABASE_URL when set, else the private cluster `npm start` runs
 * (started for the moment if it is not running). Backups go to var/backups/ by default.
 */
import { resolve, join } from 'node:path'
import pg from 'pg'
import { backupDatabase, fingerprint, restoreDatabase } from './lib/backup'
import { appDataDir, appPort, startCluster, type Cluster } from './lib/postgres'

const ROOT = resolve(import.meta.dirname, '..')

async function reachable(url: string): Promise<boolean> {
  const c = new pg.Client({ connectionString: url, connectionTimeoutMillis: 2_000 })
  try {
    await c.connect()
    await c.end()
    return true
  } catch {
    return false
  }
}

async function main() {
  const [command, file] = process.argv.slice(2)
  if (command !== 'backup' && command !== 'restore') throw new Error('Usage: db-backup.ts backup [file] | restore <file>')
  if (command === 'restore' && !file) throw new Error('Name the backup to restore: npm run db:restore -- var/backups/<file>.dump')
  let cluster: Cluster | undefined
  let url = process.env.DATABASE_URL
  if (!url) {
    url = `postgres://postgres@127.0.0.1:${appPort()}/backsight`
    if (!(await reachable(url))) cluster = startCluster({ dataDir: appDataDir(ROOT), port: appPort() })
  }
  try {
    if (command === 'backup') {
      const stamp = new Date().toISOString().replace(/[:.]/g, '-').slice(0, 19)
      const out = resolve(file ?? join(ROOT, 'var', 'backups', `backsight-${stamp}.dump`))
      backupDatabase(url, out)
      const tables = await fingerprint(url)
      console.log(`Backed up ${tables.length} tables (${tables.reduce((n, t) => n + t.rows, 0)} rows) to ${out}`)
    } else {
      restoreDatabase(url, resolve(file!))
      const tables = await fingerprint(url)
      console.log(`Restored ${tables.length} tables (${tables.reduce((n, t) => n + t.rows, 0)} rows) from ${resolve(file)}`)
    }
  } finally {
    cluster?.stop()
  }
}

main().catch(err => {
  console.error(err instanceof Error ? err.message : err)
  process.exit(1)
})

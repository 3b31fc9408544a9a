import { spawnSync } from 'node:child_process'
import { mkdirSync } from 'node:fs'
import { dirname, join } from 'node:path'
import pg from 'pg'
import { findPgBin } from './postgres'

/**
 * Backups of the app's database with the server's own pg_dump / pg_restore (custom format, so a
 * restore can clean and recreate every object in one transaction).
 */

function tool(name: 'pg_dump' | 'pg_restore', args: string[]) {
  const r = spawnSync(join(findPgBin(), name), args, { encoding: 'utf8' })
  if (r.status !== 0) throw new Error(`${name} failed (exit ${r.status ?? r.signal}): ${(r.stderr || r.stdout).trim()}`)
}

/** Writes a full dump of the database at `url` to `file` (custom format). */
export function backupDatabase(url: string, file: string): void {
  mkdirSync(dirname(file), { recursive: true })
  tool('pg_dump', ['--format=custom', '--no-owner', '--file', file, url])
}

/**
 * Restores `file` into the database at `url`: drops what the dump holds and recreates it, in one
 * transaction, so a failed restore leaves the database as it was.
 */
export function restoreDatabase(url: string, file: string): void {
  tool('pg_restore', ['--clean', '--if-exists', '--no-owner', '--single-transaction', '--exit-on-error', '--dbname', url, file])
}

export interface TableFingerprint {
  table: string
  rows: number
  /** md5 of every row's text, in sorted order. */
  md5: string
}

/** Row count and checksum of every table of the app (schemas public and drizzle), by name. */
export async function fingerprint(url: string): Promise<TableFingerprint[]> {
  const client = new pg.Client({ connectionString: url })
  await client.connect()
  try {
    const { rows: tables } = await client.query<{ name: string }>(
      `select format('%I.%I', table_schema, table_name) as name from information_schema.tables
       where table_schema in ('public', 'drizzle') and table_type = 'BASE TABLE' order by 1`,
    )
    const out: TableFingerprint[] = []
    for (const { name } of tables) {
      const { rows } = await client.query<{ rows: string; md5: string }>(
        `select count(*) as rows, md5(coalesce(string_agg(t::text, E'\\n' order by t::text), '')) as md5 from ${name} t`,
      )
      out.push({ table: name, rows: Number(rows[0]!.rows), md5: rows[0]!.md5 })
    }
    return out
  } finally {
    await client.end()
  }
}

import { mkdtempSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ensureDemoUsers } from '../../api/src/services/users'
import { expandPaths } from '../../etl/src/paths'
import { readInputs, runImport } from '../../etl/src/run'
import { backupDatabase, fingerprint, restoreDatabase } from '../../scripts/lib/backup'
import { createTestDb, type TestDb } from '../helpers/db'

let t: TestDb
beforeAll(async () => {
  t = await createTestDb()
  await ensureDemoUsers(t.db, 'backup-test-password')
  await runImport(t.db, await readInputs(await expandPaths(['demo-data'])), { source: 'cli' })
}, 120_000)
afterAll(() => t.drop())

describe('db:backup and db:restore', () => {
  it('backs up, survives the loss of every table, and restores identical rows', async () => {
    const before = await fingerprint(t.url)
    // The demo firm is in: a restore that lost history would show here.
    expect(before.find(x => x.table === 'public.projects')!.rows).toBe(149)
    expect(before.find(x => x.table === 'public.brace_snapshots')!.rows).toBeGreaterThan(1000)

    const file = join(mkdtempSync(join(tmpdir(), 'backsight-backup-')), 'test.dump')
    backupDatabase(t.url, file)

    const c = new pg.Client({ connectionString: t.url })
    await c.connect()
    await c.query('drop schema public cascade; create schema public; drop schema if exists drizzle cascade')
    await c.end()
    expect((await fingerprint(t.url)).length).toBe(0)

    restoreDatabase(t.url, file)
    expect(await fingerprint(t.url)).toEqual(before)
  }, 120_000)

  it('leaves the database as it was when the backup file is not a dump', async () => {
    const before = await fingerprint(t.url)
    const file = join(mkdtempSync(join(tmpdir(), 'backsight-backup-')), 'not-a-dump.dump')
    await import('node:fs/promises').then(fs => fs.writeFile(file, 'this is not a pg_dump archive'))
    expect(() => restoreDatabase(t.url, file)).toThrow(/pg_restore failed/)
    expect(await fingerprint(t.url)).toEqual(before)
  }, 60_000)
})

import { spawn } from 'node:child_process'
import { mkdtempSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { sql } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { expandPaths } from '../../etl/src/paths'
import { readInputs, runImport } from '../../etl/src/run'
import { generate, writeCsv } from '../../scripts/bench/etl'
import { createTestDb, type TestDb } from '../helpers/db'

const PROJECTS = 1500
let t: TestDb
let dir: string
beforeAll(async () => {
  t = await createTestDb()
  dir = mkdtempSync(join(tmpdir(), 'backsight-kill-'))
  writeCsv(dir, generate(PROJECTS))
})
afterAll(async () => t.drop())

const counts = async () =>
  (
    await t.db.execute(sql`select p.code, count(distinct l.id)::int as levels, count(s.id)::int as snaps
      from projects p left join frames f on f.project_id = p.id left join levels l on l.frame_id = f.id
      left join braces b on b.level_id = l.id left join brace_snapshots s on s.brace_id = b.id group by p.code`)
  ).rows as { code: string; levels: number; snaps: number }[]

describe('a loader killed in the middle of an import', () => {
  it('leaves no partial project, and running the import again completes it', async () => {
    const child = spawn(process.execPath, ['--import', 'tsx', 'etl/src/cli.ts', '--quiet', dir], { env: { ...process.env, DATABASE_URL: t.url, ETL_MAIL: 'off' }, stdio: 'ignore' })
    let seen = 0
    for (let i = 0; i < 600 && seen === 0; i++) {
      await new Promise(r => setTimeout(r, 50))
      seen = Number((await t.db.execute(sql`select count(*)::int as n from projects`)).rows[0]!.n)
    }
    child.kill('SIGKILL')
    await new Promise(r => child.once('exit', r))
    const partial = await counts()
    expect(partial.length).toBeGreaterThan(0)
    expect(partial.length).toBeLessThan(PROJECTS)
    // Every project stored is whole: 5 frames × 10 stories = 50 levels, two snapshots per brace group = 100.
    expect(partial.filter(p => p.levels !== 50 || p.snaps !== 100)).toEqual([])

    const summary = await runImport(t.db, await readInputs(await expandPaths([dir])), { source: 'cli' })
    expect(summary.rejected).toBe(0)
    expect(summary.loaded).toBe(PROJECTS - partial.length)
    expect(summary.unchanged).toBe(partial.length)
    const after = await counts()
    expect(after).toHaveLength(PROJECTS)
    expect(after.filter(p => p.levels !== 50 || p.snaps !== 100)).toEqual([])
  }, 120_000)
})

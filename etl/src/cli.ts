/**
 * `npm run etl -- <files or folders…> [--dry-run] [--replace-edits]`: loads project history files into the database
 * named by DATABASE_URL. Prints progress and a summary; exits 1 when anything was rejected.
 */
import { parseArgs } from 'node:util'
import cliProgress from 'cli-progress'
import { migrateDb, openDb } from '../../api/src/db'
import { expandPaths } from './paths'
import { formatSummary } from './report'
import { mailRunSummary } from './summary-mail'
import { eq } from 'drizzle-orm'
import { importRuns } from '../../api/src/db/history-schema'
import { originalOf, readInputs, runImport } from './run'

async function main() {
  const { values, positionals } = parseArgs({
    allowPositionals: true,
    options: { 'dry-run': { type: 'boolean' }, 'replace-edits': { type: 'boolean' }, quiet: { type: 'boolean' }, run: { type: 'string' } },
  })
  if (values.run) return runQueued(Number(values.run))
  if (positionals.length === 0) {
    console.error('Usage: npm run etl -- <files or folders…> [--dry-run] [--replace-edits]')
    process.exit(2)
  }
  const url = process.env.DATABASE_URL
  if (!url) {
    console.error('DATABASE_URL is not set: point it at the Backsight database (npm start prints where it runs).')
    process.exit(2)
  }
  const files = await expandPaths(positionals)
  const { db, close } = openDb(url)
  const bar = values.quiet || !process.stdout.isTTY ? undefined : new cliProgress.SingleBar({ format: ' {stage} [{bar}] {value}/{total}' }, cliProgress.Presets.shades_classic)
  try {
    await migrateDb(db)
    let started = ''
    const summary = await runImport(db, await readInputs(files), {
      source: 'cli',
      dryRun: values['dry-run'],
      replaceEdited: values['replace-edits'],
      onProgress: (stage, done, total) => {
        if (!bar) return
        if (stage !== started) {
          if (started) bar.stop()
          bar.start(total, done, { stage: stage.padEnd(5) })
          started = stage
        } else bar.update(done)
      },
    })
    bar?.stop()
    console.log(formatSummary(summary))
    if (!summary.dryRun && process.env.ETL_MAIL !== 'off') {
      const sent = await mailRunSummary(db, summary)
      console.log(sent ? `Summary e-mailed to ${sent} principal(s).` : 'No summary e-mail was sent (no principal, or the mail server is not reachable).')
    }
    process.exitCode = summary.rejected > 0 ? 1 : 0
  } finally {
    await close()
  }
}

/**
 * `--run <id>`: the server's way of loading an upload. The API records the upload as a queued run and
 * starts this process, so parsing a large or hostile file never blocks (or crashes) the server.
 * Progress and the outcome go to the run's row.
 */
async function runQueued(runId: number) {
  const url = process.env.DATABASE_URL
  if (!url || !Number.isInteger(runId)) process.exit(2)
  const { db, close } = openDb(url, { max: 2 })
  let last = 0
  try {
    const input = await originalOf(db, runId)
    const [run] = await db.select({ userId: importRuns.userId }).from(importRuns).where(eq(importRuns.id, runId))
    const summary = await runImport(db, [input], {
      source: 'upload',
      runId,
      userId: run?.userId ?? null,
      onProgress: (stage, done, total) => {
        const now = Date.now()
        if (now - last < 200 && done < total) return
        last = now
        void db.update(importRuns).set({ progressStage: stage, progressDone: done, progressTotal: total }).where(eq(importRuns.id, runId)).catch(() => {})
      },
    })
    await mailRunSummary(db, summary)
  } catch (err) {
    await db
      .update(importRuns)
      .set({ status: 'failed', error: err instanceof Error ? err.message : String(err), finishedAt: new Date() })
      .where(eq(importRuns.id, runId))
    process.exitCode = 1
  } finally {
    await close()
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  main().catch(err => {
    console.error(err instanceof Error ? err.message : err)
    process.exit(1)
  })
}

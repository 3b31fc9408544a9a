/**
 * `npm start`: brings up the whole product on one machine.
 * PostgreSQL (a private cluster in var/pgdata unless DATABASE_URL is set) → migrations →
 * demo users → local mail sink → built dashboard served by the API on HOST:PORT.
 * Ctrl-C stops everything this script started.
 */
import { spawnSync } from 'node:child_process'
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { randomBytes } from 'node:crypto'
import { join, resolve } from 'node:path'
import { createApp } from '../api/src/app'
import { loadConfig } from '../api/src/config'
import { migrateDb, openDb } from '../api/src/db'
import { createMailer } from '../api/src/mail/mailer'
import { warmUp } from '../api/src/services/warm-up'
import { DEMO_USERS, ensureDemoUsers } from '../api/src/services/users'
import { projects } from '../api/src/db/history-schema'
import { count } from 'drizzle-orm'
import { expandPaths } from '../etl/src/paths'
import { readInputs, runImport } from '../etl/src/run'
import { mailRunSummary } from '../etl/src/summary-mail'
import { startMailSink, type MailSink } from './fakes/mail-sink'
import { appDataDir, ensureDatabase, startCluster, type Cluster } from './lib/postgres'
import { portOr } from './lib/ports'

const ROOT = resolve(import.meta.dirname, '..')
const DEFAULT_DEMO_PASSWORD = 'backsight-demo-2026'

function step(msg: string) {
  console.log(`\x1b[36m▸\x1b[0m ${msg}`)
}


/** A secret kept in var/ so sessions survive a restart of `npm start`. */
function sessionSecret(): string {
  const file = join(ROOT, 'var', 'session-secret')
  if (existsSync(file)) return readFileSync(file, 'utf8').trim()
  mkdirSync(join(ROOT, 'var'), { recursive: true })
  const secret = randomBytes(32).toString('hex')
  writeFileSync(file, secret, { mode: 0o600 })
  return secret
}

async function main() {
  let cluster: Cluster | undefined
  let sink: MailSink | undefined
  const env = { ...process.env }

  if (!env.DATABASE_URL) {
    const port = Number(env.PGPORT ?? 55432)
    const dataDir = appDataDir(ROOT)
    step(`Starting PostgreSQL on 127.0.0.1:${port} (data in ${dataDir})`)
    cluster = startCluster({ dataDir, port })
    await ensureDatabase(cluster.url('postgres'), 'backsight')
    env.DATABASE_URL = cluster.url('backsight')
  }

  const smtpIsLocal = !env.SMTP_HOST || env.SMTP_HOST === '127.0.0.1' || env.SMTP_HOST === 'localhost'
  if (smtpIsLocal && env.MAIL_SINK !== 'off') {
    const port = await portOr(Number(env.SMTP_PORT ?? 2525))
    env.SMTP_HOST = '127.0.0.1'
    env.SMTP_PORT = String(port)
    env.MAIL_SINK_DIR = resolve(env.MAIL_SINK_DIR ?? join(ROOT, 'var', 'mail'))
    sink = await startMailSink({ port, dir: env.MAIL_SINK_DIR })
    step(`Local mail sink on 127.0.0.1:${port} (messages kept in ${env.MAIL_SINK_DIR})`)
  }

  if (env.SKIP_BUILD !== '1' || !existsSync(join(ROOT, 'dist', 'dashboard', 'index.html'))) {
    step('Building the dashboard')
    const r = spawnSync(process.execPath, [join(ROOT, 'node_modules/vite/bin/vite.js'), 'build', '--logLevel', 'warn'], { cwd: ROOT, stdio: 'inherit' })
    if (r.status !== 0) throw new Error('The dashboard build failed.')
  }
  env.DASHBOARD_DIST = join(ROOT, 'dist', 'dashboard')
  env.SESSION_SECRET ??= sessionSecret()
  env.NODE_ENV = env.NODE_ENV ?? 'production'
  // Request logs stay out of the terminal unless asked for (LOG_LEVEL=info).
  env.LOG_LEVEL = env.LOG_LEVEL ?? 'warn'

  const config = loadConfig(env)
  const { db, pool, close } = openDb(config.databaseUrl)
  step('Applying migrations')
  await migrateDb(db)

  const demoPassword = env.DEMO_PASSWORD || DEFAULT_DEMO_PASSWORD
  const created = await ensureDemoUsers(db, demoPassword, { force: !!env.DEMO_PASSWORD })
  if (created) step(`Demo users ready (${created} created or reset)`)

  if (env.LOAD_DEMO !== 'off' && (await db.select({ n: count() }).from(projects))[0]!.n === 0) {
    step('Empty history: loading the demo firm through the ETL (demo-data/)')
    const summary = await runImport(db, await readInputs(await expandPaths([join(ROOT, 'demo-data')])), { source: 'cli' })
    const flagged = summary.problems.filter(p => p.severity !== 'note').length
    step(`Demo firm loaded: ${summary.loaded} projects, ${summary.rejected} rejected and ${summary.queued} values queued for review (${flagged} findings — see Imports)`)
    await mailRunSummary(db, summary, config.smtp)
  }

  const mailer = createMailer(config.smtp)
  const app = createApp({ db, pool, config, mailer })
  const server = app.listen(config.port, config.host)
  await new Promise<void>((ok, fail) => {
    server.once('listening', ok)
    server.once('error', fail)
  })
  // Build the analytics columns, precedent and benchmark lists now rather than at the first request;
  // only a failure is printed.
  void warmUp(db)

  const url = `http://${config.host}:${config.port}`
  console.log(`
\x1b[1mBacksight is running at ${url}\x1b[0m

Demo sign-ins (demo only — never use these accounts for real work):
${DEMO_USERS.map(u => `  ${u.role.padEnd(10)} ${u.email.padEnd(24)} ${demoPassword}`).join('\n')}
${created === 0 && !env.DEMO_PASSWORD ? '  (existing database: demo passwords are as they were first set; set DEMO_PASSWORD to reset them)\n' : ''}
Press Ctrl-C to stop.`)

  let stopping = false
  const stop = async () => {
    if (stopping) return
    stopping = true
    console.log('\nStopping…')
    server.closeAllConnections()
    await new Promise(r => server.close(() => r(undefined)))
    mailer.close()
    await close()
    await sink?.close()
    if (cluster) {
      step('Stopping PostgreSQL')
      cluster.stop()
    }
    process.exit(0)
  }
  process.on('SIGINT', () => void stop())
  process.on('SIGTERM', () => void stop())
}

main().catch(err => {
  console.error(`\nnpm start failed: ${err instanceof Error ? err.message : String(err)}`)
  process.exit(1)
})

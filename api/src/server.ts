import { createApp } from './app'
import { loadConfig } from './config'
import { migrateDb, openDb } from './db'
import { createMailer } from './mail/mailer'
import { startWarmUp } from './services/warm-up'

/** Starts the API (and, in production mode, the built dashboard) on HOST:PORT. */
async function main() {
  const config = loadConfig()
  const { db, pool, close } = openDb(config.databaseUrl)
  if (process.env.MIGRATE_ON_START !== 'false') await migrateDb(db)
  const mailer = createMailer(config.smtp)
  const app = createApp({ db, pool, config, mailer })
  const server = app.listen(config.port, config.host, () => {
    const addr = server.address()
    const port = typeof addr === 'object' && addr ? addr.port : config.port
    console.log(`Backsight API listening on http://${config.host}:${port}`)
    // Build the analytics columns, precedent and benchmark lists now, not at the first request
    // (/api/health says when the analytics are ready).
    startWarmUp(db)
  })
  const stop = () => {
    server.close(() => {
      mailer.close()
      void close().finally(() => process.exit(0))
    })
    setTimeout(() => process.exit(0), 5_000).unref()
  }
  process.on('SIGTERM', stop)
  process.on('SIGINT', stop)
}

main().catch(err => {
  console.error(err instanceof Error ? err.message : err)
  process.exit(1)
})

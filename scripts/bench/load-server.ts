/**
 * The server `npm run bench:load` starts in a process of its own: the real app (createApp) built
 * from the environment the way `npm start` builds it (loadConfig), with the built dashboard when
 * DASHBOARD_DIST is set. Started as `node --import tsx scripts/bench/load-server.ts`, so the
 * process id the benchmark samples is the server itself. Prints `listening <port>` once it listens;
 * SIGTERM closes it. Not a way to run the product: `npm start` is.
 */
import { createApp } from '../../api/src/app'
import { loadConfig } from '../../api/src/config'
import { openDb } from '../../api/src/db'
import { createMailer } from '../../api/src/mail/mailer'
import { startWarmUp } from '../../api/src/services/warm-up'

async function main() {
  const config = loadConfig(process.env)
  const { db, pool, close } = openDb(config.databaseUrl)
  const mailer = createMailer(config.smtp)
  const app = createApp({ db, pool, config, mailer })
  const server = app.listen(config.port, config.host)
  await new Promise<void>((ok, fail) => {
    server.once('listening', ok)
    server.once('error', fail)
  })
  const addr = server.address()
  console.log(`listening ${typeof addr === 'object' && addr ? addr.port : config.port}`)
  // As api/src/server.ts does: the warm-up runs in the background; /api/health says when the analytics are ready.
  startWarmUp(db)
  const stop = () => {
    server.closeAllConnections()
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
  console.error(err instanceof Error ? err.stack : err)
  process.exit(1)
})

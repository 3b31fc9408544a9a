/**
 * The server `npm run bench:load` starts in a process of its own: the real app (createApp) built
 * from the environment the way `npm start` builds it (loadConfig), with the built dashboard when
 * DASHBOARD_DIST is set. Started as `node --import tsx scripts/bench/load-server.ts`, so the
 * process id the benchmark samples is the server itself. Prints `listening <port>` once it listens,
 * then every second `memory <rss> <heapUsed> <arrayBuffers>` (bytes, process.memoryUsage) and after
 * each full (mark-compact) collection `gc-major <heapUsed>`: the heap the server's live objects hold,
 * which RSS (V8 keeps freed pages) does not show. Also every second `wait <loopMs> <poolWaiting>`:
 * the longest event-loop delay of that second (ms) and the most requests waiting for a database
 * connection in it (sampled every 20 ms), which tell a stall of the event loop from one of the
 * database. SIGTERM closes it. Not a way to run the product:
 * `npm start` is.
 */
import { constants, monitorEventLoopDelay, PerformanceObserver } from 'node:perf_hooks'
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
  const loop = monitorEventLoopDelay({ resolution: 10 })
  loop.enable()
  let poolWaiting = 0
  setInterval(() => (poolWaiting = Math.max(poolWaiting, pool.waitingCount)), 20).unref()
  setInterval(() => {
    const m = process.memoryUsage()
    console.log(`memory ${m.rss} ${m.heapUsed} ${m.arrayBuffers}`)
    console.log(`wait ${(loop.max / 1e6).toFixed(1)} ${poolWaiting}`)
    loop.reset()
    poolWaiting = 0
  }, 1000).unref()
  new PerformanceObserver(list => {
    for (const e of list.getEntries()) if (((e as unknown as { detail?: { kind?: number } }).detail)?.kind === constants.NODE_PERFORMANCE_GC_MAJOR) console.log(`gc-major ${process.memoryUsage().heapUsed}`)
  }).observe({ entryTypes: ['gc'] })
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

/**
 * `npm run bench:analytics` — how fast the calibration analytics answer on a large history.
 * Generates the synthetic history of `npm run bench:etl` (default 5,000 projects × 50 brace groups =
 * 250,000 braces), perturbs it deterministically so suppliers, editions, configurations, years and
 * the supplier finals vary, loads it through the ETL into a fresh database, then drives every
 * analytics endpoint of the real app (supertest against createApp) many times and prints p50/p95,
 * the Arrow-vs-JSON payload size of the points before and after gzip, and the decode times.
 * Not a test: nothing here passes or fails; the goals are printed next to the measured numbers.
 *
 * It also prints the cold cost per answer (analytics-cold.ts): 50 distinct random filter combinations
 * per endpoint computed on the loaded pairs without the answer cache, the reference computation
 * against the app's, median and p95.
 *
 * Options: BENCH_PROJECTS (default 5000), BENCH_REPEAT (warm requests per endpoint, default 100),
 * BENCH_COLD_KEYS (default 50), BENCH_REFERENCE=0 (skip the slow reference timings),
 * BENCH_COLD_ONLY=1 (stop after the cold table).
 * Uses DATABASE_URL's server when set, otherwise starts a throwaway cluster like `npm test` does.
 */
import { chmodSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { gzipSync } from 'node:zlib'
import { tableFromIPC } from 'apache-arrow'
import pg from 'pg'
import request from 'supertest'
import { createApp } from '../../api/src/app'
import { loadConfig } from '../../api/src/config'
import { migrateDb, openDb } from '../../api/src/db'
import { createMailer } from '../../api/src/mail/mailer'
import { ensureDemoUsers } from '../../api/src/services/users'
import { ARROW_STREAM_TYPE } from '../../shared/schemas/calibration'
import { expandPaths } from '../../etl/src/paths'
import { readInputs, runImport } from '../../etl/src/run'
import { ensureDatabase, startCluster } from '../lib/postgres'
import { freePort } from '../lib/ports'
import { getSizingDefaults } from '../../api/src/services/settings'
import { getCalibrationSettings } from '../../api/src/services/calibration/settings'
import { phaseData, type PhaseData } from '../../api/src/services/calibration/store'
import { startingAnswer } from '../../api/src/services/calibration/derived'
import { previousStarting } from '../../api/src/services/calibration/reference'
import { dropStartingStats } from '../../api/src/services/calibration/starting-index'
import { rng } from './synthetic'
import type { TonnageByCategory } from '../../shared/calibration'
import { coldReport, randomStartingQuery } from './analytics-cold'
import { generate, writeCsv } from './etl'
import { perturb } from './synthetic'

const PROJECTS = Number(process.env.BENCH_PROJECTS ?? 5000)
const REPEAT = Number(process.env.BENCH_REPEAT ?? 100)
const PASSWORD = 'bench-password-bench'
/** Distinct random queries per endpoint for the cold-cost table. */
const COLD_KEYS = Number(process.env.BENCH_COLD_KEYS ?? 50)


async function freshDb(adminUrl: string, name: string): Promise<string> {
  const c = new pg.Client({ connectionString: adminUrl })
  await c.connect()
  await c.query(`drop database if exists ${name} with (force)`)
  await c.query(`create database ${name}`)
  await c.end()
  return adminUrl.replace(/\/[^/]*$/, `/${name}`)
}

const pct = (xs: number[], p: number) => {
  const s = [...xs].sort((a, b) => a - b)
  return s[Math.min(s.length - 1, Math.ceil(p * s.length) - 1)]!
}
const ms = (v: number) => `${v.toFixed(1)} ms`

/**
 * GET /api/starting-factors' computation on the loaded pairs, COLD_KEYS random queries (the load
 * benchmark's kind): the app's path reading the rows (its kept group stats dropped before each
 * query), the same filters at another quantile (the kept stats, no rows read), and the code before
 * the cell layout (reference.ts previousStarting), medians and their ratios.
 */
function startingReport(d: PhaseData, settings: { minGroupSize: number; habitYears: number }) {
  const rand = rng(29)
  const queries = Array.from({ length: COLD_KEYS }, () => randomStartingQuery(d, rand))
  startingAnswer(d, queries[0]!, settings)
  previousStarting(d, queries[0]!, settings)
  const time = (f: () => unknown) => {
    const t = performance.now()
    f()
    return performance.now() - t
  }
  const rows: number[] = []
  const kept: number[] = []
  const prev: number[] = []
  for (const q of queries) {
    dropStartingStats(d)
    rows.push(time(() => startingAnswer(d, q, settings)))
    kept.push(time(() => startingAnswer(d, { ...q, quantile: q.quantile === 0.9 ? 0.95 : 0.9 }, settings)))
    prev.push(time(() => previousStarting(d, q, settings)))
  }
  const [r, k, p] = [pct(rows, 0.5), pct(kept, 0.5), pct(prev, 0.5)]
  console.log(`\nStarting factors, ${queries.length} random queries (median): before the cell layout ${ms(p)}; rows read ${ms(r)} (${(p / r).toFixed(1)}× faster); same filters, another quantile ${ms(k)} (${(p / k).toFixed(1)}×; ${(r / k).toFixed(1)}× less than reading the rows)`)
  dropStartingStats(d)
}

async function main() {
  const work = mkdtempSync(join(tmpdir(), 'backsight-bench-analytics-'))
  chmodSync(work, 0o755)
  let stop = () => {}
  let adminUrl = process.env.DATABASE_URL?.replace(/\/[^/]*$/, '/postgres')
  if (!adminUrl) {
    const cluster = startCluster({ dataDir: join(work, 'pgdata'), port: await freePort() })
    stop = cluster.stop
    adminUrl = cluster.url('postgres')
    await ensureDatabase(adminUrl, 'postgres')
  }
  let closeDb = async () => {}
  try {
    console.log(`Generating ${PROJECTS} projects (${PROJECTS * 50} braces), perturbed deterministically…`)
    writeCsv(join(work, 'csv'), perturb(generate(PROJECTS), 2026))
    const url = await freshDb(adminUrl, 'bench_analytics')
    const handle = openDb(url)
    closeDb = handle.close
    await migrateDb(handle.db)
    let t0 = performance.now()
    const summary = await runImport(handle.db, await readInputs(await expandPaths([join(work, 'csv')])), { source: 'cli' })
    console.log(`ETL (incl. the calibration_pairs refresh): ${((performance.now() - t0) / 1000).toFixed(1)} s, ${summary.loaded} projects loaded, ${summary.queued} values queued`)
    t0 = performance.now()
    await handle.pool.query('select refresh_calibration_pairs()')
    console.log(`refresh_calibration_pairs() alone: ${((performance.now() - t0) / 1000).toFixed(2)} s`)
    const { rows } = await handle.pool.query(`select count(*)::int as n from calibration_pairs where phase = 'sd'`)
    console.log(`pairs (sd): ${rows[0].n}`)

    await ensureDemoUsers(handle.db, PASSWORD)
    const config = loadConfig({ ...process.env, NODE_ENV: 'test', DATABASE_URL: url, SESSION_SECRET: 'bench-secret-bench-secret-bench-secret', PUBLIC_URL: 'http://bench.test' })
    const mailer = createMailer(config.smtp)
    const app = createApp({ db: handle.db, pool: handle.pool, config, mailer })
    const agent = request.agent(app)
    const csrf = (await agent.get('/api/auth/csrf')).body.token as string
    await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'engineer@example.com', password: PASSWORD }).expect(200)

    t0 = performance.now()
    await agent.get('/api/calibration/summary?quantity=tmax&groupBy=none').expect(200)
    console.log(`first analytics request after a data change (reads the sd pairs into memory, then answers): ${ms(performance.now() - t0)}`)

    // Cold cost per answer on the loaded pairs, many distinct keys, no answer cache (see analytics-cold.ts).
    {
      const d = await phaseData(handle.db, 'sd')
      const { rows: trows } = await handle.pool.query<{ project_id: number; stage: 'preliminary' | 'final'; category: keyof TonnageByCategory; tons: number }>(
        `select t.project_id, t.stage::text as stage, t.category::text as category, t.tons_short as tons from tonnage t`,
      )
      const tonnage = new Map<number, { preliminary: TonnageByCategory; final: TonnageByCategory }>()
      for (const r of trows) {
        const e = tonnage.get(r.project_id) ?? tonnage.set(r.project_id, { preliminary: {}, final: {} }).get(r.project_id)!
        e[r.stage][r.category] = r.tons
      }
      const settings = await getCalibrationSettings(handle.db)
      const tolerance = (await getSizingDefaults(handle.db)).stiffnessTolerance
      coldReport(d, tonnage, { keys: COLD_KEYS, tolerance, settings, reference: process.env.BENCH_REFERENCE !== '0' })
      startingReport(d, settings)
      console.log('Goal: a cold answer in a very few ms (≈300 req/s on 2 cores with 50 connections).')
      if (process.env.BENCH_COLD_ONLY) {
        mailer.close()
        return
      }
    }

    const variants = ['', '&supplier=BS-B', '&yearFrom=2012&yearTo=2018', '&configuration=inverted_v,v', '&sdc=D&codeEdition=341-16', '&coreAreaMin=4&coreAreaMax=8', '&use=office,school&storiesMin=5', '&supplier=BS-A,BS-C&yearFrom=2015']
    const endpoints: [string, (v: string) => string][] = [
      ['options', () => '/api/calibration/options'],
      ['summary', v => `/api/calibration/summary?quantity=cmax&groupBy=supplier${v}`],
      ['trend', v => `/api/calibration/trend?quantity=beta${v}`],
      ['cost', v => `/api/calibration/cost?phase=sd${v}`],
      ['misses', v => `/api/calibration/misses?quantity=cmax&limit=100${v}`],
      ['misses.csv', v => `/api/calibration/misses.csv?quantity=omega&limit=1000${v}`],
      ['starting-factors', v => `/api/starting-factors?quantile=0.9${v.replace(/&(sdc|codeEdition|use|storiesMin)=[^&]*/g, '').replace(/supplier=([^,&]*),[^&]*/, 'supplier=$1').replace(/configuration=([^,&]*),[^&]*/, 'configuration=$1')}`],
      ['points (JSON)', v => `/api/calibration/points?quantity=cmax&groupBy=supplier${v}`],
      ['points (Arrow)', v => `/api/calibration/points?quantity=cmax&groupBy=supplier${v}`],
    ]
    console.log(`\nLatency, ${variants.length} filter variants per endpoint. "cold" = first request of each variant (computed), "warm" = ${REPEAT} further requests cycling the variants (in-process cache, same data version).`)
    console.log('endpoint            cold p50    cold max    warm p50    warm p95   (all requests p95)')
    for (const [name, path] of endpoints) {
      const arrow = name.includes('Arrow')
      const get = async (p: string) => {
        const s = performance.now()
        const r = agent.get(p)
        if (arrow) r.set('Accept', ARROW_STREAM_TYPE)
        const res = await r.buffer(true).parse((x, cb) => {
          x.on('data', () => {})
          x.on('end', () => cb(null, null))
        })
        if (res.status !== 200) throw new Error(`${p} → ${res.status}`)
        return performance.now() - s
      }
      const cold: number[] = []
      for (const v of variants) cold.push(await get(path(v)))
      const warm: number[] = []
      for (let i = 0; i < REPEAT; i++) warm.push(await get(path(variants[i % variants.length]!)))
      const all = [...cold, ...warm]
      console.log(`${name.padEnd(18)} ${ms(pct(cold, 0.5)).padStart(10)} ${ms(Math.max(...cold)).padStart(11)} ${ms(pct(warm, 0.5)).padStart(11)} ${ms(pct(warm, 0.95)).padStart(11)} ${ms(pct(all, 0.95)).padStart(11)}`)
    }

    // Payload and decode of the full point set (no filter): 250,000 points at the default size.
    const full = '/api/calibration/points?quantity=cmax&groupBy=supplier'
    const raw = (r: request.Test) =>
      r.buffer(true).parse((x, cb) => {
        const chunks: Buffer[] = []
        x.on('data', (c: Buffer) => chunks.push(c))
        x.on('end', () => cb(null, Buffer.concat(chunks)))
      })
    const jsonBody = (await raw(agent.get(full).set('Accept-Encoding', 'identity'))).body as Buffer
    const arrowBody = (await raw(agent.get(full).set('Accept', ARROW_STREAM_TYPE).set('Accept-Encoding', 'identity'))).body as Buffer
    const gzJson = gzipSync(jsonBody).length
    const gzArrow = gzipSync(arrowBody).length
    const wireJson = (await raw(agent.get(full).set('Accept-Encoding', 'gzip'))).headers['content-encoding']
    const wireArrow = (await raw(agent.get(full).set('Accept', ARROW_STREAM_TYPE).set('Accept-Encoding', 'gzip'))).headers['content-encoding']
    const text = jsonBody.toString('utf8')
    const time = (f: () => void, n = 5) => {
      f()
      const xs: number[] = []
      for (let i = 0; i < n; i++) {
        const s = performance.now()
        f()
        xs.push(performance.now() - s)
      }
      return pct(xs, 0.5)
    }
    let sink = 0
    const jsonMs = time(() => {
      const o = JSON.parse(text) as { points: { final: number; projectCode: string }[] }
      sink += o.points.length
    })
    const cols = ['braceId', 'projectCode', 'projectName', 'frameLine', 'level', 'group', 'basis', 'assumed', 'final']
    const arrowMs = time(() => {
      const table = tableFromIPC(new Uint8Array(arrowBody))
      for (const c of cols) {
        const v = table.getChild(c)!
        // Numbers: the typed array itself; strings: the dictionary codes and the dictionary.
        const d = v.data[0]!
        sink += d.values.length + (d.dictionary ? d.dictionary.length : 0)
      }
    })
    const arrowFullMs = time(() => {
      const table = tableFromIPC(new Uint8Array(arrowBody))
      for (const c of cols) sink += table.getChild(c)!.toArray().length
    })
    const points = JSON.parse(text).points.length as number
    console.log(`\nPoints payload, ${points} points (quantity cmax, no filter):`)
    console.log(`  JSON  raw ${(jsonBody.length / 1e6).toFixed(2)} MB, gzip ${(gzJson / 1e6).toFixed(2)} MB (compression middleware on the wire: ${wireJson ?? 'none'})`)
    console.log(`  Arrow raw ${(arrowBody.length / 1e6).toFixed(2)} MB, gzip ${(gzArrow / 1e6).toFixed(2)} MB (compression middleware on the wire: ${wireArrow ?? 'none'})`)
    console.log(`  JSON / Arrow size: raw ${(jsonBody.length / arrowBody.length).toFixed(2)}×, gzipped ${(gzJson / gzArrow).toFixed(2)}×   (goal: ≥ 3× raw, Arrow no larger gzipped)`)
    console.log(`  decode: JSON.parse ${ms(jsonMs)}; tableFromIPC + columns (typed arrays, dictionary codes) ${ms(arrowMs)} → ${(jsonMs / arrowMs).toFixed(1)}× faster (goal ≥ 20×)`)
    console.log(`          tableFromIPC + toArray() of every column (strings decoded) ${ms(arrowFullMs)} → ${(jsonMs / arrowFullMs).toFixed(1)}×`)
    console.log('Goal: p95 < 100 ms for every analytics endpoint.')
    if (sink < 0) console.log(sink)
    mailer.close()
  } finally {
    await closeDb()
    stop()
    if (!process.env.BENCH_KEEP) rmSync(work, { recursive: true, force: true })
    else console.log('kept', work)
  }
}

main().then(
  () => process.exit(0),
  err => {
    console.error(err)
    process.exit(1)
  },
)

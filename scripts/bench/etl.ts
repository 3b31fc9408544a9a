/**
 * `npm run bench:etl` — how the full ETL (read, validate, load) compares with raw COPY.
 * Generates a synthetic history (default 5,000 projects × 50 brace groups = 250,000 braces, two
 * value snapshots each) as CSV files and as Arrow files, loads each through the ETL into an empty
 * database, and loads the same CSV rows with psql's \copy into plain staging tables. Prints the
 * times and the ratios measured in this run. Not a test: nothing here passes or fails.
 *
 * Options: BENCH_PROJECTS (default 5000). Uses DATABASE_URL's server when set, otherwise starts a
 * throwaway cluster like `npm test` does.
 */
import { execFileSync } from 'node:child_process'
import { chmodSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { tableFromArrays, tableToIPC } from 'apache-arrow'
import { stringify } from 'csv-stringify/sync'
import pg from 'pg'
import { migrateDb, openDb } from '../../api/src/db'
import { expandPaths } from '../../etl/src/paths'
import { readInputs, runImport } from '../../etl/src/run'
import { ensureDatabase, startCluster } from '../lib/postgres'
import { freePort } from '../lib/ports'

const PROJECTS = Number(process.env.BENCH_PROJECTS ?? 5000)
const FRAMES = 5
const STORIES = 10

type Row = Record<string, string | number>

/** A synthetic history of `projects` projects (5 frame lines × 10 stories each), in import-format rows. */
export function generate(PROJECTS: number): Record<string, Row[]> {
  const t: Record<string, Row[]> = { suppliers: [{ supplier_code: 'BS-A', display_name: 'Bench supplier A' }], projects: [], frames: [], levels: [], braces: [], brace_values: [], tonnage: [] }
  for (let p = 0; p < PROJECTS; p++) {
    const code = `BENCH-${String(p).padStart(5, '0')}`
    t.projects!.push({ project_code: code, name: `Bench building ${p}`, stories: STORIES, floor_area: 50_000 + p, year_designed: 2008 + (p % 19), supplier_code: 'BS-A', sdc: 'D', phase_reached: 'complete' })
    for (let f = 0; f < FRAMES; f++) {
      const line = String.fromCharCode(65 + f)
      t.frames!.push({ project_code: code, frame_line: line, configuration: 'inverted_v', bays: 1, bay_width: 30 })
      for (let s = 1; s <= STORIES; s++) {
        const level = `L${s + 1}`
        const shear = 40 * (STORIES - s + 1)
        t.levels!.push({ project_code: code, frame_line: line, level, level_index: s, story_height: 13, story_shear: shear })
        // derived: statics — inverted-V, 30 ft bay, 13 ft story: θ = atan(26/30) = 40.914°, Lwp = 19.849 ft
        const pu = shear / (2 * Math.cos((40.914 * Math.PI) / 180))
        t.braces!.push({ project_code: code, frame_line: line, level, brace_count: 2, angle_deg: 40.914, work_point_length: 19.849, required_strength: Number(pu.toFixed(2)) })
        const req = pu / (0.9 * 38)
        const core = Math.ceil(req * 4) / 4
        t.brace_values!.push({ project_code: code, frame_line: line, level, phase: 'sd', required_core_area: Number(req.toFixed(3)), core_area: core, fysc: 38, fysc_basis: 'yield_range', fysc_max: 46, beta: 1.1, omega: 1.4, stiffness_factor: 1.4, yield_length_ratio: 0.6 })
        t.brace_values!.push({ project_code: code, frame_line: line, level, phase: 'coupon', core_area: core, fysc: 42, fysc_basis: 'coupon', beta: 1.12, omega: 1.45, factor_drift_multiple: 2, stiffness_factor: 1.38, yield_length_ratio: 0.61, governing: 'yes' })
      }
    }
    t.tonnage!.push({ project_code: code, stage: 'final', category: 'lateral_total', weight: 120 })
  }
  return t
}

const headersOf = (rows: Row[]) => [...new Set(rows.flatMap(r => Object.keys(r)))]

export function writeCsv(dir: string, tables: Record<string, Row[]>) {
  mkdirSync(dir, { recursive: true })
  writeFileSync(join(dir, 'about.csv'), 'key,value\nunits,us\n')
  for (const [name, rows] of Object.entries(tables)) {
    const h = headersOf(rows)
    writeFileSync(join(dir, `${name}.csv`), stringify([h, ...rows.map(r => h.map(k => r[k] ?? ''))]))
  }
}

function writeArrow(dir: string, tables: Record<string, Row[]>) {
  mkdirSync(dir, { recursive: true })
  for (const [name, rows] of Object.entries(tables)) {
    const h = headersOf(rows)
    const cols: Record<string, (string | number | null)[]> = {}
    for (const k of h) {
      const vals = rows.map(r => r[k] ?? null)
      cols[k] = vals.every(v => v === null || typeof v === 'number') ? (vals as (number | null)[]) : vals.map(v => (v === null ? null : String(v)))
    }
    const table = tableFromArrays(cols as Record<string, number[]>)
    table.schema.metadata.set('table', name)
    table.schema.metadata.set('units', 'us')
    writeFileSync(join(dir, `${name}.arrow`), tableToIPC(table, 'file'))
  }
}

async function freshDb(adminUrl: string, name: string): Promise<string> {
  const c = new pg.Client({ connectionString: adminUrl })
  await c.connect()
  await c.query(`drop database if exists ${name} with (force)`)
  await c.query(`create database ${name}`)
  await c.end()
  return adminUrl.replace(/\/[^/]*$/, `/${name}`)
}

async function etl(url: string, dir: string): Promise<number> {
  const { db, close } = openDb(url)
  await migrateDb(db)
  const inputs = await readInputs(await expandPaths([dir]))
  const t0 = performance.now()
  const summary = await runImport(db, inputs, { source: 'cli' })
  const ms = performance.now() - t0
  await close()
  if (summary.loaded !== PROJECTS) throw new Error(`ETL loaded ${summary.loaded} of ${PROJECTS}: ${summary.problems.slice(0, 3).map(p => p.message).join('; ')}`)
  return ms
}

function rawCopy(url: string, dir: string, tables: Record<string, Row[]>): number {
  const ddl = Object.entries(tables)
    .map(([name, rows]) => `create table raw_${name} (${headersOf(rows).map(h => `"${h}" text`).join(', ')});`)
    .join('\n')
  execFileSync('psql', [url, '-q', '-v', 'ON_ERROR_STOP=1', '-c', ddl])
  const copies = Object.keys(tables).map(name => `\\copy raw_${name} from '${join(dir, `${name}.csv`)}' with (format csv, header true)`)
  const t0 = performance.now()
  execFileSync('psql', [url, '-q', '-v', 'ON_ERROR_STOP=1', ...copies.flatMap(c => ['-c', c])])
  return performance.now() - t0
}

const LOADED_TABLES = ['suppliers', 'projects', 'frames', 'levels', 'braces', 'brace_snapshots', 'tonnage'] as const

/**
 * The floor the schema itself sets: the rows the ETL stored, dumped and loaded again with psql's
 * \copy into a fresh, migrated database (same constraints, indexes and foreign keys), in one
 * transaction. What the ETL costs beyond this is reading, validating and encoding.
 */
async function schemaCopy(etlUrl: string, freshUrl: string, dir: string): Promise<number> {
  const { db, close } = openDb(freshUrl)
  await migrateDb(db)
  await close()
  mkdirSync(dir, { recursive: true })
  chmodSync(dir, 0o777)
  for (const t of LOADED_TABLES) execFileSync('psql', [etlUrl, '-q', '-v', 'ON_ERROR_STOP=1', '-c', `\\copy ${t} to '${join(dir, `${t}.csv`)}' with (format csv)`])
  const script = join(dir, 'load.sql')
  writeFileSync(script, ['begin;', ...LOADED_TABLES.map(t => `\\copy ${t} from '${join(dir, `${t}.csv`)}' with (format csv)`), 'commit;'].join('\n'))
  const t0 = performance.now()
  execFileSync('psql', [freshUrl, '-q', '-v', 'ON_ERROR_STOP=1', '-f', script])
  return performance.now() - t0
}

async function main() {
  const work = mkdtempSync(join(tmpdir(), 'backsight-bench-'))
  chmodSync(work, 0o755)
  let stop = () => {}
  let adminUrl = process.env.DATABASE_URL?.replace(/\/[^/]*$/, '/postgres')
  if (!adminUrl) {
    const cluster = startCluster({ dataDir: join(work, 'pgdata'), port: await freePort() })
    stop = cluster.stop
    adminUrl = cluster.url('postgres')
    await ensureDatabase(adminUrl, 'postgres')
  }
  try {
    console.log(`Generating ${PROJECTS} projects × ${FRAMES * STORIES} brace groups (${PROJECTS * FRAMES * STORIES} braces, ${PROJECTS * FRAMES * STORIES * 2} snapshots)…`)
    const tables = generate(PROJECTS)
    writeCsv(join(work, 'csv'), tables)
    writeArrow(join(work, 'arrow'), tables)
    const rows = Object.values(tables).reduce((n, r) => n + r.length, 0)

    const copyMs = rawCopy(await freshDb(adminUrl, 'bench_copy'), join(work, 'csv'), tables)
    const csvUrl = await freshDb(adminUrl, 'bench_csv')
    const csvMs = await etl(csvUrl, join(work, 'csv'))
    const schemaMs = await schemaCopy(csvUrl, await freshDb(adminUrl, 'bench_schema'), join(work, 'dump'))
    const arrowMs = await etl(await freshDb(adminUrl, 'bench_arrow'), join(work, 'arrow'))
    const s = (ms: number) => `${(ms / 1000).toFixed(2)} s`
    console.log(`\nrows in the files: ${rows}`)
    console.log(`raw COPY (psql \\copy, text staging tables): ${s(copyMs)}`)
    console.log(`COPY of the stored rows into the real schema: ${s(schemaMs)}   ratio to COPY ${(schemaMs / copyMs).toFixed(2)}×  (constraints, indexes, foreign keys)`)
    console.log(`ETL from CSV   (read + validate + load):     ${s(csvMs)}   ratio to COPY ${(csvMs / copyMs).toFixed(2)}×   to the schema's COPY ${(csvMs / schemaMs).toFixed(2)}×`)
    console.log(`ETL from Arrow (read + validate + load):     ${s(arrowMs)}   ratio to COPY ${(arrowMs / copyMs).toFixed(2)}×   to the schema's COPY ${(arrowMs / schemaMs).toFixed(2)}×`)
    console.log('Goal: the full ETL within 3× of raw COPY.')
  } finally {
    stop()
    if (!process.env.BENCH_KEEP) rmSync(work, { recursive: true, force: true })
    else console.log('kept', work)
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  main().catch(err => {
    console.error(err)
    process.exit(1)
  })
}

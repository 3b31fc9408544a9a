/**
 * `npm run bench:load` — the production server under a mixed load of signed-in users.
 * Seeds the synthetic history of `npm run bench:etl` (default 5,000 projects × 50 brace groups =
 * 250,000 braces), perturbed deterministically like `npm run bench:analytics` so the statistics are
 * not degenerate, through the real ETL into a fresh database; starts the app in production mode as a
 * process of its own and waits for its warm-up; signs in 50 sessions (principal, engineer, business
 * development) and drives the analytics, precedent and benchmark endpoints with autocannon from this
 * process in two phases of 60 s, each with an upload import (a modest history file of new projects
 * through POST /api/imports) half way through:
 *   - paced: each session sends one request a second (its next waits for its answer and its turn),
 *     as people clicking through the screens do; the latency is what a user waits;
 *   - saturation: each session sends its next request as soon as its answer arrives, so the server
 *     runs flat out; the requests/s is the ceiling, and the latency mostly the queue in front of it
 *     (Little's law: 50 sessions ÷ throughput).
 * Samples the server's RSS from /proc every second. Prints requests/s, p50/p95/p99 latency overall
 * and per endpoint (with the mean response size on the wire), errors, and the server's memory at
 * start, peak and end. Not a test: nothing here passes or fails; the goals are printed next to the
 * measured numbers.
 *
 * Options: BENCH_PROJECTS (default 5000), BENCH_CONNECTIONS (sessions, 50), BENCH_DURATION (s per
 * phase, 60), BENCH_PHASES (paced,saturation), BENCH_PACE (requests/s per session when paced, 1),
 * BENCH_IMPORT_PROJECTS (projects in each uploaded file, 200; 0 = no import), BENCH_TIMEOUT (s a
 * response may take before it counts as a timeout error, 30), BENCH_KEEP=1 keeps the work folder
 * (server log, upload files), BENCH_CPU_PROF=1 has the server write a V8 CPU profile there (implies
 * BENCH_KEEP), BENCH_SAMPLES=path writes each phase's requests (endpoint, second, latency, status, from
 * the version before or not) to path.1.json, path.2.json…, BENCH_ONLY=summary,precedents drives only those endpoints (names as in the mix),
 * BENCH_REUSE=1 keeps the seeded database between runs when it still holds exactly the seeded
 * history (with DATABASE_URL, so the cluster outlives the run; an upload makes the next run seed
 * again). Uses DATABASE_URL's server when set, otherwise starts a throwaway cluster like `npm test`
 * does. Traffic goes to 127.0.0.1 only.
 */
import { spawn, type ChildProcess } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { chmodSync, createWriteStream, existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { dirname, join, resolve } from 'node:path'
import { createInterface } from 'node:readline'
import autocannon, { type Instance, type Options, type Request as CannonRequest, type Result } from 'autocannon'
import pg from 'pg'
import { migrateDb, openDb } from '../../api/src/db'
import { ensureDemoUsers } from '../../api/src/services/users'
import { ARROW_STREAM_TYPE } from '../../shared/schemas/calibration'
import { expandPaths } from '../../etl/src/paths'
import { DATA_STALE_HEADER } from '../../shared/schemas/freshness'
import { readInputs, runImport } from '../../etl/src/run'
import { startMailSink, type MailSink } from '../fakes/mail-sink'
import { ensureDatabase, startCluster } from '../lib/postgres'
import { freePort } from '../lib/ports'
import { generate, writeCsv } from './etl'
import { CONFIGS, perturb, rng, SUPPLIERS } from './synthetic'

const ROOT = resolve(import.meta.dirname, '../..')
const PROJECTS = Number(process.env.BENCH_PROJECTS ?? 5000)
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 50)
const DURATION = Number(process.env.BENCH_DURATION ?? 60)
const IMPORT_PROJECTS = Number(process.env.BENCH_IMPORT_PROJECTS ?? 200)
/** Seconds before autocannon gives up on a response (counted as a timeout error). */
const TIMEOUT = Number(process.env.BENCH_TIMEOUT ?? 30)
const PASSWORD = 'bench-password-bench'
const ONLY = process.env.BENCH_ONLY?.split(',').map(k => k.trim()).filter(Boolean)
const REUSE = process.env.BENCH_REUSE === '1'

/**
 * A phase of the run. `pace`: requests per second each session sends (it waits for its answer and
 * then for its next turn, as a user does between clicks); 0: no pause at all, so the server runs
 * flat out and the latency mostly measures the queue (Little's law: sessions ÷ throughput).
 */
interface Phase {
  pace: number
}
const PACE = Number(process.env.BENCH_PACE ?? 1)
const PHASES: Phase[] = (process.env.BENCH_PHASES ?? 'paced,saturation').split(',').map(p => {
  if (p.trim() === 'paced') return { pace: PACE }
  if (p.trim() === 'saturation') return { pace: 0 }
  throw new Error(`BENCH_PHASES: "${p}" is neither paced nor saturation`)
})


/**
 * The history file uploaded during the run: `n` new projects (codes and names of their own, so they
 * are neither updates nor probable duplicates of seeded ones) as one JSON document.
 */
function uploadDocument(n: number, prefix: string): string {
  const t = perturb(generate(n), 7331)
  for (const rows of Object.values(t)) {
    for (const r of rows) if (typeof r.project_code === 'string') r.project_code = r.project_code.replace('BENCH-', `${prefix}-`)
  }
  for (const p of t.projects!) p.name = String(p.name).replace('Bench building', 'Uploaded building')
  return JSON.stringify({ format: 'backsight-history', version: 1, units: 'us', ...t })
}

/** The bench database's project count, or undefined when it does not exist or is not migrated. */
async function seededProjects(adminUrl: string, name: string): Promise<number | undefined> {
  const c = new pg.Client({ connectionString: adminUrl.replace(/\/[^/]*$/, `/${name}`) })
  try {
    await c.connect()
    return Number((await c.query<{ n: string }>('select count(*)::text as n from projects')).rows[0]!.n)
  } catch {
    return undefined
  } finally {
    await c.end().catch(() => {})
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

const pct = (xs: number[], p: number) => {
  if (!xs.length) return NaN
  const s = [...xs].sort((a, b) => a - b)
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil(p * s.length) - 1))]!
}
const median = (xs: number[]) => pct(xs, 0.5)
const ms = (v: number) => (Number.isFinite(v) ? `${v.toFixed(1)} ms` : '—')
const size = (b: number) => (b >= 1e6 ? `${(b / 1e6).toFixed(2)} MB` : `${(b / 1e3).toFixed(1)} kB`)
const mb = (kb: number) => (Number.isFinite(kb) ? `${(kb / 1024).toFixed(0)} MB` : '—')

// ── server process ─────────────────────────────────────────────────────────────────────────────

interface Server {
  child: ChildProcess
  port: number
  /** The server's own memory readings (load-server.ts), `at` in performance.now() ms of this process. */
  memory: MemorySample[]
  /** Heap used right after each full collection: what the live objects hold. */
  fullGcs: { at: number; heap: number }[]
  /** Per second: the longest event-loop delay (ms) and the most requests waiting for a database connection. */
  waits: { at: number; loopMs: number; poolWaiting: number }[]
  stop: () => Promise<void>
}

interface MemorySample {
  at: number
  heap: number
  arrayBuffers: number
}

async function startServer(env: NodeJS.ProcessEnv, logFile: string): Promise<Server> {
  const port = await freePort()
  const log = createWriteStream(logFile)
  // node --import tsx (not npx tsx, which runs the server in a grandchild): this pid is the server.
  // BENCH_CPU_PROF=1: the server writes a V8 CPU profile (.cpuprofile) into the work folder when it stops.
  const profile = process.env.BENCH_CPU_PROF ? ['--cpu-prof', `--cpu-prof-dir=${dirname(logFile)}`] : []
  const child = spawn(process.execPath, [...profile, '--import', 'tsx', join(ROOT, 'scripts/bench/load-server.ts')], {
    cwd: ROOT,
    env: { ...env, PORT: String(port) },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  child.stderr!.pipe(log, { end: false })
  const memory: MemorySample[] = []
  const fullGcs: Server['fullGcs'] = []
  const waits: Server['waits'] = []
  const listening = new Promise<void>((ok, fail) => {
    const lines = createInterface({ input: child.stdout! })
    lines.on('line', line => {
      const [what, ...values] = line.split(' ')
      const n = values.map(Number)
      if (what === 'memory') return void memory.push({ at: performance.now(), heap: n[1]! / 1024, arrayBuffers: n[2]! / 1024 })
      if (what === 'wait') return void waits.push({ at: performance.now(), loopMs: n[0]!, poolWaiting: n[1]! })
      if (what === 'gc-major') return void fullGcs.push({ at: performance.now(), heap: n[0]! / 1024 })
      log.write(`${line}\n`)
      if (line.startsWith('listening ')) ok()
    })
    child.once('exit', code => fail(new Error(`the server exited (code ${code}) before listening; see ${logFile}:\n${readFileSync(logFile, 'utf8').slice(-2000)}`)))
  })
  const timer = setTimeout(() => child.kill('SIGTERM'), 60_000)
  await listening.finally(() => clearTimeout(timer))
  return {
    child,
    port,
    memory,
    fullGcs,
    waits,
    stop: () =>
      new Promise<void>(done => {
        if (child.exitCode !== null || child.signalCode !== null) return done()
        const force = setTimeout(() => child.kill('SIGKILL'), 10_000)
        child.once('exit', () => {
          clearTimeout(force)
          log.end()
          done()
        })
        child.kill('SIGTERM')
      }),
  }
}

/** VmRSS and VmHWM (peak RSS as the kernel counts it) of a process, in kB. */
function rssOf(pid: number): { rss: number; hwm: number } | undefined {
  try {
    const status = readFileSync(`/proc/${pid}/status`, 'utf8')
    const kb = (key: string) => Number(new RegExp(`^${key}:\\s+(\\d+) kB`, 'm').exec(status)?.[1] ?? NaN)
    return { rss: kb('VmRSS'), hwm: kb('VmHWM') }
  } catch {
    return undefined
  }
}

// ── sessions ───────────────────────────────────────────────────────────────────────────────────

interface Session {
  role: 'principal' | 'engineer' | 'bd'
  cookie: string
  csrf: string
}

const cookieOf = (res: Response) =>
  res.headers
    .getSetCookie()
    .map(c => c.split(';')[0]!)
    .find(c => c.startsWith('backsight.sid='))

async function signIn(base: string, role: Session['role']): Promise<Session> {
  const first = await fetch(`${base}/api/auth/csrf`)
  const csrf = ((await first.json()) as { token: string }).token
  const anonymous = cookieOf(first)
  if (!anonymous) throw new Error('GET /api/auth/csrf set no session cookie')
  const res = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { cookie: anonymous, 'x-csrf-token': csrf, 'content-type': 'application/json' },
    body: JSON.stringify({ email: `${role}@example.com`, password: PASSWORD }),
  })
  if (res.status !== 200) throw new Error(`sign-in as ${role} → ${res.status} ${await res.text()}`)
  await res.arrayBuffer()
  return { role, cookie: cookieOf(res) ?? anonymous, csrf }
}

// ── the request mix ────────────────────────────────────────────────────────────────────────────

type Kind = 'summary' | 'trend' | 'cost' | 'misses' | 'options' | 'points' | 'starting-factors' | 'precedents' | 'benchmarks' | 'proposal'
/** Relative share of each endpoint in the mix. */
const WEIGHTS: Record<Kind, number> = { summary: 3, trend: 2, cost: 1, misses: 2, options: 1, points: 1, 'starting-factors': 2, precedents: 3, benchmarks: 2, proposal: 2 }
const ENDPOINT: Record<Kind, string> = {
  summary: 'GET /api/calibration/summary',
  trend: 'GET /api/calibration/trend',
  cost: 'GET /api/calibration/cost',
  misses: 'GET /api/calibration/misses',
  options: 'GET /api/calibration/options',
  points: 'GET /api/calibration/points (Arrow)',
  'starting-factors': 'GET /api/starting-factors',
  precedents: 'POST /api/precedents/search',
  benchmarks: 'GET /api/benchmarks',
  proposal: 'POST /api/benchmarks/proposal',
}
const ANALYST_KINDS = new Set<Kind>(['summary', 'trend', 'cost', 'misses', 'options', 'points', 'starting-factors', 'precedents'])

const QUANTITIES = ['beta', 'omega', 'overstrength', 'stiffness', 'coreArea', 'tmax', 'cmax']
const GROUPINGS = ['supplier', 'configuration', 'yearBand', 'office', 'none']
const FILTERS = ['', '&supplier=BS-B', '&yearFrom=2012&yearTo=2018', '&configuration=inverted_v,v', '&sdc=D&codeEdition=341-16', '&coreAreaMin=4&coreAreaMax=8', '&use=office,school&storiesMin=5', '&supplier=BS-A,BS-C&yearFrom=2015']
const BENCH_USES = ['office', 'laboratory', 'healthcare', 'school', 'residential', 'parking']

interface Built {
  method: string
  path: string
  body?: unknown
  accept?: string
}

/** One request of `kind`, its parameters drawn from `rand` (deterministic for a given sequence). */
function build(kind: Kind, rand: () => number): Built {
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)]!
  switch (kind) {
    case 'summary':
      return { method: 'GET', path: `/api/calibration/summary?quantity=${pick(QUANTITIES)}&groupBy=${pick(GROUPINGS)}${pick(FILTERS)}` }
    case 'trend':
      return { method: 'GET', path: `/api/calibration/trend?quantity=${pick(QUANTITIES)}${pick(FILTERS)}` }
    case 'cost':
      return { method: 'GET', path: `/api/calibration/cost?phase=sd${pick(FILTERS)}` }
    case 'misses':
      return { method: 'GET', path: `/api/calibration/misses?quantity=${pick(QUANTITIES)}&limit=${pick([25, 100])}&sort=${pick(['ratio', 'project', 'year', 'supplier'])}${pick(FILTERS)}` }
    case 'options':
      return { method: 'GET', path: '/api/calibration/options' }
    case 'points':
      // The dashboard asks for points as Arrow; filtered sets keep each answer to a share of the 250,000.
      return { method: 'GET', path: `/api/calibration/points?quantity=${pick(['cmax', 'tmax', 'beta'])}&groupBy=${pick(GROUPINGS)}${pick(FILTERS.slice(1))}`, accept: ARROW_STREAM_TYPE }
    case 'starting-factors': {
      const q = [`quantile=${pick([0.5, 0.75, 0.9, 0.95])}`]
      if (rand() < 0.7) q.push(`supplier=${pick(SUPPLIERS)}`)
      if (rand() < 0.5) q.push(`configuration=${pick(CONFIGS)}`)
      if (rand() < 0.4) q.push(`coreAreaMin=${pick([2, 4])}&coreAreaMax=${pick([8, 12])}`)
      if (rand() < 0.3) q.push(`yearFrom=${pick([2010, 2014, 2018])}`)
      return { method: 'GET', path: `/api/starting-factors?${q.join('&')}` }
    }
    case 'precedents': {
      const d: Record<string, unknown> = { storyShear: 100 + Math.round(rand() * 40) * 10 }
      if (rand() < 0.8) d.stories = 4 + Math.floor(rand() * 12)
      if (rand() < 0.5) d.storyHeight = pick([12, 13, 14, 15])
      if (rand() < 0.5) d.bayWidth = pick([25, 30, 35])
      if (rand() < 0.7) d.configuration = pick(CONFIGS)
      if (rand() < 0.5) d.sdc = pick(['C', 'D', 'E'])
      if (rand() < 0.4) d.buildingUse = pick(BENCH_USES)
      if (rand() < 0.4) d.supplier = pick(SUPPLIERS)
      const body: Record<string, unknown> = { description: d, limit: pick([5, 10, 20]) }
      if (rand() < 0.2) body.weights = { storyShear: 5, configuration: 1 }
      return { method: 'POST', path: '/api/precedents/search', body }
    }
    case 'benchmarks': {
      const q = [`groupBy=${pick(['use', 'heightBand', 'sdc', 'region', 'years'])}`, `units=${pick(['us', 'si'])}`]
      if (rand() < 0.4) q.push(`yearFrom=${pick([2008, 2012, 2016])}&yearTo=${pick([2020, 2026])}`)
      if (rand() < 0.3) q.push(`use=${pick(BENCH_USES)}`)
      if (rand() < 0.3) q.push(`sdc=${pick(['C', 'D', 'E'])}`)
      return { method: 'GET', path: `/api/benchmarks?${q.join('&')}` }
    }
    case 'proposal': {
      const body: Record<string, unknown> = { use: pick(BENCH_USES), stories: 3 + Math.floor(rand() * 15), floorArea: 20_000 + Math.round(rand() * 180) * 1000 }
      if (rand() < 0.5) body.sdc = pick(['C', 'D', 'E'])
      if (rand() < 0.2) body.units = 'si'
      return { method: 'POST', path: '/api/benchmarks/proposal', body }
    }
  }
}

interface Sample {
  kind: Kind
  at: number
  ms: number
  status: number
  /** Bytes of the response on the wire, headers included (compressed when the server gzipped it). */
  bytes: number
  /** Answered from the data version before the newest, while the newest was built (Backsight-Data-Stale). */
  stale: boolean
}

interface RssSample {
  at: number
  rss: number
  hwm: number
}

interface PhaseContext {
  base: string
  analysts: Session[]
  bizdev: Session[]
  uploader: Session
  mix: [Kind, number][]
  /** The server's RSS, sampled every second from `benchStart` on. */
  rss: RssSample[]
  benchStart: number
  server: Server
}

interface PhaseOutcome {
  label: string
  rate: number
  p50: number
  p95: number
  p99: number
  errors: number
  rssFirst: number
  rssLast: number
  /** Heap used after the phase's last full collection, and when (s into the phase); NaN if none ran. */
  liveHeap: number
  liveHeapAt: number
  /** Median array-buffer memory (the analytics columns, Arrow answers) over the phase's last 10 s. */
  arrayBuffers: number
}

let samplesWritten = 0

/** One phase of the load: the mix for DURATION seconds, an upload half way through, and its report. */
async function runPhase(ctx: PhaseContext, phase: Phase, upload: string): Promise<PhaseOutcome> {
  const { base, analysts, bizdev, uploader, mix, rss, benchStart, server } = ctx
  const label = phase.pace ? `paced (${phase.pace} request/s per session)` : 'saturation (no pause between requests)'
  console.log(`\n═══ ${label} ═══`)
  const runStart = performance.now()
  const phaseAt = (runStart - benchStart) / 1000
  const schedule: Kind[] = []
  for (const [k, w] of mix) for (let i = 0; i < w; i++) schedule.push(k)
  const shuffle = rng(99)
  for (let i = schedule.length - 1; i > 0; i--) {
    const j = Math.floor(shuffle() * (i + 1))
    ;[schedule[i], schedule[j]] = [schedule[j]!, schedule[i]!]
  }
  const rand = rng(4242)
  let seq = 0
  let nAnalyst = 0
  let nBiz = 0
  const samples: Sample[] = []
  const failures = new Map<string, number>()
  // The server's readings covering phase second t (each covers the second before it arrives).
  const waitsIn = (t: number) => {
    const ws = server.waits.filter(w => w.at - runStart > t * 1000 && w.at - runStart < (t + 2) * 1000)
    return ws.length ? `${ms(Math.max(...ws.map(w => w.loopMs)))}, ${Math.max(...ws.map(w => w.poolWaiting))}` : '—'
  }
  const requests: CannonRequest[] = [
    {
      setupRequest: (req, context) => {
        const kind = schedule[seq++ % schedule.length]!
        const b = build(kind, rand)
        const s = ANALYST_KINDS.has(kind) ? analysts[nAnalyst++ % analysts.length]! : bizdev[nBiz++ % bizdev.length]!
        const headers: Record<string, string> = { cookie: s.cookie, 'accept-encoding': 'gzip', accept: b.accept ?? 'application/json' }
        if (b.method !== 'GET') Object.assign(headers, { 'x-csrf-token': s.csrf, 'content-type': 'application/json' })
        // Built right before it is written (autocannon's request iterator), so t0 is the send time.
        context.kind = kind
        context.path = b.path
        context.t0 = performance.now()
        return { ...req, method: b.method, path: b.path, headers, body: b.body === undefined ? undefined : JSON.stringify(b.body) }
      },
      onResponse: (status, body, context, headers) => {
        const now = performance.now()
        const stale = Object.keys(headers).some(h => h.toLowerCase() === DATA_STALE_HEADER.toLowerCase())
        samples.push({ kind: context.kind as Kind, at: (now - runStart) / 1000, ms: now - (context.t0 as number), status, bytes: 0, stale })
        if (status < 200 || status >= 300) {
          const key = `${status} ${context.path}: ${body.slice(0, 160)}`
          failures.set(key, (failures.get(key) ?? 0) + 1)
        }
      },
    },
  ]

  // The concurrent import: half way through, an engineer uploads a history file.
  const imp: { uploadedAt?: number; acceptedMs?: number; finishedAt?: number; status?: string; loaded?: number; error?: string } = {}
  let importDone: Promise<void> = Promise.resolve()
  const importTimer = upload
    ? setTimeout(() => {
        importDone = (async () => {
          imp.uploadedAt = (performance.now() - runStart) / 1000
          const form = new FormData()
          form.append('file', new Blob([upload], { type: 'application/json' }), 'bench-upload.json')
          const s = performance.now()
          const res = await fetch(`${base}/api/imports`, { method: 'POST', headers: { cookie: uploader.cookie, 'x-csrf-token': uploader.csrf }, body: form })
          imp.acceptedMs = performance.now() - s
          const run = (await res.json()) as { id: number; status: string }
          if (res.status !== 202) throw new Error(`POST /api/imports → ${res.status} ${JSON.stringify(run)}`)
          // Poll the run until its loader process is done (bounded: 10 minutes).
          for (let i = 0; i < 600; i++) {
            await new Promise(r => setTimeout(r, 1000))
            const r = await fetch(`${base}/api/imports/${run.id}`, { headers: { cookie: uploader.cookie } })
            const { run: now } = (await r.json()) as { run: { status: string; loaded: number; error: string | null } }
            if (now.status === 'finished' || now.status === 'failed') {
              imp.finishedAt = (performance.now() - runStart) / 1000
              imp.status = now.error ? `${now.status} (${now.error.slice(0, 200)})` : now.status
              imp.loaded = now.loaded
              return
            }
          }
          imp.status = 'still running after 10 minutes'
        })().catch(err => {
          imp.error = err instanceof Error ? err.message : String(err)
        })
      }, (DURATION * 1000) / 2)
    : undefined

  console.log(`Driving ${CONNECTIONS} sessions for ${DURATION} s${phase.pace ? `, each sending ${phase.pace} request/s (its next request waits for its answer and for its turn)` : ', each sending its next request as soon as the answer arrives'}${upload ? `, uploading ${IMPORT_PROJECTS} projects (${(upload.length / 1e6).toFixed(1)} MB JSON) at ${DURATION / 2} s` : ''}…`)
  // Paced: one autocannon instance (one connection, connectionRate) per session, their starts
  // spread over one pacing interval so the sessions' turns do not all fall on the same instant.
  // Saturation: one instance with every connection.
  const drive = (opts: Omit<Options, 'url'>): Instance => {
    const cannon = autocannon({ url: base, timeout: TIMEOUT, requests, ...opts })
    // autocannon emits 'response' (with the bytes read) right after onResponse for the same response.
    cannon.on('response', (_client: unknown, _status: number, resBytes: number) => {
      const last = samples[samples.length - 1]
      if (last) last.bytes = resBytes
    })
    return cannon
  }
  const pace = phase.pace
  const results = await Promise.all(
    pace
      ? Array.from({ length: CONNECTIONS }, (_, i) => {
          const delay = i / (CONNECTIONS * pace)
          return new Promise<Result>((ok, fail) => setTimeout(() => drive({ connections: 1, connectionRate: pace, duration: DURATION - delay }).then(ok, fail), 1000 * delay))
        })
      : [drive({ connections: CONNECTIONS, duration: DURATION })],
  )
  const runEnd = (performance.now() - runStart) / 1000
  clearTimeout(importTimer)
  // The import, if still running, is in a loader process of its own; wait for it before the next phase.
  await importDone
  if (process.env.BENCH_SAMPLES) writeFileSync(`${process.env.BENCH_SAMPLES}.${++samplesWritten}.json`, JSON.stringify({ phase: label, import: imp, samples }))
  const sum = (f: (r: (typeof results)[number]) => number) => results.reduce((a, r) => a + f(r), 0)
  const result = {
    duration: Math.max(...results.map(r => r.duration)),
    non2xx: sum(r => r.non2xx),
    errors: sum(r => r.errors),
    timeouts: sum(r => r.timeouts),
    total: sum(r => r.requests.total),
    statusCodeStats: results.reduce<Record<string, number>>((acc, r) => {
      for (const [c, v] of Object.entries(r.statusCodeStats)) acc[c] = (acc[c] ?? 0) + v.count
      return acc
    }, {}),
  }

  // 6. Report.
  const all = samples.map(s => s.ms)
  const errorsNon2xx = result.non2xx
  console.log(`\nLoad: ${CONNECTIONS} sessions, ${result.duration.toFixed(1)} s, mix ${mix.map(([k, w]) => `${k} ${w}`).join(', ')}`)
  console.log(`requests: ${result.total} (${(result.total / runEnd).toFixed(1)} req/s overall${phase.pace ? `; offered ${(CONNECTIONS * phase.pace).toFixed(0)} req/s at most` : ''})`)
  console.log(`latency (all requests, measured per request here): p50 ${ms(pct(all, 0.5))}  p95 ${ms(pct(all, 0.95))}  p99 ${ms(pct(all, 0.99))}  max ${ms(Math.max(...all))}`)
  console.log(`errors: ${errorsNon2xx + result.errors} (non-2xx ${errorsNon2xx}, socket errors ${result.errors - result.timeouts}, timeouts after ${TIMEOUT} s ${result.timeouts}; autocannon counts a timeout as an error); responses slower than 10 s ${all.filter(v => v > 10_000).length}; status codes ${Object.entries(result.statusCodeStats).map(([c, n]) => `${c}×${n}`).join(', ')}`)
  for (const [k, n] of [...failures].sort((a, b) => b[1] - a[1]).slice(0, 5)) console.log(`  ${n}× ${k}`)

  console.log('\nendpoint                               count    p50         p95         p99         max        non-2xx  mean response')
  const kinds = mix.map(([k]) => k)
  const byKind = (k: Kind, xs = samples) => xs.filter(s => s.kind === k)
  for (const k of kinds.sort((a, b) => pct(byKind(b).map(s => s.ms), 0.95) - pct(byKind(a).map(s => s.ms), 0.95))) {
    const xs = byKind(k)
    const t = xs.map(s => s.ms)
    console.log(
      `${ENDPOINT[k].padEnd(36)} ${String(xs.length).padStart(7)} ${ms(pct(t, 0.5)).padStart(10)} ${ms(pct(t, 0.95)).padStart(11)} ${ms(pct(t, 0.99)).padStart(11)} ${ms(Math.max(...t)).padStart(11)} ${String(xs.filter(s => s.status < 200 || s.status >= 300).length).padStart(9)} ${size(xs.reduce((a, s) => a + s.bytes, 0) / Math.max(1, xs.length)).padStart(13)}`,
    )
  }
  const slowest = [...samples].sort((a, b) => b.ms - a.ms).slice(0, Math.max(1, Math.floor(samples.length * 0.05)))
  const tail = kinds.map(k => [k, slowest.filter(s => s.kind === k).length] as const).filter(([, n]) => n > 0).sort((a, b) => b[1] - a[1])
  console.log(`slowest 5 % of requests (${slowest.length}) by endpoint: ${tail.map(([k, n]) => `${k} ${((100 * n) / slowest.length).toFixed(0)} %`).join(', ')}`)

  if (upload) {
    const during = samples.filter(s => imp.uploadedAt !== undefined && s.at >= imp.uploadedAt && s.at <= (imp.finishedAt ?? Infinity))
    const before = samples.filter(s => imp.uploadedAt !== undefined && s.at < imp.uploadedAt)
    const after = samples.filter(s => imp.finishedAt !== undefined && s.at > imp.finishedAt)
    const p = (xs: Sample[]) => `${xs.length} requests, p50 ${ms(pct(xs.map(s => s.ms), 0.5))}, p95 ${ms(pct(xs.map(s => s.ms), 0.95))}`
    console.log(`\nconcurrent import (${IMPORT_PROJECTS} projects, upload at ${imp.uploadedAt?.toFixed(0)} s, 202 after ${ms(imp.acceptedMs ?? NaN)}): ${imp.error ? `failed: ${imp.error}` : `${imp.status}, ${imp.loaded} projects loaded, ${imp.finishedAt !== undefined && imp.uploadedAt !== undefined ? `${(imp.finishedAt - imp.uploadedAt).toFixed(0)} s after the upload (at ${imp.finishedAt.toFixed(0)} s)` : ''}`}`)
    console.log(`  before the upload: ${p(before)}`)
    console.log(`  while it ran:      ${p(during)}`)
    console.log(`  after it finished: ${after.length ? p(after) : '(finished after the load ended)'}`)
    if (imp.uploadedAt !== undefined) {
      // Second by second around the import: what the loader's run and the rebuilds after it cost.
      console.log('  per second around it:  req/s    p95         max       answered from the version before   server: loop delay max, requests waiting for a db connection')
      const from = Math.max(0, Math.floor(imp.uploadedAt) - 2)
      const to = Math.min(Math.ceil(runEnd), Math.ceil(imp.finishedAt ?? runEnd) + 8)
      for (let t = from; t < to; t++) {
        const xs = samples.filter(s => s.at >= t && s.at < t + 1)
        const ts = xs.map(s => s.ms)
        const mark = t <= imp.uploadedAt && imp.uploadedAt < t + 1 ? ' ← upload' : imp.finishedAt !== undefined && t <= imp.finishedAt && imp.finishedAt < t + 1 ? ' ← run seen finished' : ''
        console.log(`    ${`${t}–${t + 1} s`.padEnd(10)} ${String(xs.length).padStart(9)} ${ms(pct(ts, 0.95)).padStart(11)} ${ms(ts.length ? Math.max(...ts) : NaN).padStart(11)}   ${String(xs.filter(s => s.stale).length).padStart(5)}${waitsIn(t).padStart(42)}${mark}`)
      }
    }
  }
  console.log(`answers from the data version before the newest (served while it was built): ${samples.filter(s => s.stale).length} of ${samples.length}`)

  // The first seconds of the phase: after a server start, every answer is asked for the first time.
  console.log('\nfirst 10 s, second by second:  req/s    p95         max     server: loop delay max, requests waiting for a db connection')
  for (let t = 0; t < Math.min(10, runEnd); t++) {
    const ts = samples.filter(s => s.at >= t && s.at < t + 1).map(s => s.ms)
    console.log(`    ${`${t}–${t + 1} s`.padEnd(10)} ${String(ts.length).padStart(18)} ${ms(pct(ts, 0.95)).padStart(11)} ${ms(ts.length ? Math.max(...ts) : NaN).padStart(11)}${waitsIn(t).padStart(30)}`)
  }

  // Memory in the window: RSS from /proc; the heap after the window's last full collection (what
  // live objects hold; '—' when none ran in it) and the array buffers, from the server itself.
  const phaseT0 = runStart
  const inPhase = <T extends { at: number }>(xs: T[], from: number, to: number) => xs.filter(x => x.at - phaseT0 >= from * 1000 && x.at - phaseT0 < to * 1000)
  console.log('\nper 10 s:   req/s    p50         p95         max          server RSS   heap after full GC   array buffers (end of window)')
  for (let w = 0; w * 10 < runEnd - 0.5; w++) {
    const to = Math.min((w + 1) * 10, runEnd)
    const xs = samples.filter(s => s.at >= w * 10 && s.at < to).map(s => s.ms)
    const r = rss.filter(s => s.at - phaseAt < to).at(-1)
    const gc = inPhase(server.fullGcs, w * 10, to).at(-1)
    const buffers = inPhase(server.memory, w * 10, to).at(-1)
    console.log(`${`${w * 10}–${to.toFixed(0)} s`.padEnd(10)} ${(xs.length / (to - w * 10)).toFixed(1).padStart(7)} ${ms(pct(xs, 0.5)).padStart(10)} ${ms(pct(xs, 0.95)).padStart(11)} ${ms(xs.length ? Math.max(...xs) : NaN).padStart(11)}   ${mb(r?.rss ?? NaN).padStart(8)}   ${mb(gc?.heap ?? NaN).padStart(12)}   ${mb(buffers?.arrayBuffers ?? NaN).padStart(14)}`)
  }

  const during = rss.filter(s => s.at >= phaseAt && s.at - phaseAt <= runEnd)
  return {
    label,
    rate: result.total / runEnd,
    p50: pct(all, 0.5),
    p95: pct(all, 0.95),
    p99: pct(all, 0.99),
    errors: errorsNon2xx + result.errors,
    rssFirst: median(during.filter(s => s.at - phaseAt < 10).map(s => s.rss)),
    rssLast: median(during.filter(s => s.at - phaseAt >= runEnd - 10).map(s => s.rss)),
    liveHeap: inPhase(server.fullGcs, 0, runEnd).at(-1)?.heap ?? NaN,
    liveHeapAt: ((inPhase(server.fullGcs, 0, runEnd).at(-1)?.at ?? NaN) - phaseT0) / 1000,
    arrayBuffers: median(inPhase(server.memory, runEnd - 10, runEnd).map(m => m.arrayBuffers)),
  }
}

async function main() {
  const work = mkdtempSync(join(tmpdir(), 'backsight-bench-load-'))
  chmodSync(work, 0o755)
  let stopCluster = () => {}
  let sink: MailSink | undefined
  let server: Server | undefined
  let adminUrl = process.env.DATABASE_URL?.replace(/\/[^/]*$/, '/postgres')
  if (!adminUrl) {
    const cluster = startCluster({ dataDir: join(work, 'pgdata'), port: await freePort() })
    stopCluster = cluster.stop
    adminUrl = cluster.url('postgres')
    await ensureDatabase(adminUrl, 'postgres')
  }
  try {
    // 1. Seed (or, with BENCH_REUSE=1, keep a database seeded by an earlier run).
    const reuse = REUSE && (await seededProjects(adminUrl, 'bench_load')) === PROJECTS
    const url = reuse ? adminUrl.replace(/\/[^/]*$/, '/bench_load') : await freshDb(adminUrl, 'bench_load')
    if (reuse) console.log(`Reusing the seeded database bench_load (${PROJECTS} projects).`)
    else {
      console.log(`Generating ${PROJECTS} projects (${PROJECTS * 50} braces), perturbed deterministically…`)
      writeCsv(join(work, 'csv'), perturb(generate(PROJECTS), 2026))
    }
    {
      const handle = openDb(url)
      try {
        await migrateDb(handle.db)
        if (!reuse) {
          const t0 = performance.now()
          const summary = await runImport(handle.db, await readInputs(await expandPaths([join(work, 'csv')])), { source: 'cli' })
          console.log(`ETL into a fresh database: ${((performance.now() - t0) / 1000).toFixed(1)} s, ${summary.loaded} projects loaded`)
          if (summary.loaded !== PROJECTS) throw new Error(`ETL loaded ${summary.loaded} of ${PROJECTS}: ${summary.problems.slice(0, 3).map(p => p.message).join('; ')}`)
          // The seed's own maintenance now, not a minute into the load: autovacuum would otherwise
          // vacuum and analyze the freshly written tables in the middle of the first phase.
          const v0 = performance.now()
          await handle.pool.query('vacuum (analyze)')
          console.log(`vacuum (analyze) of the seeded database: ${((performance.now() - v0) / 1000).toFixed(1)} s`)
        }
        await ensureDemoUsers(handle.db, PASSWORD, { force: true })
      } finally {
        await handle.close()
      }
      rmSync(join(work, 'csv'), { recursive: true, force: true })
    }
    // One upload per phase, each of projects of its own.
    const uploads = PHASES.map((_, i) => (IMPORT_PROJECTS > 0 ? uploadDocument(IMPORT_PROJECTS, `UPLOAD${i + 1}`) : ''))
    uploads.forEach((u, i) => u && writeFileSync(join(work, `upload-${i + 1}.json`), u))

    // 2. The server, in production mode, in a process of its own.
    sink = await startMailSink({ port: await freePort(), dir: join(work, 'mail') })
    const dist = join(ROOT, 'dist', 'dashboard')
    const env: NodeJS.ProcessEnv = {
      ...process.env,
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      DATABASE_URL: url,
      SESSION_SECRET: randomBytes(32).toString('hex'),
      SMTP_HOST: '127.0.0.1',
      SMTP_PORT: String(sink.port),
      MAIL_SINK_DIR: sink.dir,
      // Fifty sign-ins from one address: above the per-IP limit a firm's office would ever need.
      SIGN_IN_LIMIT: '1000',
      LOG_LEVEL: 'warn',
      // The built dashboard is served when there is one (`npm run build`); the API does not need it.
      DASHBOARD_DIST: existsSync(join(dist, 'index.html')) ? dist : undefined,
    }
    if (!env.DASHBOARD_DIST) delete env.DASHBOARD_DIST
    // The server runs with Node's default heap, as `npm start` does (not this script's 8 GB).
    delete env.NODE_OPTIONS
    const logFile = join(work, 'server.log')
    server = await startServer(env, logFile)
    const listeningAt = performance.now()
    const pid = server.child.pid!
    const base = `http://127.0.0.1:${server.port}`
    // The server loads the analytics columns in the background once it listens; watch /api/health
    // from now (alongside the sign-ins) and start the timed run only once it says they are ready.
    const warm = (async () => {
      for (;;) {
        const health = (await (await fetch(`${base}/api/health`)).json()) as { analytics?: string }
        if (health.analytics === 'ready') return (performance.now() - listeningAt) / 1000
        if (performance.now() - listeningAt > 600_000) throw new Error('analytics did not become ready within 600 s of the server listening')
        await new Promise(r => setTimeout(r, 100))
      }
    })()
    warm.catch(() => {})
    console.log(`Server (NODE_ENV=production${env.DASHBOARD_DIST ? ', built dashboard served' : ', no dashboard build'}) pid ${pid} on ${base}`)

    // 3. Sessions: 50 sign-ins across the three roles, plus one engineer for the upload.
    const roles: Session['role'][] = Array.from({ length: CONNECTIONS }, (_, i) => (['principal', 'engineer', 'bd'] as const)[i % 3])
    const sessions: Session[] = []
    let t0 = performance.now()
    for (const role of roles) sessions.push(await signIn(base, role))
    const uploader = await signIn(base, 'engineer')
    console.log(`${sessions.length} sessions signed in (${roles.filter(r => r === 'principal').length} principal, ${roles.filter(r => r === 'engineer').length} engineer, ${roles.filter(r => r === 'bd').length} bd) in ${((performance.now() - t0) / 1000).toFixed(1)} s`)
    console.log(`analytics warm-up (server listening → /api/health analytics 'ready', polled every 0.1 s during the sign-ins): ${(await warm).toFixed(1)} s`)
    // The rest of the warm-up (precedent and benchmark lists) logs a line when done: start after it, as users would after a restart.
    for (let i = 0; !readFileSync(logFile, 'utf8').includes('warm-up finished'); i++) {
      if (i > 6000) throw new Error('the server did not log the end of its warm-up within 600 s')
      await new Promise(r => setTimeout(r, 100))
    }
    console.log(`whole warm-up (server log 'warm-up finished'): ${((performance.now() - listeningAt) / 1000).toFixed(1)} s after listening`)
    const analysts = sessions.filter(s => s.role !== 'bd')
    const bizdev = sessions.filter(s => s.role !== 'engineer')

    // 4. RSS sampling, every second, from /proc, across both phases.
    const rss: RssSample[] = []
    const start = rssOf(pid)!
    const benchStart = performance.now()
    const sampler = setInterval(() => {
      const r = rssOf(pid)
      if (r) rss.push({ at: (performance.now() - benchStart) / 1000, ...r })
    }, 1000)

    // 5. The load, phase by phase, each with its own upload half way through.
    const mix = (Object.entries(WEIGHTS) as [Kind, number][]).filter(([k]) => !ONLY || ONLY.includes(k))
    if (!mix.length) throw new Error(`BENCH_ONLY=${ONLY?.join(',')} names no endpoint of the mix (${Object.keys(WEIGHTS).join(', ')})`)
    const ctx: PhaseContext = { base, analysts, bizdev, uploader, mix, rss, benchStart, server }
    const outcomes: PhaseOutcome[] = []
    for (const [i, phase] of PHASES.entries()) outcomes.push(await runPhase(ctx, phase, uploads[i]!))
    const atEnd = rssOf(pid)!
    await new Promise(r => setTimeout(r, 5000))
    const idle = rssOf(pid)!
    clearInterval(sampler)

    // 6. Both phases side by side, and the memory over the whole run.
    console.log('\n═══ summary ═══')
    console.log('phase                                           req/s      p50         p95         p99      errors')
    for (const o of outcomes) console.log(`${o.label.padEnd(44)} ${o.rate.toFixed(1).padStart(8)} ${ms(o.p50).padStart(10)} ${ms(o.p95).padStart(11)} ${ms(o.p99).padStart(11)} ${String(o.errors).padStart(8)}`)
    const peak = Math.max(...rss.map(x => x.rss), atEnd.rss, idle.rss)
    console.log(`\nserver RSS (/proc/${pid}/status, ${rss.length} samples over ${((performance.now() - benchStart) / 1000).toFixed(0)} s): start ${mb(start.rss)} (idle, signed in, warm-up done, no answer computed yet); peak ${mb(peak)} (kernel VmHWM ${mb(idle.hwm)}); end of load ${mb(atEnd.rss)}; 5 s after the load stopped ${mb(idle.rss)}`)
    for (const o of outcomes) console.log(`  ${o.label}: median RSS over its first 10 s ${mb(o.rssFirst)}, over its last 10 s ${mb(o.rssLast)}; heap after its last full GC ${mb(o.liveHeap)} (at ${o.liveHeapAt.toFixed(0)} s); array buffers over its last 10 s ${mb(o.arrayBuffers)}`)
    if (outcomes.length > 1) {
      // What the server's live objects hold: heap after a full collection plus array buffers (the
      // columns and Arrow answers live there, outside the heap). RSS also counts pages V8 keeps.
      // The array buffers are read every second, not after a collection: under a heavy churn of
      // point sets they include some not yet freed.
      const live = (o: PhaseOutcome) => o.liveHeap + o.arrayBuffers
      const firstLive = live(outcomes[0]!)
      const lastLive = live(outcomes.at(-1)!)
      const liveGrowth = lastLive - firstLive
      console.log(`  live memory (heap after the last full GC + array buffers over the last 10 s, the latter including buffers not yet collected), end of the first phase → end of the last: ${mb(firstLive)} → ${mb(lastLive)} (${liveGrowth > 0 ? '+' : ''}${mb(liveGrowth)})`)
      const first = outcomes[0]!.rssLast
      const last = outcomes.at(-1)!.rssLast
      const growth = last - first
      console.log(
        `  end of the first phase → end of the last: ${growth > 0 ? '+' : ''}${mb(growth)} (${((100 * growth) / first).toFixed(0)} %) — ${Math.abs(growth) <= Math.max(0.1 * first, 32 * 1024) ? 'did not grow beyond noise (≤ 10 % or 32 MB), though each phase\'s import rebuilt the columns and emptied the answer cache' : growth > 0 ? 'GREW between the phases' : 'fell between the phases'}`,
      )
    }
    console.log('\nGoals: zero errors, p95 < 200 ms, memory that does not grow over the run.')
    const lines = readFileSync(logFile, 'utf8').split('\n')
    // The server's own lines about the warm-up and the analytics columns: every rebuild (full or from the change log) and its time.
    const ownLine = (l: string) => l.startsWith('analytics') || l.startsWith('precedents:') || l.startsWith('warm-up')
    const rebuilds = lines.filter(ownLine)
    if (rebuilds.length) {
      console.log('\nwarm-up, analytics column and precedent history rebuilds (server log):')
      for (const l of rebuilds) console.log(`  ${l}`)
    }
    const log = lines.filter(l => l.trim() && !l.startsWith('listening ') && !ownLine(l))
    if (log.length) {
      // pino lines: count the distinct error messages the server logged.
      const reasons = new Map<string, number>()
      for (const line of log) {
        let why = line.slice(0, 160)
        try {
          const o = JSON.parse(line) as { msg?: string; err?: { message?: string } }
          why = (o.err?.message ?? o.msg ?? why).slice(0, 160)
        } catch {}
        reasons.set(why, (reasons.get(why) ?? 0) + 1)
      }
      console.log(`server log: ${log.length} lines of warnings/errors (${process.env.BENCH_KEEP || process.env.BENCH_CPU_PROF ? logFile : 'set BENCH_KEEP=1 to keep it'}):`)
      for (const [why, n] of [...reasons].sort((a, b) => b[1] - a[1]).slice(0, 5)) console.log(`  ${n}× ${why}`)
    }
  } finally {
    await server?.stop()
    await sink?.close()
    stopCluster()
    if (!process.env.BENCH_KEEP && !process.env.BENCH_CPU_PROF) rmSync(work, { recursive: true, force: true })
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

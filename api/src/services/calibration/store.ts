import { CALIBRATION_QUANTITIES, type CalibrationFilters, type CalibrationQuantity } from '@shared/schemas/calibration'
import { pairValue, type PairSnapshot } from '@shared/calibration/pairs'
import type pg from 'pg'
import type { Db } from '../../db'
import { calibrationVersion, changedSince, inSnapshot, readVersionIn } from '../../db/calibration'
import { NotKept, PREVIOUS_KEPT_MS, answersMayLag, freshOrRecent, inBackground, inVersion, mayAnswerStale, noteStale, pauseAfter, sliceClock, versionScope } from '../answer-freshness'
import { prepare, preparationSteps } from './derived'

/**
 * The calibration pairs of one assumed phase, held in memory as columns (typed arrays and
 * dictionary codes) and rebuilt when `calibration_state.version` changes. Every analytics answer
 * filters and aggregates these columns; a small response cache sits on top, keyed by the same version.
 */

/** Per-project attributes (a project index is the position in these arrays). */
export interface ProjectColumns {
  id: number[]
  code: string[]
  name: string[]
  supplier: (string | null)[]
  office: (string | null)[]
  use: (string | null)[]
  sdc: (string | null)[]
  edition: (string | null)[]
  stories: (number | null)[]
  yearDesigned: (number | null)[]
  yearCompleted: (number | null)[]
}

export interface QuantityColumns {
  /** NaN where the pair lacks the quantity. */
  assumed: Float64Array
  final: Float64Array
  /** Index into `bases`; −1 where the pair lacks the quantity. */
  basis: Int32Array
  bases: string[]
}

export interface Dict {
  codes: Int32Array
  values: string[]
}

export interface PhaseData {
  version: number
  phase: string
  n: number
  braceId: Int32Array
  /** Project index of each row. */
  project: Int32Array
  projects: ProjectColumns
  frameLine: Dict
  level: Dict
  configuration: Dict
  /** Final (governing) core area, in²; NaN when missing. */
  finalCoreArea: Float64Array
  /** Year designed / completed per row (NaN when missing), for the back-test. */
  yearDesigned: Float64Array
  yearCompleted: Float64Array
  q: Record<CalibrationQuantity, QuantityColumns>
}

/** Brace-level columns, read per row. */
const ROW_COLUMNS = [
  'brace_id', 'project_id', 'frame_line', 'level_name', 'configuration',
  'a_core_area_in2', 'a_fysc_ksi', 'a_fysc_basis', 'a_fysc_max_ksi', 'a_ry', 'a_beta', 'a_omega', 'a_factor_drift_multiple', 'a_stiffness_factor', 'a_tmax_kip', 'a_cmax_kip',
  'f_core_area_in2', 'f_fysc_ksi', 'f_fysc_basis', 'f_fysc_max_ksi', 'f_ry', 'f_beta', 'f_omega', 'f_factor_drift_multiple', 'f_stiffness_factor', 'f_tmax_kip', 'f_cmax_kip',
] as const
const C = Object.fromEntries(ROW_COLUMNS.map((c, i) => [c, i])) as Record<(typeof ROW_COLUMNS)[number], number>
/** Project-level columns: the same on every row of a project, so read once per project. */
const PROJECT_COLUMNS = ['project_id', 'project_code', 'project_name', 'supplier_code', 'office', 'building_use', 'sdc', 'aisc341_edition', 'stories', 'year_designed', 'year_completed'] as const
const BATCH = 50_000

/** Labels numbered in order of first appearance: `values[code(v)] === v`. */
class Labels {
  private index = new Map<string, number>()
  /** `values`: an array to number into (a quantity's `bases`), empty. */
  constructor(readonly values: string[] = []) {}
  code(v: string): number {
    let c = this.index.get(v)
    if (c === undefined) {
      c = this.values.length
      this.values.push(v)
      this.index.set(v, c)
    }
    return c
  }
}

/** A dictionary-coded column of `n` rows: `values[codes[i]]` is row i's label. */
class DictBuilder extends Labels {
  codes: Int32Array
  constructor(n: number) {
    super()
    this.codes = new Int32Array(n)
  }
  set(i: number, v: string) {
    this.codes[i] = this.code(v)
  }
}

const num = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v))
const snap = (r: unknown[], o: number): PairSnapshot => ({
  coreAreaIn2: num(r[o]),
  fyscKsi: num(r[o + 1]),
  fyscBasis: (r[o + 2] as PairSnapshot['fyscBasis']) ?? null,
  fyscMaxKsi: num(r[o + 3]),
  ry: num(r[o + 4]),
  beta: num(r[o + 5]),
  omega: num(r[o + 6]),
  factorDriftMultiple: num(r[o + 7]),
  stiffnessFactor: num(r[o + 8]),
  tmaxKip: num(r[o + 9]),
  cmaxKip: num(r[o + 10]),
})

type ProjectRow = unknown[]
const emptyProjects = (): ProjectColumns => ({ id: [], code: [], name: [], supplier: [], office: [], use: [], sdc: [], edition: [], stories: [], yearDesigned: [], yearCompleted: [] })

function pushProject(p: ProjectColumns, r: ProjectRow) {
  p.id.push(r[0] as number)
  p.code.push(r[1] as string)
  p.name.push(r[2] as string)
  p.supplier.push((r[3] as string | null) ?? null)
  p.office.push((r[4] as string | null) ?? null)
  p.use.push((r[5] as string | null) ?? null)
  p.sdc.push((r[6] as string | null) ?? null)
  p.edition.push((r[7] as string | null) ?? null)
  p.stories.push(num(r[8]))
  p.yearDesigned.push(num(r[9]))
  p.yearCompleted.push(num(r[10]))
}

/** Copies project `j` of `from` to the end of `to`. */
function copyProject(to: ProjectColumns, from: ProjectColumns, j: number) {
  for (const k of Object.keys(to) as (keyof ProjectColumns)[]) (to[k] as unknown[]).push(from[k][j])
}

/**
 * Columns of `count` pair rows arriving in brace-id order (`rows` yields them batch by batch), with
 * project attributes from `projectRows` (one row per project). Project indices, dictionary codes and
 * bases are numbered by first appearance in that order.
 */
async function buildColumns(phase: string, version: number, count: number, projectRows: Map<number, ProjectRow>, batches: AsyncIterable<unknown[][]>): Promise<PhaseData> {
  const braceId = new Int32Array(count)
  const project = new Int32Array(count)
  const frameLine = new DictBuilder(count)
  const level = new DictBuilder(count)
  const configuration = new DictBuilder(count)
  const finalCoreArea = new Float64Array(count)
  const yearDesigned = new Float64Array(count)
  const yearCompleted = new Float64Array(count)
  const q = Object.fromEntries(
    CALIBRATION_QUANTITIES.map(k => [k, { assumed: new Float64Array(count).fill(NaN), final: new Float64Array(count).fill(NaN), basis: new Int32Array(count).fill(-1), bases: [] as string[] }]),
  ) as Record<CalibrationQuantity, QuantityColumns>
  const basisLabels = Object.fromEntries(CALIBRATION_QUANTITIES.map(k => [k, new Labels(q[k].bases)])) as Record<CalibrationQuantity, Labels>
  const projects = emptyProjects()
  const projectIndex = new Map<number, number>()

  let i = 0
  for await (const rows of batches) {
    for (const r of rows) {
      if (i >= count) throw new Error('calibration pairs: more rows than counted in one snapshot')
      const pid = r[C.project_id] as number
      let pi = projectIndex.get(pid)
      if (pi === undefined) {
        const pr = projectRows.get(pid)
        if (!pr) throw new Error(`calibration pairs: no attributes for project ${pid}`)
        pi = projects.id.length
        projectIndex.set(pid, pi)
        pushProject(projects, pr)
      }
      braceId[i] = r[C.brace_id] as number
      project[i] = pi
      frameLine.set(i, r[C.frame_line] as string)
      level.set(i, r[C.level_name] as string)
      configuration.set(i, r[C.configuration] as string)
      finalCoreArea[i] = num(r[C.f_core_area_in2]) ?? NaN
      yearDesigned[i] = projects.yearDesigned[pi] ?? NaN
      yearCompleted[i] = projects.yearCompleted[pi] ?? NaN
      const pair = { assumed: snap(r, C.a_core_area_in2), final: snap(r, C.f_core_area_in2), codeEdition: projects.edition[pi]! }
      for (const k of CALIBRATION_QUANTITIES) {
        const v = pairValue(pair, k)
        if (!v) continue
        const col = q[k]
        col.assumed[i] = v.assumed
        col.final[i] = v.final
        col.basis[i] = basisLabels[k].code(v.basis)
      }
      i++
    }
  }
  if (i !== count) throw new Error(`calibration pairs: ${i} rows read, ${count} counted in one snapshot`)
  return {
    version,
    phase,
    n: count,
    braceId,
    project,
    projects,
    frameLine: { codes: frameLine.codes, values: frameLine.values },
    level: { codes: level.codes, values: level.values },
    configuration: { codes: configuration.codes, values: configuration.values },
    finalCoreArea,
    yearDesigned,
    yearCompleted,
    q,
  }
}

async function projectRowsIn(client: pg.PoolClient, phase: string, ids: number[] | null): Promise<Map<number, ProjectRow>> {
  const { rows } = await client.query<unknown[]>({
    text: `select distinct on (project_id) ${PROJECT_COLUMNS.join(', ')} from calibration_pairs where phase = $1 ${ids ? 'and project_id = any($2::integer[])' : ''} order by project_id`,
    values: ids ? [phase, ids] : [phase],
    rowMode: 'array',
  })
  return new Map(rows.map(r => [r[0] as number, r]))
}

/** Every pair of `phase`, read in one snapshot (keyset batches on brace id), into columns. */
async function fullLoadIn(client: pg.PoolClient, phase: string, version: number): Promise<PhaseData> {
  const count = Number((await client.query<{ n: string }>('select count(*)::text as n from calibration_pairs where phase = $1', [phase])).rows[0]!.n)
  const projectRows = await projectRowsIn(client, phase, null)
  async function* batches() {
    let after = -1
    for (;;) {
      const { rows } = await client.query<unknown[]>({
        text: `select ${ROW_COLUMNS.join(', ')} from calibration_pairs where phase = $1 and brace_id > $2 order by brace_id limit ${BATCH}`,
        values: [phase, after],
        rowMode: 'array',
      })
      yield rows
      if (rows.length < BATCH) return
      after = rows[rows.length - 1]![C.brace_id] as number
    }
  }
  return buildColumns(phase, version, count, projectRows, batches())
}

/** A full load of `phase` at the current data version (the version read in the same snapshot). */
export async function loadPhase(db: Db, phase: string): Promise<PhaseData> {
  return inSnapshot(db, async client => fullLoadIn(client, phase, await readVersionIn(client)))
}

/**
 * `base` with the rows of the `changed` projects replaced by `part` (those projects' rows now),
 * laid out exactly as a full load would: rows in brace-id order, project indices, dictionary codes
 * and bases numbered by first appearance in that order.
 */
export async function mergePhase(base: PhaseData, part: PhaseData, changed: ReadonlySet<number>, version: number): Promise<PhaseData> {
  // A quarter of a million rows take a few hundred ms: requests waiting meanwhile are let in (sliceClock).
  const due = sliceClock()
  const dropProject = new Uint8Array(base.projects.id.length)
  base.projects.id.forEach((id, j) => (dropProject[j] = Number(changed.has(id))))
  let kept = 0
  for (let i = 0; i < base.n; i++) if (!dropProject[base.project[i]!]) kept++
  const n = kept + part.n
  const sources = [base, part]
  const braceId = new Int32Array(n)
  const project = new Int32Array(n)
  const finalCoreArea = new Float64Array(n)
  const yearDesigned = new Float64Array(n)
  const yearCompleted = new Float64Array(n)
  const projects = emptyProjects()
  const projectMap = sources.map(s => new Int32Array(s.projects.id.length).fill(-1))
  const dicts = (['frameLine', 'level', 'configuration'] as const).map(name => ({
    name,
    out: new DictBuilder(n),
    maps: sources.map(s => new Int32Array(s[name].values.length).fill(-1)),
  }))
  const q = Object.fromEntries(
    CALIBRATION_QUANTITIES.map(k => [k, { assumed: new Float64Array(n), final: new Float64Array(n), basis: new Int32Array(n), bases: [] as string[] }]),
  ) as Record<CalibrationQuantity, QuantityColumns>
  const bases = CALIBRATION_QUANTITIES.map(k => ({ k, labels: new Labels(q[k].bases), maps: sources.map(s => new Int32Array(s.q[k].bases.length).fill(-1)) }))

  let i = 0 // next row of base
  let j = 0 // next row of part
  const skip = () => {
    while (i < base.n && dropProject[base.project[i]!]) i++
  }
  skip()
  for (let o = 0; o < n; o++) {
    if ((o & 4095) === 0) await due()
    // The smaller brace id comes first (a brace belongs to one project, so ids never tie).
    const fromPart = i >= base.n || (j < part.n && part.braceId[j]! < base.braceId[i]!)
    const si = fromPart ? 1 : 0
    const s = sources[si]!
    const r = fromPart ? j++ : i++
    braceId[o] = s.braceId[r]!
    const sp = s.project[r]!
    let pi = projectMap[si]![sp]!
    if (pi < 0) {
      pi = projects.id.length
      projectMap[si]![sp] = pi
      copyProject(projects, s.projects, sp)
    }
    project[o] = pi
    for (const d of dicts) {
      const c = s[d.name].codes[r]!
      let m = d.maps[si]![c]!
      if (m < 0) d.maps[si]![c] = m = d.out.code(s[d.name].values[c]!)
      d.out.codes[o] = m
    }
    finalCoreArea[o] = s.finalCoreArea[r]!
    yearDesigned[o] = s.yearDesigned[r]!
    yearCompleted[o] = s.yearCompleted[r]!
    for (const b of bases) {
      const from = s.q[b.k]
      const to = q[b.k]
      to.assumed[o] = from.assumed[r]!
      to.final[o] = from.final[r]!
      const c = from.basis[r]!
      if (c < 0) {
        to.basis[o] = -1
        continue
      }
      let m = b.maps[si]![c]!
      if (m < 0) b.maps[si]![c] = m = b.labels.code(from.bases[c]!)
      to.basis[o] = m
    }
    if (!fromPart) skip()
  }
  const dict = (name: 'frameLine' | 'level' | 'configuration'): Dict => {
    const d = dicts.find(x => x.name === name)!
    return { codes: d.out.codes, values: d.out.values }
  }
  return {
    version,
    phase: base.phase,
    n,
    braceId,
    project,
    projects,
    frameLine: dict('frameLine'),
    level: dict('level'),
    configuration: dict('configuration'),
    finalCoreArea,
    yearDesigned,
    yearCompleted,
    q,
  }
}

export interface LoadReport {
  phase: string
  version: number
  /** 'delta': built from the version before, reading only `projects` changed projects. */
  kind: 'full' | 'delta' | 'unchanged'
  projects: number
  rows: number
  ms: number
}

let loadListener: ((r: LoadReport) => void) | null = null
/** Called after every rebuild of a phase's columns (the production server logs them). */
export function onPhaseLoad(listener: ((r: LoadReport) => void) | null) {
  loadListener = listener
}

/**
 * The columns of `phase` at the current data version, built from `base` (an earlier version's)
 * when the change log covers every version since, else in full. One snapshot throughout.
 */
export async function reloadPhase(db: Db, phase: string, base: PhaseData | null): Promise<PhaseData> {
  const t0 = performance.now()
  let report: Omit<LoadReport, 'ms'> | undefined
  const data = await inSnapshot(db, async client => {
    const version = await readVersionIn(client)
    const changed = base && base.phase === phase ? await changedSince(client, base.version, version) : null
    if (!base || !changed) {
      const d = await fullLoadIn(client, phase, version)
      report = { phase, version, kind: 'full', projects: d.projects.id.length, rows: d.n }
      return d
    }
    if (version === base.version) {
      report = { phase, version, kind: 'unchanged', projects: 0, rows: base.n }
      return base
    }
    const count = Number((await client.query<{ n: string }>('select count(*)::text as n from calibration_pairs where phase = $1 and project_id = any($2::integer[])', [phase, changed])).rows[0]!.n)
    const projectRows = await projectRowsIn(client, phase, changed)
    const { rows } = await client.query<unknown[]>({
      text: `select ${ROW_COLUMNS.join(', ')} from calibration_pairs where phase = $1 and project_id = any($2::integer[]) order by brace_id`,
      values: [phase, changed],
      rowMode: 'array',
    })
    const part = await buildColumns(phase, version, count, projectRows, (async function* () {
      yield rows
    })())
    const d = await mergePhase(base, part, new Set(changed), version)
    report = { phase, version, kind: 'delta', projects: changed.length, rows: d.n }
    return d
  })
  loadListener?.({ ...report!, ms: Math.round(performance.now() - t0) })
  return data
}

/** Filters of every calibration endpoint, as row indices of a phase's data. */
export function selectRows(d: PhaseData, f: Partial<CalibrationFilters>): Int32Array {
  const p = d.projects
  const sets = {
    supplier: f.supplier?.length ? new Set(f.supplier) : null,
    use: f.use?.length ? new Set(f.use) : null,
    sdc: f.sdc?.length ? new Set(f.sdc) : null,
    edition: f.codeEdition?.length ? new Set(f.codeEdition) : null,
  }
  const projectOk = new Uint8Array(p.id.length)
  for (let j = 0; j < p.id.length; j++) {
    const y = p.yearDesigned[j]
    const s = p.stories[j]
    projectOk[j] = Number(
      (f.yearFrom === undefined || (y !== null && y! >= f.yearFrom)) &&
        (f.yearTo === undefined || (y !== null && y! <= f.yearTo)) &&
        (!sets.supplier || (p.supplier[j] !== null && sets.supplier.has(p.supplier[j]!))) &&
        (!sets.use || (p.use[j] !== null && sets.use.has(p.use[j]!))) &&
        (!sets.sdc || (p.sdc[j] !== null && sets.sdc.has(p.sdc[j]!))) &&
        (!sets.edition || (p.edition[j] !== null && sets.edition.has(p.edition[j]!))) &&
        (f.storiesMin === undefined || (s !== null && s! >= f.storiesMin)) &&
        (f.storiesMax === undefined || (s !== null && s! <= f.storiesMax)),
    )
  }
  const configOk = new Uint8Array(d.configuration.values.length)
  const configs = f.configuration?.length ? new Set(f.configuration) : null
  d.configuration.values.forEach((c, k) => (configOk[k] = Number(!configs || configs.has(c))))
  const coreMin = f.coreAreaMin
  const coreMax = f.coreAreaMax
  const out = new Int32Array(d.n)
  let m = 0
  for (let i = 0; i < d.n; i++) {
    if (!projectOk[d.project[i]!] || !configOk[d.configuration.codes[i]!]) continue
    if (coreMin !== undefined || coreMax !== undefined) {
      const a = d.finalCoreArea[i]!
      if (!(a >= (coreMin ?? -Infinity) && a <= (coreMax ?? Infinity))) continue
    }
    out[m++] = i
  }
  return out.subarray(0, m)
}

/** For `cached`: the computation queries the database itself (not only the version's columns and lists). */
export const READS_DATABASE = { readsDatabase: true } as const

type Compute = (version: number) => Promise<unknown>
type BytesOf = (v: unknown) => number

interface CacheEntry {
  value: Promise<unknown>
  /** Size once the value is known (0 while it is being computed). */
  bytes: number
  done: boolean
}

interface Store {
  version: number
  phases: Map<string, Promise<PhaseData>>
  /** Answers by key, least recently used first (a Map keeps insertion order; a hit moves to the end). */
  cache: Map<string, CacheEntry>
  cacheBytes: number
  /** When this version was first seen (ms, performance.now()). */
  since: number
  /**
   * The store of the version before, kept PREVIOUS_KEPT_MS as the fallback of requests while this
   * version's answers are built (see answer-freshness.ts); its cache shares the budget, and leaves first.
   */
  previous?: Store
  /** A previous version's store: it only answers from what it holds, never loading anything. */
  retired: boolean
  /**
   * The default phase's columns and the structures derived from them are built. Until then, with a
   * previous version to fall back on, a request for an answer neither version holds gets it
   * computed from the previous version's structures rather than wait for the build.
   */
  ready: boolean
}

const stores = new WeakMap<Db, Store>()
/** Bytes of cached answers kept per database (bodies of large point sets count by size). */
export const CACHE_BUDGET = 64 * 1024 * 1024

/**
 * The store a request or computation uses: in a computation for version V (a version scope), V's
 * (the current store or the previous one); otherwise the current data version's.
 */
async function storeFor(db: Db): Promise<Store> {
  const scope = versionScope()
  const known = stores.get(db)
  if (scope && known) {
    if (known.version === scope.version) return known
    if (known.previous?.version === scope.version) return known.previous
  }
  if (scope?.fallback) throw new NotKept('The analytics store')
  const version = await calibrationVersion(db)
  let s = stores.get(db)
  // Version answers reach their callers in the order the queries were sent (one query out at a
  // time, see calibrationVersion), so a differing version is the newer one.
  if (!s || s.version !== version) {
    const previous = s
    if (previous) {
      previous.previous = undefined
      previous.retired = true
    }
    s = { version, phases: new Map(), cache: new Map(), cacheBytes: 0, since: performance.now(), previous, retired: false, ready: !previous || !answersMayLag(db) }
    stores.set(db, s)
    if (!s.ready) {
      const st = s
      inBackground(db, `${version}|build`, 'build', () => stores.get(db) === st, async () => {
        try {
          const d = await inVersion(st.version, false, () => phaseData(db, DEFAULT_PHASE))
          // Step by step (a long step part by part), pausing after each (BACKGROUND_SHARE), so the
          // requests meanwhile keep their pace and none waits behind a long stretch of building.
          for (const step of preparationSteps(d)) {
            let t0 = performance.now()
            const parts = step()
            if (parts) {
              while (!parts.next().done) {
                await pauseAfter(performance.now() - t0)
                t0 = performance.now()
              }
            }
            await pauseAfter(performance.now() - t0)
          }
        } finally {
          st.ready = true
          // From now on the previous version only answers from its cache: its columns (and the
          // structures derived from them) can go.
          st.previous?.phases.clear()
        }
      })
    }
  } else if (s.previous && performance.now() - s.since > PREVIOUS_KEPT_MS) {
    s.previous = undefined
  }
  return s
}

/** The most recent load of each phase, at whatever version: the base of the next one. */
const lastLoads = new WeakMap<Db, Map<string, Promise<PhaseData>>>()
/** Phases whose columns have been loaded at least once, per database. */
const loaded = new WeakMap<Db, Set<string>>()

/**
 * The pairs of `phase` at the current data version, loaded once per version: requests that arrive
 * while it loads wait for the same load (no second load starts). A load after a data change starts
 * from the previous version's columns (waiting for that load if it is still running) and reads only
 * the projects that changed, when the change log allows (see reloadPhase).
 */
export async function phaseData(db: Db, phase: string): Promise<PhaseData> {
  const s = await storeFor(db)
  let p = s.phases.get(phase)
  if (!p && s.retired) throw new NotKept(`The ${phase} columns`)
  if (!p) {
    let last = lastLoads.get(db)
    if (!last) lastLoads.set(db, (last = new Map()))
    const prev = last.get(phase)
    const load = (async () => reloadPhase(db, phase, prev ? await prev.catch(() => null) : null))()
    p = load
    s.phases.set(phase, load)
    last.set(phase, load)
    load.then(
      () => {
        let set = loaded.get(db)
        if (!set) loaded.set(db, (set = new Set()))
        set.add(phase)
      },
      () => {
        if (s.phases.get(phase) === load) s.phases.delete(phase)
        if (last.get(phase) === load) last.delete(phase)
      },
    )
  }
  return p
}

/** The phase the calibration answers use unless a request names another (CalibrationFilters' default). */
export const DEFAULT_PHASE = 'sd'

/** Whether the default phase's columns have been loaded (analytics answer without a rebuild from scratch). */
export function analyticsReady(db: Db): boolean {
  return loaded.get(db)?.has(DEFAULT_PHASE) ?? false
}

/**
 * Loads the default phase's columns, and the structures every answer derives from them, ahead of
 * the first request; failures are only logged.
 */
export async function warmAnalytics(db: Db, log: (message: string) => void = console.error): Promise<void> {
  try {
    // Every per-version structure (preparationSteps: the starting-factor index and layout among them).
    prepare(await phaseData(db, DEFAULT_PHASE))
  } catch (err) {
    log(`analytics warm-up failed: ${err instanceof Error ? err.message : String(err)}`)
  }
}

/** Rough size of a JSON-like answer: twice its JSON length (strings are UTF-16 in memory). */
export const jsonBytes = (v: unknown): number => 2 * (JSON.stringify(v)?.length ?? 0)

/**
 * An answer computed once per data version and key. Concurrent first requests for a key share one
 * computation; a failed computation is not kept. `bytes` sizes the answer against the cache budget
 * (least recently used entries leave first, the previous version's before the current one's), so
 * the cache stays bounded. While the answer of a new version is computed, a request may get the
 * previous version's (see answer-freshness.ts).
 */
export async function cached<T>(db: Db, key: string, compute: (version: number) => Promise<T>, bytesOf: (v: T) => number = jsonBytes, options: { readsDatabase?: boolean } = {}): Promise<T> {
  return cachedIn(await storeFor(db), db, key, compute, bytesOf, options)
}

/**
 * `cached` for an answer whose key depends on `first` (a read of the firm's settings, started by
 * the caller): `first` and the data version are read at the same time, so the request waits for one
 * round trip to the database instead of two one after the other (under load each waits for a turn
 * of the event loop on its way back). Both reads were sent after the call, as `cached`'s own. If the
 * version moved on while `first` was read, the answer is of the newer version.
 */
export async function cachedWith<A, T>(
  db: Db,
  first: Promise<A>,
  key: (a: A) => string,
  compute: (a: A, version: number) => Promise<T>,
  bytesOf: (v: T) => number = jsonBytes,
  options: { readsDatabase?: boolean } = {},
): Promise<T> {
  const [a, s] = await Promise.all([first, storeFor(db)])
  return cachedIn(s.retired ? await storeFor(db) : s, db, key(a), version => compute(a, version), bytesOf, options)
}

async function cachedIn<T>(s: Store, db: Db, key: string, compute: (version: number) => Promise<T>, bytesOf: (v: T) => number, options: { readsDatabase?: boolean }): Promise<T> {
  let entry = s.cache.get(key)
  // A previous version's answer that queries the database itself would be of the newest data: not computed.
  if (!entry && s.retired && options.readsDatabase) throw new NotKept('This answer')
  const previous = s.retired || !mayAnswerStale(db) ? undefined : s.previous
  if (entry) {
    s.cache.delete(key)
    s.cache.set(key, entry)
  }
  if (!previous) {
    entry ??= startEntry(s, key, compute, bytesOf as BytesOf)
    return entry.value as Promise<T>
  }
  if (entry?.done) return entry.value as Promise<T>
  // Catching up after a data change. The previous version's answer: the one it holds, or, while
  // this version's structures are still being built, one computed from the previous version's.
  const fromPrevious = async (): Promise<T> => {
    const held = previous.cache.get(key)
    if (held?.done) return held.value as Promise<T>
    if (s.ready) throw new NotKept('This answer')
    return inVersion(previous.version, true, () => cached(db, key, compute, bytesOf, options))
  }
  if (!entry) {
    // An answer the previous version held was asked for before and is likely to be asked again:
    // this version's is computed in the background. One asked for the first time is not (most
    // such questions are asked once; a second asking computes it then).
    const asked = previous.cache.get(key)?.done === true
    try {
      const value = await fromPrevious()
      noteStale(previous.version, s.version)
      if (asked) refreshLater(db, s, key, compute, bytesOf as BytesOf)
      return value
    } catch (err) {
      if (!(err instanceof NotKept)) throw err
    }
    entry = s.cache.get(key) ?? startEntry(s, key, compute, bytesOf as BytesOf)
  }
  return freshOrRecent(db, entry.value as Promise<T>, fromPrevious, previous.version, s.version)
}

/** `key`'s answer at `s`'s version, computed in the background (one at a time) unless a request starts it first. */
function refreshLater(db: Db, s: Store, key: string, compute: Compute, bytesOf: BytesOf): void {
  inBackground(db, `${s.version}|${key}`, 'answer', () => stores.get(db) === s && !s.cache.has(key), async () => {
    await startEntry(s, key, compute, bytesOf).value
  })
}

/** Starts computing `key`'s answer at `s`'s version into `s`'s cache. */
function startEntry(s: Store, key: string, compute: Compute, bytesOf: BytesOf): CacheEntry {
  const value = inVersion(s.version, s.retired, () => compute(s.version))
  const entry: CacheEntry = { value, bytes: 0, done: false }
  s.cache.set(key, entry)
  value.then(
    v => {
      if (s.cache.get(key) !== entry) return
      const bytes = bytesOf(v)
      if (bytes > CACHE_BUDGET / 4) {
        s.cache.delete(key)
        return
      }
      entry.done = true
      entry.bytes = bytes
      s.cacheBytes += bytes
      const held = () => s.cacheBytes + (s.previous?.cacheBytes ?? 0)
      for (const store of s.previous ? [s.previous, s] : [s]) {
        for (const [k, e] of store.cache) {
          if (held() <= CACHE_BUDGET) break
          if (e === entry) continue
          store.cache.delete(k)
          store.cacheBytes -= e.bytes
        }
      }
    },
    () => {
      if (s.cache.get(key) === entry) s.cache.delete(key)
    },
  )
  return entry
}

/** The cache of `db`'s current store, for tests: entries and bytes held. */
export function cacheStats(db: Db): { version: number; entries: number; bytes: number } | undefined {
  const s = stores.get(db)
  return s && { version: s.version, entries: s.cache.size, bytes: s.cacheBytes }
}

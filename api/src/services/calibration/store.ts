import { CALIBRATION_QUANTITIES, type CalibrationFilters, type CalibrationQuantity } from '@shared/schemas/calibration'
import { pairValue, type PairSnapshot } from '@shared/calibration/pairs'
import type { Db } from '../../db'
import { calibrationVersion, poolOf } from '../../db/calibration'

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

const COLUMNS = [
  'brace_id', 'project_id', 'project_code', 'project_name', 'frame_line', 'level_name', 'configuration', 'supplier_code', 'office', 'building_use', 'sdc',
  'aisc341_edition', 'stories', 'year_designed', 'year_completed',
  'a_core_area_in2', 'a_fysc_ksi', 'a_fysc_basis', 'a_fysc_max_ksi', 'a_ry', 'a_beta', 'a_omega', 'a_factor_drift_multiple', 'a_stiffness_factor', 'a_tmax_kip', 'a_cmax_kip',
  'f_core_area_in2', 'f_fysc_ksi', 'f_fysc_basis', 'f_fysc_max_ksi', 'f_ry', 'f_beta', 'f_omega', 'f_factor_drift_multiple', 'f_stiffness_factor', 'f_tmax_kip', 'f_cmax_kip',
] as const
const C = Object.fromEntries(COLUMNS.map((c, i) => [c, i])) as Record<(typeof COLUMNS)[number], number>
const BATCH = 50_000

class DictBuilder {
  private index = new Map<string, number>()
  values: string[] = []
  codes: Int32Array
  constructor(n: number) {
    this.codes = new Int32Array(n)
  }
  code(v: string): number {
    let c = this.index.get(v)
    if (c === undefined) {
      c = this.values.length
      this.values.push(v)
      this.index.set(v, c)
    }
    return c
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

/** Reads every pair of `phase` from the view, in batches (keyset on brace id), into columns. */
export async function loadPhase(db: Db, phase: string, version: number): Promise<PhaseData> {
  const pool = poolOf(db)
  const count = Number((await pool.query<{ n: string }>('select count(*)::text as n from calibration_pairs where phase = $1', [phase])).rows[0]!.n)
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
  const basisIndex = Object.fromEntries(CALIBRATION_QUANTITIES.map(k => [k, new Map<string, number>()])) as Record<CalibrationQuantity, Map<string, number>>
  const projects: ProjectColumns = { id: [], code: [], name: [], supplier: [], office: [], use: [], sdc: [], edition: [], stories: [], yearDesigned: [], yearCompleted: [] }
  const projectIndex = new Map<number, number>()

  let i = 0
  let after = -1
  for (;;) {
    const { rows } = await pool.query<unknown[]>({
      text: `select ${COLUMNS.join(', ')} from calibration_pairs where phase = $1 and brace_id > $2 order by brace_id limit ${BATCH}`,
      values: [phase, after],
      rowMode: 'array',
    })
    for (const r of rows) {
      if (i >= count) break // rows appeared after the count (a refresh in between): the next version reloads
      const pid = r[C.project_id] as number
      let pi = projectIndex.get(pid)
      if (pi === undefined) {
        pi = projects.id.length
        projectIndex.set(pid, pi)
        projects.id.push(pid)
        projects.code.push(r[C.project_code] as string)
        projects.name.push(r[C.project_name] as string)
        projects.supplier.push((r[C.supplier_code] as string | null) ?? null)
        projects.office.push((r[C.office] as string | null) ?? null)
        projects.use.push((r[C.building_use] as string | null) ?? null)
        projects.sdc.push((r[C.sdc] as string | null) ?? null)
        projects.edition.push((r[C.aisc341_edition] as string | null) ?? null)
        projects.stories.push(num(r[C.stories]))
        projects.yearDesigned.push(num(r[C.year_designed]))
        projects.yearCompleted.push(num(r[C.year_completed]))
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
        let b = basisIndex[k].get(v.basis)
        if (b === undefined) {
          b = col.bases.length
          col.bases.push(v.basis)
          basisIndex[k].set(v.basis, b)
        }
        col.assumed[i] = v.assumed
        col.final[i] = v.final
        col.basis[i] = b
      }
      i++
    }
    if (rows.length < BATCH || i >= count) break
    after = rows[rows.length - 1]![C.brace_id] as number
  }
  const n = i
  const cut = <T extends Int32Array | Float64Array>(a: T) => (n === count ? a : (a.subarray(0, n) as T))
  return {
    version,
    phase,
    n,
    braceId: cut(braceId),
    project: cut(project),
    projects,
    frameLine: { codes: cut(frameLine.codes), values: frameLine.values },
    level: { codes: cut(level.codes), values: level.values },
    configuration: { codes: cut(configuration.codes), values: configuration.values },
    finalCoreArea: cut(finalCoreArea),
    yearDesigned: cut(yearDesigned),
    yearCompleted: cut(yearCompleted),
    q: Object.fromEntries(CALIBRATION_QUANTITIES.map(k => [k, { ...q[k], assumed: cut(q[k].assumed), final: cut(q[k].final), basis: cut(q[k].basis) }])) as PhaseData['q'],
  }
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

interface CacheEntry {
  value: Promise<unknown>
  /** Size once the value is known (0 while it is being computed). */
  bytes: number
}

interface Store {
  version: number
  phases: Map<string, Promise<PhaseData>>
  /** Answers by key, least recently used first (a Map keeps insertion order; a hit moves to the end). */
  cache: Map<string, CacheEntry>
  cacheBytes: number
}

const stores = new WeakMap<Db, Store>()
/** Bytes of cached answers kept per database (bodies of large point sets count by size). */
export const CACHE_BUDGET = 64 * 1024 * 1024

async function storeFor(db: Db): Promise<Store> {
  const version = await calibrationVersion(db)
  let s = stores.get(db)
  // Version answers reach their callers in the order the queries were sent (one query out at a
  // time, see calibrationVersion), so a differing version is the newer one.
  if (!s || s.version !== version) {
    s = { version, phases: new Map(), cache: new Map(), cacheBytes: 0 }
    stores.set(db, s)
  }
  return s
}

/**
 * The pairs of `phase` at the current data version, loaded once per version: requests that arrive
 * while it loads wait for the same load (no second load starts).
 */
export async function phaseData(db: Db, phase: string): Promise<PhaseData> {
  const s = await storeFor(db)
  let p = s.phases.get(phase)
  if (!p) {
    p = loadPhase(db, phase, s.version)
    s.phases.set(phase, p)
    p.catch(() => {
      if (s.phases.get(phase) === p) s.phases.delete(phase)
    })
  }
  return p
}

/** Rough size of a JSON-like answer: twice its JSON length (strings are UTF-16 in memory). */
export const jsonBytes = (v: unknown): number => 2 * (JSON.stringify(v)?.length ?? 0)

/**
 * An answer computed once per data version and key. Concurrent first requests for a key share one
 * computation; a failed computation is not kept. `bytes` sizes the answer against the cache budget
 * (least recently used entries leave first), so the cache stays bounded.
 */
export async function cached<T>(db: Db, key: string, compute: (version: number) => Promise<T>, bytesOf: (v: T) => number = jsonBytes): Promise<T> {
  const s = await storeFor(db)
  const hit = s.cache.get(key)
  if (hit) {
    s.cache.delete(key)
    s.cache.set(key, hit)
    return hit.value as Promise<T>
  }
  const value = compute(s.version)
  const entry: CacheEntry = { value, bytes: 0 }
  s.cache.set(key, entry)
  value.then(
    v => {
      if (s.cache.get(key) !== entry) return
      const bytes = bytesOf(v)
      if (bytes > CACHE_BUDGET / 4) {
        s.cache.delete(key)
        return
      }
      entry.bytes = bytes
      s.cacheBytes += bytes
      for (const [k, e] of s.cache) {
        if (s.cacheBytes <= CACHE_BUDGET) break
        if (e === entry) continue
        s.cache.delete(k)
        s.cacheBytes -= e.bytes
      }
    },
    () => {
      if (s.cache.get(key) === entry) s.cache.delete(key)
    },
  )
  return value
}

/** The cache of `db`'s current store, for tests: entries and bytes held. */
export function cacheStats(db: Db): { version: number; entries: number; bytes: number } | undefined {
  const s = stores.get(db)
  return s && { version: s.version, entries: s.cache.size, bytes: s.cacheBytes }
}

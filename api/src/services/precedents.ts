import { and, eq, sql } from 'drizzle-orm'
import { drizzle } from 'drizzle-orm/node-postgres'
import type pg from 'pg'
import { featureSpreads, prepareCandidates, rankPrecedents, type PrecedentCandidate, type PrecedentQuery, type PreparedCandidates } from '@shared/precedents/similarity'
import { DEFAULT_PRECEDENT_WEIGHTS, type PrecedentMatch, type PrecedentSearchBody, type PrecedentSearchResponse } from '@shared/schemas/precedents'
import { DESIGN_CAUTIONS } from '@shared/schemas/projects'
import { lateralTons } from '@shared/benchmarks/groups'
import { fromLastRead, historyCache } from './history-cache'
import { sliceClock } from './answer-freshness'
import { LB_PER_SHORT_TON } from '@shared/units/constants'
import { knToKip } from '@shared/units/force'
import { ftToIn, mToIn } from '@shared/units/length'
import { schema, type Db } from '../db'
import { changedSince, idArrayLiteral, inSnapshot, readVersionIn } from '../db/calibration'
import { frames, levels, projects, suppliers } from '../db/history-schema'

/**
 * Precedent finder: every frame line of a finished (non-draft) project is a candidate; its features
 * are the first-story shear, the project's stories (else the frame's level count), the mean story
 * height, the bay width, its configuration, and the project's SDC, use and supplier. Final values
 * shown are confirmed governing snapshots only (nothing waiting in the review queue).
 */

interface Candidate extends PrecedentCandidate {
  frameId: number
  projectId: number
  name: string
  yearDesigned: number | null
  floorAreaFt2: number | null
  bays: number
  /** Levels of the frame. */
  levelCount: number
}

/** Every frame of a non-draft project; only those of `projectIds` when given. */
export async function loadCandidates(db: Db, projectIds?: readonly number[]): Promise<Candidate[]> {
  const rows = await db
    .select({
      frameId: frames.id,
      projectId: projects.id,
      code: projects.code,
      name: projects.name,
      yearDesigned: projects.yearDesigned,
      floorAreaFt2: projects.floorAreaFt2,
      frameLine: frames.frameLine,
      bays: frames.bays,
      configuration: sql<string>`${frames.configuration}::text`,
      bayWidth: frames.bayWidthIn,
      projectStories: projects.stories,
      levelCount: sql<number>`count(${levels.id})`.mapWith(Number),
      storyShear: sql<number | null>`max(${levels.storyShearKip}) filter (where ${levels.levelIndex} = 1)`.mapWith(v => (v === null ? null : Number(v))),
      storyHeight: sql<number | null>`avg(${levels.storyHeightIn})`.mapWith(v => (v === null ? null : Number(v))),
      sdc: projects.sdc,
      buildingUse: projects.buildingUse,
      supplier: suppliers.code,
    })
    .from(frames)
    .innerJoin(projects, eq(projects.id, frames.projectId))
    .leftJoin(suppliers, eq(suppliers.id, projects.supplierId))
    .leftJoin(levels, eq(levels.frameId, frames.id))
    .where(projectIds ? and(eq(projects.draft, false), sql`${projects.id} = any(${idArrayLiteral(projectIds)}::integer[])`) : eq(projects.draft, false))
    .groupBy(frames.id, projects.id, suppliers.code)
  return rows.map(({ projectStories, ...r }) => ({ ...r, stories: projectStories ?? (r.levelCount || null) }))
}

/** The description in stored units (kip, in). */
export function toStoredQuery(body: PrecedentSearchBody): PrecedentQuery {
  const d = body.description
  const si = body.units === 'si'
  const len = (v: number | undefined) => (v === undefined ? undefined : si ? mToIn(v) : ftToIn(v))
  const q: PrecedentQuery = {
    storyShear: d.storyShear === undefined ? undefined : si ? knToKip(d.storyShear) : d.storyShear,
    stories: d.stories,
    storyHeight: len(d.storyHeight),
    bayWidth: len(d.bayWidth),
    configuration: d.configuration,
    sdc: d.sdc,
    buildingUse: d.buildingUse,
    supplier: d.supplier,
  }
  return Object.fromEntries(Object.entries(q).filter(([, v]) => v !== undefined)) as PrecedentQuery
}

/**
 * A column of values kept as codes into its distinct values (0 = null, k = `values[k − 1]`): two bytes
 * a row while a column has at most 65 535 distinct values, four beyond.
 */
class CodedColumn<V extends number | string> {
  codes: Uint16Array | Uint32Array
  readonly values: V[] = []
  private index: Map<V | '-0', number> | null = new Map()
  constructor(rows: number) {
    this.codes = new Uint16Array(rows)
  }
  set(row: number, value: V | null): void {
    if (value === null) return
    // A Map key does not tell −0 from 0; −0 gets a code of its own.
    const key = Object.is(value, -0) ? '-0' : value
    let code = this.index!.get(key)
    if (code === undefined) {
      code = this.values.push(value)
      this.index!.set(key, code)
      if (code > 0xffff && this.codes instanceof Uint16Array) this.codes = Uint32Array.from(this.codes)
    }
    this.codes[row] = code
  }
  get(row: number): V | null {
    const code = this.codes[row]!
    return code === 0 ? null : this.values[code - 1]!
  }
  /** Done writing: drops the lookup. */
  seal(): this {
    this.index = null
    return this
  }
}

/** What a level shows besides its name and index, in the order of the level query's columns. */
const LEVEL_VALUES = [
  'storyHeightIn',
  'storyShearKip',
  'sdCoreArea',
  'sdBeta',
  'sdOmega',
  'sdStiffness',
  'finCoreArea',
  'finBeta',
  'finOmega',
  'finStiffness',
  'finDriftMultiple',
] as const

/**
 * The levels of every candidate frame with the values a match shows, in columns (about 27 bytes a
 * level while values repeat). Levels of candidate i (list order) are rows `start[i]` to
 * `start[i + 1] − 1`, bottom story first. Per level: the confirmed schematic-design snapshot of its
 * brace (`sd*`; of several revisions the lowest) and its confirmed governing snapshot (`fin*`; the
 * first by phase, then revision) — the first of each in the order the search's per-request query
 * used to return them (the snapshots' brace, phase, revision index).
 */
export interface FrameLevels extends Record<(typeof LEVEL_VALUES)[number], CodedColumn<number>> {
  start: Int32Array
  name: CodedColumn<string>
  levelIndex: Int16Array
  /** 1: has a confirmed sd snapshot; 2: has a confirmed governing one. */
  has: Uint8Array
}

/** Braces of the projects `ids` (a subquery), so the snapshot scans of a partial read stay partial. */
const bracesOf = (ids: readonly number[]) =>
  `brace_id in (select b2.id from braces b2 join levels l2 on l2.id = b2.level_id join frames f2 on f2.id = l2.frame_id where f2.project_id = any('${idArrayLiteral(ids)}'::integer[]))`
const levelsSql = (projectIds?: readonly number[]) => `select l.frame_id, l.name, l.level_index, sd.brace_id is not null, fin.brace_id is not null,
    l.story_height_in, l.story_shear_kip,
    sd.core_area_in2, sd.beta, sd.omega, sd.stiffness_factor,
    fin.core_area_in2, fin.beta, fin.omega, fin.stiffness_factor, fin.factor_drift_multiple
  from levels l
  join frames f on f.id = l.frame_id
  join projects p on p.id = f.project_id and not p.draft${projectIds ? ` and p.id = any('${idArrayLiteral(projectIds)}'::integer[])` : ''}
  left join braces b on b.level_id = l.id
  left join (select distinct on (brace_id) brace_id, core_area_in2, beta, omega, stiffness_factor
      from brace_snapshots where confirmed and phase = 'sd'${projectIds ? ` and ${bracesOf(projectIds)}` : ''} order by brace_id, revision) sd on sd.brace_id = b.id
  left join (select distinct on (brace_id) brace_id, core_area_in2, beta, omega, stiffness_factor, factor_drift_multiple
      from brace_snapshots where confirmed and governing${projectIds ? ` and ${bracesOf(projectIds)}` : ''} order by brace_id, phase, revision) fin on fin.brace_id = b.id
  order by l.frame_id, l.level_index, l.id`
const FIRST_VALUE = 5

const LEVEL_BATCH = 5000

/**
 * Every candidate's levels (see `FrameLevels`), read on `client` inside the transaction that read
 * `candidates` (their level counts place the rows), through a cursor in batches so that only one
 * batch of rows is in memory at a time.
 */
async function loadFrameLevels(client: pg.PoolClient, candidates: readonly Candidate[], slot: ReadonlyMap<number, number>, projectIds?: readonly number[]): Promise<FrameLevels> {
  const out = emptyLevels(candidates)
  const { start } = out
  const values = LEVEL_VALUES.map(k => out[k])
  const next = start.slice(0, candidates.length)
  await client.query(`declare precedent_levels no scroll cursor for ${levelsSql(projectIds)}`)
  for (;;) {
    const { rows } = await client.query<unknown[]>({ text: `fetch ${LEVEL_BATCH} from precedent_levels`, rowMode: 'array' })
    for (const r of rows) {
      const i = slot.get(r[0] as number)
      if (i === undefined || next[i]! >= start[i + 1]!) throw new Error(`precedents: the levels of frame ${String(r[0])} do not match its level count`)
      const k = next[i]!++
      out.name.set(k, r[1] as string)
      out.levelIndex[k] = r[2] as number
      out.has[k] = (r[3] ? 1 : 0) | (r[4] ? 2 : 0)
      for (let v = 0; v < values.length; v++) values[v]!.set(k, r[FIRST_VALUE + v] as number | null)
    }
    if (rows.length < LEVEL_BATCH) break
  }
  await client.query('close precedent_levels')
  if (next.some((k, i) => k !== start[i + 1])) throw new Error('precedents: fewer levels than the frames count')
  return sealLevels(out)
}

/** Level columns for `candidates`, sized by their level counts, every value missing. */
function emptyLevels(candidates: readonly Candidate[]): FrameLevels {
  const start = new Int32Array(candidates.length + 1)
  for (let i = 0; i < candidates.length; i++) start[i + 1] = start[i]! + candidates[i]!.levelCount
  const n = start[candidates.length]!
  return {
    start,
    name: new CodedColumn<string>(n),
    levelIndex: new Int16Array(n),
    has: new Uint8Array(n),
    ...(Object.fromEntries(LEVEL_VALUES.map(k => [k, new CodedColumn<number>(n)])) as Record<(typeof LEVEL_VALUES)[number], CodedColumn<number>>),
  }
}

function sealLevels(L: FrameLevels): FrameLevels {
  L.name.seal()
  for (const k of LEVEL_VALUES) L[k].seal()
  return L
}

/** Copies candidate `i`'s levels in `from` to rows `at`… of `to`. */
function copyLevels(from: FrameLevels, i: number, to: FrameLevels, at: number): void {
  for (let k = from.start[i]!, r = at; k < from.start[i + 1]!; k++, r++) {
    to.name.set(r, from.name.get(k))
    to.levelIndex[r] = from.levelIndex[k]!
    to.has[r] = from.has[k]!
    for (const v of LEVEL_VALUES) to[v].set(r, from[v].get(k))
  }
}

/** Final tonnage by category of every project that has some. */
async function loadFinalTonnage(client: pg.PoolClient, projectIds?: readonly number[]): Promise<Map<number, Record<string, number>>> {
  const only = projectIds ? ` and project_id = any('${idArrayLiteral(projectIds)}'::integer[])` : ''
  const { rows } = await client.query<unknown[]>({ text: `select project_id, category::text, tons_short from tonnage where stage = 'final'${only}`, rowMode: 'array' })
  const byProject = new Map<number, Record<string, number>>()
  for (const [projectId, category, tons] of rows as [number, string, number][]) {
    let final = byProject.get(projectId)
    if (!final) byProject.set(projectId, (final = {}))
    final[category] = tons
  }
  return byProject
}

interface History {
  /** The data version the history was read at (one snapshot). */
  version: number
  candidates: Candidate[]
  prepared: PreparedCandidates<Candidate>
  spreads: ReturnType<typeof featureSpreads>
  /** Candidate index (list order) by frame id. */
  slot: Map<number, number>
  levels: FrameLevels
  finalTonnage: Map<number, Record<string, number>>
}

type HistoryData = Pick<History, 'candidates' | 'levels' | 'finalTonnage'>

/** The frames, levels and final tonnage of every finished project (only of `projectIds` when given), on `client`. */
async function readHistory(client: pg.PoolClient, projectIds?: readonly number[]): Promise<HistoryData> {
  const candidates = await loadCandidates(drizzle(client, { schema }), projectIds)
  const slot = new Map(candidates.map((c, i) => [c.frameId, i]))
  const levels = await loadFrameLevels(client, candidates, slot, projectIds)
  const finalTonnage = await loadFinalTonnage(client, projectIds)
  return { candidates, levels, finalTonnage }
}

/**
 * `base` with the frames, levels and tonnage of the `changed` projects replaced by `part` (what
 * those projects hold now; a project gone or turned draft is simply absent from it). The list
 * order differs from a full read's, which the ranking does not depend on (ties go by code and
 * frame line, see prepareCandidates).
 */
async function mergeHistory(base: HistoryData, part: HistoryData, changed: ReadonlySet<number>): Promise<HistoryData> {
  const kept: number[] = []
  for (let i = 0; i < base.candidates.length; i++) if (!changed.has(base.candidates[i]!.projectId)) kept.push(i)
  const candidates = [...kept.map(i => base.candidates[i]!), ...part.candidates]
  const levels = emptyLevels(candidates)
  // Tens of thousands of frames: requests waiting meanwhile are let in (sliceClock).
  const due = sliceClock()
  for (let j = 0; j < kept.length; j++) {
    copyLevels(base.levels, kept[j]!, levels, levels.start[j]!)
    if ((j & 1023) === 0) await due()
  }
  part.candidates.forEach((_, i) => copyLevels(part.levels, i, levels, levels.start[kept.length + i]!))
  const finalTonnage = new Map(base.finalTonnage)
  for (const id of changed) finalTonnage.delete(id)
  for (const [id, t] of part.finalTonnage) finalTonnage.set(id, t)
  return { candidates, levels: sealLevels(levels), finalTonnage }
}

export interface PrecedentLoadReport {
  version: number
  /** 'delta': the previous history with only the `projects` changed since read again. */
  kind: 'full' | 'delta' | 'unchanged'
  projects: number
  frames: number
  ms: number
}

let loadListener: ((r: PrecedentLoadReport) => void) | null = null
/** Called after every read of the precedent history (the production server logs them). */
export function onPrecedentLoad(listener: ((r: PrecedentLoadReport) => void) | null): void {
  loadListener = listener
}

/**
 * Every past frame, its levels and its project's final tonnage at the current data version, read
 * in one snapshot. From `base` (an earlier version's history) only the projects changed since are
 * read again, when the change log covers every version in between (the rule the analytics
 * columns follow, see reloadPhase); otherwise everything is.
 */
async function loadHistory(db: Db, base: History | undefined): Promise<History> {
  const t0 = performance.now()
  let report: Omit<PrecedentLoadReport, 'ms' | 'frames'>
  const { version, data } = await inSnapshot(db, async client => {
    const version = await readVersionIn(client)
    const changed = base ? await changedSince(client, base.version, version) : null
    if (base && changed && changed.length === 0) {
      report = { version, kind: 'unchanged', projects: 0 }
      return { version, data: base as HistoryData }
    }
    if (base && changed) {
      report = { version, kind: 'delta', projects: changed.length }
      return { version, data: await mergeHistory(base, await readHistory(client, changed), new Set(changed)) }
    }
    const data = await readHistory(client)
    report = { version, kind: 'full', projects: new Set(data.candidates.map(c => c.projectId)).size }
    return { version, data }
  })
  const history = ((): History => {
    if (base && data === base) return { ...base, version }
    const prepared = prepareCandidates(data.candidates)
    return { version, ...data, prepared, spreads: prepared.spreads, slot: new Map(data.candidates.map((c, i) => [c.frameId, i])) }
  })()
  loadListener?.({ ...report!, frames: history.candidates.length, ms: Math.round(performance.now() - t0) })
  return history
}

// Every past frame laid out for ranking, its levels and final tonnage: the same for every search until the data changes.
const historyEntry = historyCache<History>()
/** A history read from the latest one read before it. */
const readHistoryFromLast = fromLastRead(loadHistory)

/** The levels of candidate `i` as a match shows them. */
function levelsOf(L: FrameLevels, i: number): PrecedentMatch['levels'] {
  const out: PrecedentMatch['levels'] = []
  for (let k = L.start[i]!; k < L.start[i + 1]!; k++) {
    const sd = L.has[k]! & 1
    const fin = L.has[k]! & 2
    out.push({
      level: L.name.get(k)!,
      levelIndex: L.levelIndex[k]!,
      storyHeightIn: L.storyHeightIn.get(k)!,
      storyShearKip: L.storyShearKip.get(k)!,
      preliminaryCoreAreaIn2: sd ? L.sdCoreArea.get(k) : null,
      finalCoreAreaIn2: fin ? L.finCoreArea.get(k) : null,
      assumed: sd ? { beta: L.sdBeta.get(k), omega: L.sdOmega.get(k), stiffnessFactor: L.sdStiffness.get(k) } : null,
      final: fin ? { beta: L.finBeta.get(k), omega: L.finOmega.get(k), stiffnessFactor: L.finStiffness.get(k), factorDriftMultiple: L.finDriftMultiple.get(k) } : null,
    })
  }
  return out
}

/** Every past frame laid out for ranking, read once per data version. */
const historyOf = (db: Db): Promise<History> => historyEntry(db, () => readHistoryFromLast(db))

/** Lays out the past frames for ranking ahead of the first search (a server does this once it listens). */
export async function warmPrecedents(db: Db): Promise<number> {
  return (await historyOf(db)).candidates.length
}

/** `POST /api/precedents/search`. */
export async function searchPrecedents(db: Db, body: PrecedentSearchBody): Promise<PrecedentSearchResponse> {
  const history = await historyOf(db)
  const { candidates, spreads } = history
  const weights = { ...DEFAULT_PRECEDENT_WEIGHTS, ...body.weights }
  const ranked = rankPrecedents(toStoredQuery(body), history.prepared, { weights, spreads, limit: body.limit })
  return {
    candidates: candidates.length,
    weights,
    spreads,
    matches: ranked.map((r, i) => {
      const c = r.candidate
      const final = history.finalTonnage.get(c.projectId) ?? {}
      const perArea = (t: number | null | undefined) => (t != null && c.floorAreaFt2 ? (t * LB_PER_SHORT_TON) / c.floorAreaFt2 : null)
      return {
        rank: i + 1,
        code: c.code,
        name: c.name,
        frameLine: c.frameLine,
        yearDesigned: c.yearDesigned,
        configuration: c.configuration as PrecedentMatch['configuration'],
        bays: c.bays,
        bayWidthIn: c.bayWidth ?? 0,
        similarity: r.similarity,
        distance: r.distance,
        breakdown: r.breakdown,
        levels: levelsOf(history.levels, history.slot.get(c.frameId)!),
        lateralLbPerFt2: perArea(lateralTons(final)),
        structuralLbPerFt2: perArea(final.structural_total),
      }
    }),
    cautions: ['Precedents show how similar past frames turned out; they do not size this frame.', ...DESIGN_CAUTIONS],
  }
}

import { and, eq, inArray, notExists, sql, type SQL } from 'drizzle-orm'
import type { Role } from '@shared/auth/roles'
import { buildGroups, describeCriteria, proposalFromGroup, proposalGroup, proposalGroupKey, type Audience, type BenchmarkProject } from '@shared/benchmarks/groups'
import { BENCHMARK_METRICS, METRIC_UNITS, MIN_PUBLISHED_GROUP, type BenchmarkQuery, type BenchmarkResponse, type ProposalBody, type ProposalResponse } from '@shared/schemas/benchmarks'
import { drizzle } from 'drizzle-orm/node-postgres'
import { schema, type Db } from '../db'
import { changedSince, inSnapshot, readVersionIn } from '../db/calibration'
import { braces, braceSnapshots, frames, levels, projects, reviewItems, tonnage } from '../db/history-schema'
import { fromLastRead, historyCache } from './history-cache'
import { cached } from './calibration/store'

/**
 * Steel tonnage benchmarks over the finished projects (drafts and probable duplicates awaiting
 * review left out). Confidentiality and suppression are applied by the shared `publishGroup` for
 * the caller's role; nothing here sends a client name to anyone.
 */

export const BENCHMARK_CAUTIONS = [
  'Benchmarks describe the firm’s past projects; they are a starting point for a fee proposal, not a design or a quantity take-off.',
  'Tonnage scope differs between projects and offices (see each project’s scope); compare like with like.',
  'Preliminary design aid: verify with the supplier’s qualified values and the governing code; the engineer of record decides.',
]

export const audienceOf = (role: Role | undefined): Audience => (role === 'bd' ? 'bd' : 'analyst')

type Filters = Pick<BenchmarkQuery, 'yearFrom' | 'yearTo' | 'use' | 'sdc' | 'region'>

/**
 * Every finished project with the figures the benchmarks need, ascending by project id, at the data
 * version its snapshot read (`kind`: how it was read).
 */
export interface BenchmarkList {
  version: number
  kind: 'full' | 'delta' | 'unchanged'
  ids: number[]
  projects: BenchmarkProject[]
}

/** The list, read once per data version. */
const listCache = historyCache<BenchmarkList>()
/** A list read from the latest one read before it. */
const readListFromLast = fromLastRead(readBenchmarkList)

/**
 * The finished projects behind the benchmarks matching `filters`: the whole list is read once per
 * data version and filtered here, the way the query's own conditions would (a missing year, use,
 * SDC or region never matches a filter on it).
 */
export async function loadBenchmarkProjects(db: Db, filters: Filters = {}): Promise<BenchmarkProject[]> {
  const { projects: all } = await listCache(db, () => readListFromLast(db))
  const { yearFrom, yearTo } = filters
  const use = filters.use?.length ? new Set<string>(filters.use) : null
  const sdc = filters.sdc?.length ? new Set<string>(filters.sdc) : null
  const region = filters.region?.length ? new Set<string>(filters.region) : null
  if (yearFrom === undefined && yearTo === undefined && !use && !sdc && !region) return all
  return all.filter(
    p =>
      (yearFrom === undefined || (p.yearDesigned !== null && p.yearDesigned >= yearFrom)) &&
      (yearTo === undefined || (p.yearDesigned !== null && p.yearDesigned <= yearTo)) &&
      (!use || (p.buildingUse !== null && use.has(p.buildingUse))) &&
      (!sdc || (p.sdc !== null && sdc.has(p.sdc))) &&
      (!region || (p.region !== null && region.has(p.region))),
  )
}

/**
 * The benchmark list in one read-only snapshot. With `base` (a list read before) and a change log
 * that covers the versions in between (`changedSince`), only the changed projects are read again
 * and merged into the base's, as the analytics columns and the precedent history are: after an
 * import of a few hundred projects that is a few hundred instead of every project's frames, braces
 * and tonnage. Otherwise, or without a base, every project is read.
 */
export async function readBenchmarkList(db: Db, base?: BenchmarkList): Promise<BenchmarkList> {
  return inSnapshot(db, async client => {
    const version = await readVersionIn(client)
    const changed = base ? await changedSince(client, base.version, version) : null
    if (base && changed && changed.length === 0) return { ...base, version, kind: 'unchanged' as const }
    const read = await queryBenchmarkProjects(drizzle(client, { schema }), changed ?? undefined)
    if (!base || !changed) return { version, kind: 'full' as const, ...read }
    // Both ascending by id: the base without the changed projects, with the changed ones read again merged in.
    const gone = new Set(changed)
    const ids: number[] = []
    const list: BenchmarkProject[] = []
    let j = 0
    for (let i = 0; i < base.ids.length; i++) {
      const id = base.ids[i]!
      if (gone.has(id)) continue
      for (; j < read.ids.length && read.ids[j]! < id; j++) ids.push(read.ids[j]!), list.push(read.projects[j]!)
      ids.push(id)
      list.push(base.projects[i]!)
    }
    for (; j < read.ids.length; j++) ids.push(read.ids[j]!), list.push(read.projects[j]!)
    return { version, kind: 'delta' as const, ids, projects: list }
  })
}

/** The finished projects' benchmark figures (only those of `projectIds` when given), ascending by id. */
async function queryBenchmarkProjects(db: Db, projectIds?: readonly number[]): Promise<{ ids: number[]; projects: BenchmarkProject[] }> {
  const where: SQL[] = [
    eq(projects.draft, false),
    // A probable duplicate counts only once someone has confirmed it is a separate building.
    notExists(
      db
        .select({ one: sql`1` })
        .from(reviewItems)
        .where(and(eq(reviewItems.projectCode, projects.code), eq(reviewItems.field, 'project'), eq(reviewItems.status, 'open'))),
    ),
  ]
  if (projectIds) {
    if (projectIds.length === 0) return { ids: [], projects: [] }
    where.push(inArray(projects.id, [...projectIds]))
  }
  const rows = await db.select().from(projects).where(and(...where)).orderBy(projects.id)
  if (rows.length === 0) return { ids: [], projects: [] }
  // The projects' ids as a subquery, not a list of thousands of parameters to send and plan.
  const ids = db.select({ id: projects.id }).from(projects).where(and(...where))

  const frameRows = await db
    .select({
      projectId: frames.projectId,
      frames: sql<number>`count(distinct ${frames.id})`.mapWith(Number),
      baseShear: sql<number | null>`sum(${levels.storyShearKip}) filter (where ${levels.levelIndex} = 1)`.mapWith(v => (v === null ? null : Number(v))),
    })
    .from(frames)
    .leftJoin(levels, eq(levels.frameId, frames.id))
    .where(inArray(frames.projectId, ids))
    .groupBy(frames.projectId)

  const coreRows = await db
    .select({
      projectId: frames.projectId,
      braces: sql<number>`count(distinct ${braces.id})`.mapWith(Number),
      withFinal: sql<number>`count(distinct ${braces.id}) filter (where ${braceSnapshots.id} is not null and ${braceSnapshots.coreAreaIn2} is not null)`.mapWith(Number),
      coreArea: sql<number | null>`sum(${braces.braceCount} * ${braceSnapshots.coreAreaIn2})`.mapWith(v => (v === null ? null : Number(v))),
    })
    .from(braces)
    .innerJoin(levels, eq(levels.id, braces.levelId))
    .innerJoin(frames, eq(frames.id, levels.frameId))
    .leftJoin(braceSnapshots, and(eq(braceSnapshots.braceId, braces.id), eq(braceSnapshots.governing, true), eq(braceSnapshots.confirmed, true)))
    .where(inArray(frames.projectId, ids))
    .groupBy(frames.projectId)

  const tonRows = await db.select().from(tonnage).where(inArray(tonnage.projectId, ids))

  const frameBy = new Map(frameRows.map(r => [r.projectId, r]))
  const coreBy = new Map(coreRows.map(r => [r.projectId, r]))
  const tonBy = new Map<number, BenchmarkProject['tonnage']>()
  for (const row of tonRows) {
    let t = tonBy.get(row.projectId)
    if (!t) tonBy.set(row.projectId, (t = { preliminary: {}, final: {} }))
    t[row.stage][row.category] = row.tons
  }
  const list = rows.map(r => {
    const f = frameBy.get(r.id)
    const c = coreBy.get(r.id)
    const t: BenchmarkProject['tonnage'] = tonBy.get(r.id) ?? { preliminary: {}, final: {} }
    return {
      code: r.code,
      name: r.name,
      clientConfidential: r.clientConfidential,
      benchmarkPermitted: r.benchmarkPermitted,
      buildingUse: r.buildingUse,
      stories: r.stories,
      sdc: r.sdc,
      region: r.region,
      yearDesigned: r.yearDesigned,
      floorAreaFt2: r.floorAreaFt2,
      frames: f?.frames ?? 0,
      baseShearKip: f?.baseShear ?? null,
      totalCoreAreaIn2: c && c.braces > 0 && c.withFinal === c.braces ? c.coreArea : null,
      tonnage: t,
    }
  })
  return { ids: rows.map(r => r.id), projects: list }
}

/**
 * `GET /api/benchmarks` for a caller of `role`. The answer depends only on the query and the
 * audience, so it is kept (bounded by size, beside the analytics answers) until the data changes;
 * callers must not change it.
 */
export async function benchmarks(db: Db, query: BenchmarkQuery, role: Role | undefined): Promise<BenchmarkResponse> {
  const audience = audienceOf(role)
  return cached(db, `benchmarks|${audience}|${JSON.stringify(query)}`, async () => benchmarksOf(await loadBenchmarkProjects(db, query), query, audience))
}

function benchmarksOf(list: BenchmarkProject[], query: BenchmarkQuery, audience: Audience): BenchmarkResponse {
  const cautions = [...BENCHMARK_CAUTIONS]
  if (audience === 'bd') cautions.push(`Groups of fewer than ${MIN_PUBLISHED_GROUP} projects are not published; confidential projects count in the figures but are never named.`)
  return {
    groupBy: query.groupBy,
    units: query.units,
    metricUnits: Object.fromEntries(BENCHMARK_METRICS.map(m => [m, METRIC_UNITS[m][query.units]])),
    n: list.length,
    groups: buildGroups(list, query.groupBy, query.units, audience),
    cautions,
  }
}

/**
 * `POST /api/benchmarks/proposal`: the benchmark range and expected tonnage for one building. The
 * comparison group and its bands depend on the use, height band, SDC, region and units only; they
 * are kept per data version, and the floor area scales them per request.
 */
export async function proposal(db: Db, body: ProposalBody): Promise<ProposalResponse> {
  const group = await cached(db, `proposal-group|${proposalGroupKey(body)}`, async () => proposalGroup(await loadBenchmarkProjects(db), body))
  const { widened, ...result } = proposalFromGroup(body, group)
  const cautions = [...BENCHMARK_CAUTIONS]
  if (result.group) {
    cautions.unshift(`Based on ${result.group.n} past projects (${describeCriteria(result.group.criteria)}); the range is their P25–P75.`)
    if (widened.length) cautions.unshift(`No group of at least ${MIN_PUBLISHED_GROUP} projects matched ${widened[0]}; the comparison was widened to ${describeCriteria(result.group.criteria)}.`)
    if (result.group.n < 10) cautions.push(`Only ${result.group.n} projects: treat the range as indicative.`)
  } else cautions.unshift(`The history has fewer than ${MIN_PUBLISHED_GROUP} projects with tonnage and floor area to compare; no benchmark can be given.`)
  return { ...result, cautions }
}

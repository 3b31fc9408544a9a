import { and, asc, desc, eq, exists, gte, ilike, inArray, lte, or, sql, type SQL } from 'drizzle-orm'
import { adjustedStrengthsOf } from '@shared/history/snapshot'
import {
  DESIGN_CAUTIONS,
  type BraceView,
  type FactorSet,
  type FrameView,
  type Phase,
  type ProjectDetail,
  type ProjectList,
  type ProjectListItem,
  type ProjectListQuery,
  type ProjectSort,
  type SnapshotView,
} from '@shared/schemas/projects'
import type { Db, DbOrTx } from '../db'
import { braces, braceSnapshots, frames, importRuns, levels, projects, suppliers, tonnage } from '../db/history-schema'
import { notFound } from '../errors'

/** Phase order of a brace's timeline: the firm's design phases, then the supplier's. */
export const PHASE_ORDER: Record<Phase, number> = { sd: 0, dd: 1, cd: 2, submittal: 3, approved: 4, coupon: 5 }

/** Sorts snapshots by phase, then revision. */
export const byPhase = <T extends { phase: Phase; revision: number }>(a: T, b: T) => PHASE_ORDER[a.phase] - PHASE_ORDER[b.phase] || a.revision - b.revision

const frameCount = sql<number>`(select count(*) from ${frames} where ${frames.projectId} = ${projects.id})`.mapWith(Number)
const configurationsOf = sql<string[]>`(select coalesce(array_agg(distinct ${frames.configuration}::text order by ${frames.configuration}::text), '{}') from ${frames} where ${frames.projectId} = ${projects.id})`

const listColumns = {
  id: projects.id,
  code: projects.code,
  name: projects.name,
  client: projects.client,
  clientConfidential: projects.clientConfidential,
  benchmarkPermitted: projects.benchmarkPermitted,
  office: projects.office,
  region: projects.region,
  buildingUse: projects.buildingUse,
  sdc: projects.sdc,
  stories: projects.stories,
  heightFt: projects.heightFt,
  floorAreaFt2: projects.floorAreaFt2,
  yearDesigned: projects.yearDesigned,
  yearCompleted: projects.yearCompleted,
  phaseReached: projects.phaseReached,
  draft: projects.draft,
  supplierCode: suppliers.code,
  supplierName: suppliers.displayName,
  frameCount,
  configurations: configurationsOf,
}

const SORT_COLUMNS: Record<ProjectSort, SQL | typeof projects.code> = {
  code: projects.code,
  name: sql`lower(${projects.name})`,
  yearDesigned: sql`${projects.yearDesigned}`,
  yearCompleted: sql`${projects.yearCompleted}`,
  stories: sql`${projects.stories}`,
  heightFt: sql`${projects.heightFt}`,
  floorAreaFt2: sql`${projects.floorAreaFt2}`,
  sdc: sql`${projects.sdc}`,
  buildingUse: sql`${projects.buildingUse}`,
  supplier: sql`${suppliers.code}`,
  region: sql`${projects.region}`,
  office: sql`${projects.office}`,
  updatedAt: sql`${projects.updatedAt}`,
}

/** `%` and `_` typed by the user match themselves. */
const likeEscape = (s: string) => s.replace(/[\\%_]/g, m => `\\${m}`)

function listWhere(db: Db, q: ProjectListQuery): SQL | undefined {
  const where: (SQL | undefined)[] = []
  if (q.q) where.push(or(ilike(projects.code, `%${likeEscape(q.q)}%`), ilike(projects.name, `%${likeEscape(q.q)}%`)))
  if (q.yearFrom !== undefined) where.push(gte(projects.yearDesigned, q.yearFrom))
  if (q.yearTo !== undefined) where.push(lte(projects.yearDesigned, q.yearTo))
  if (q.supplier?.length) where.push(inArray(projects.supplierId, db.select({ id: suppliers.id }).from(suppliers).where(inArray(suppliers.code, q.supplier))))
  if (q.use?.length) where.push(inArray(projects.buildingUse, q.use))
  if (q.sdc?.length) where.push(inArray(projects.sdc, q.sdc))
  if (q.configuration?.length) {
    where.push(exists(db.select({ one: sql`1` }).from(frames).where(and(eq(frames.projectId, projects.id), inArray(frames.configuration, q.configuration)))))
  }
  if (q.storiesMin !== undefined) where.push(gte(projects.stories, q.storiesMin))
  if (q.storiesMax !== undefined) where.push(lte(projects.stories, q.storiesMax))
  if (q.status !== 'all') where.push(eq(projects.draft, q.status === 'draft'))
  return and(...where)
}

/** `GET /api/projects`: one page of projects, sorted on a whitelisted column (then by code), with the total. */
export async function listProjects(db: Db, q: ProjectListQuery): Promise<ProjectList> {
  const where = listWhere(db, q)
  const sortCol = SORT_COLUMNS[q.sort]
  const primary = q.order === 'desc' ? sql`${sortCol} desc nulls last` : sql`${sortCol} asc nulls last`
  const [rows, [total]] = await Promise.all([
    db
      .select(listColumns)
      .from(projects)
      .leftJoin(suppliers, eq(suppliers.id, projects.supplierId))
      .where(where)
      .orderBy(primary, q.order === 'desc' ? desc(projects.code) : asc(projects.code))
      .limit(q.pageSize)
      .offset((q.page - 1) * q.pageSize),
    db.select({ n: sql<number>`count(*)`.mapWith(Number) }).from(projects).where(where),
  ])
  return { items: rows as ProjectListItem[], total: total!.n, page: q.page, pageSize: q.pageSize }
}

type SnapshotRow = typeof braceSnapshots.$inferSelect

export function toSnapshotView(s: SnapshotRow): SnapshotView {
  return {
    id: s.id,
    phase: s.phase,
    revision: s.revision,
    date: s.date,
    sourceDocument: s.sourceDocument,
    requiredCoreAreaIn2: s.requiredCoreAreaIn2,
    coreAreaIn2: s.coreAreaIn2,
    fyscKsi: s.fyscKsi,
    fyscBasis: s.fyscBasis,
    fyscMaxKsi: s.fyscMaxKsi,
    ry: s.ry,
    beta: s.beta,
    omega: s.omega,
    factorDriftMultiple: s.factorDriftMultiple,
    stiffnessFactor: s.stiffnessFactor,
    yieldLengthRatio: s.yieldLengthRatio,
    adjustedTensionKip: s.adjustedTensionKip,
    adjustedCompressionKip: s.adjustedCompressionKip,
    governing: s.governing,
    confirmed: s.confirmed,
  }
}

/** The factors of a snapshot, with Tmax/Cmax recomputed by the engine (stored values when the inputs are incomplete). */
export function factorSetOf(s: SnapshotView): FactorSet {
  const a = adjustedStrengthsOf(s)
  return {
    phase: s.phase,
    revision: s.revision,
    beta: s.beta,
    omega: s.omega,
    ry: s.ry,
    fyscKsi: s.fyscKsi,
    fyscBasis: s.fyscBasis,
    fyscMaxKsi: s.fyscMaxKsi,
    stiffnessFactor: s.stiffnessFactor,
    yieldLengthRatio: s.yieldLengthRatio,
    factorDriftMultiple: s.factorDriftMultiple,
    tmaxKip: a.tensionKip ?? s.adjustedTensionKip,
    cmaxKip: a.compressionKip ?? s.adjustedCompressionKip,
    confirmed: s.confirmed,
  }
}

/** A brace's view: assumed (sd), final (governing), core areas and the whole timeline. */
export function braceViewOf(b: typeof braces.$inferSelect, snaps: SnapshotView[]): BraceView {
  const timeline = [...snaps].sort(byPhase)
  const sd = timeline.find(s => s.phase === 'sd') ?? null
  const fin = timeline.find(s => s.governing) ?? null
  const design = timeline.filter(s => s.phase === 'sd' || s.phase === 'dd' || s.phase === 'cd')
  return {
    id: b.id,
    braceCount: b.braceCount,
    angleDeg: b.angleDeg,
    workPointLengthIn: b.workPointLengthIn,
    requiredStrengthKip: b.requiredStrengthKip,
    method: b.method,
    requiredCoreAreaIn2: sd?.requiredCoreAreaIn2 ?? [...design].reverse().find(s => s.requiredCoreAreaIn2 !== null)?.requiredCoreAreaIn2 ?? null,
    preliminaryCoreAreaIn2: sd?.coreAreaIn2 ?? null,
    finalCoreAreaIn2: fin?.coreAreaIn2 ?? null,
    assumed: sd ? factorSetOf(sd) : null,
    final: fin ? factorSetOf(fin) : null,
    snapshots: timeline,
  }
}

type ProjectRow = typeof projects.$inferSelect

/** The project row by code, or 404. */
export async function projectByCode(db: DbOrTx, code: string): Promise<ProjectRow> {
  const [row] = await db.select().from(projects).where(eq(projects.code, code))
  if (!row) throw notFound(`Project ${code}`)
  return row
}

/** Frames → levels (bottom first) → brace with every snapshot, of one project. */
export async function framesOf(db: DbOrTx, projectId: number): Promise<FrameView[]> {
  const frameRows = await db.select().from(frames).where(eq(frames.projectId, projectId)).orderBy(frames.frameLine)
  if (frameRows.length === 0) return []
  const levelRows = await db.select().from(levels).where(inArray(levels.frameId, frameRows.map(f => f.id))).orderBy(levels.levelIndex)
  const braceRows = levelRows.length ? await db.select().from(braces).where(inArray(braces.levelId, levelRows.map(l => l.id))) : []
  const snapRows = braceRows.length ? await db.select().from(braceSnapshots).where(inArray(braceSnapshots.braceId, braceRows.map(b => b.id))) : []
  const snapsBy = new Map<number, SnapshotView[]>()
  for (const s of snapRows) snapsBy.set(s.braceId, [...(snapsBy.get(s.braceId) ?? []), toSnapshotView(s)])
  const braceBy = new Map(braceRows.map(b => [b.levelId, b]))
  return frameRows.map(f => ({
    frameLine: f.frameLine,
    configuration: f.configuration,
    bays: f.bays,
    bayWidthIn: f.bayWidthIn,
    levels: levelRows
      .filter(l => l.frameId === f.id)
      .map(l => {
        const b = braceBy.get(l.id)
        return {
          name: l.name,
          levelIndex: l.levelIndex,
          storyHeightIn: l.storyHeightIn,
          storyShearKip: l.storyShearKip,
          designDriftIn: l.designDriftIn,
          brace: b ? braceViewOf(b, snapsBy.get(b.id) ?? []) : null,
        }
      }),
  }))
}

/** `GET /api/projects/:code`: the whole record. */
export async function getProject(db: Db, code: string): Promise<ProjectDetail> {
  const p = await projectByCode(db, code)
  const [supplier] = p.supplierId ? await db.select().from(suppliers).where(eq(suppliers.id, p.supplierId)) : []
  const [frameViews, tonRows, [run]] = await Promise.all([
    framesOf(db, p.id),
    db.select().from(tonnage).where(eq(tonnage.projectId, p.id)),
    p.importRunId ? db.select().from(importRuns).where(eq(importRuns.id, p.importRunId)) : Promise.resolve([]),
  ])
  const stageOrder = { preliminary: 0, final: 1 }
  const catOrder = ['braces', 'beams', 'columns', 'connections', 'lateral_total', 'structural_total']
  return {
    project: {
      id: p.id,
      code: p.code,
      name: p.name,
      client: p.client,
      clientConfidential: p.clientConfidential,
      benchmarkPermitted: p.benchmarkPermitted,
      office: p.office,
      region: p.region,
      buildingUse: p.buildingUse,
      sdc: p.sdc,
      stories: p.stories,
      heightFt: p.heightFt,
      floorAreaFt2: p.floorAreaFt2,
      yearDesigned: p.yearDesigned,
      yearCompleted: p.yearCompleted,
      phaseReached: p.phaseReached,
      draft: p.draft,
      supplierCode: supplier?.code ?? null,
      supplierName: supplier?.displayName ?? null,
      frameCount: frameViews.length,
      configurations: [...new Set(frameViews.map(f => f.configuration))].sort(),
      riskCategory: p.riskCategory,
      importanceFactor: p.importanceFactor,
      sds: p.sds,
      sd1: p.sd1,
      siteClass: p.siteClass,
      asce7Edition: p.asce7Edition,
      aisc341Edition: p.aisc341Edition,
      analysisMethod: p.analysisMethod,
      r: p.r,
      cd: p.cd,
      omega0: p.omega0,
      createdAt: p.createdAt.toISOString(),
      updatedAt: p.updatedAt.toISOString(),
    },
    frames: frameViews,
    tonnage: tonRows
      .map(t => ({ stage: t.stage, category: t.category, tons: t.tons, scope: t.scope }))
      .sort((a, b) => stageOrder[a.stage] - stageOrder[b.stage] || catOrder.indexOf(a.category) - catOrder.indexOf(b.category)),
    importRun: run ? { id: run.id, fileName: run.fileName, source: run.source, status: run.status, startedAt: run.startedAt.toISOString(), finishedAt: run.finishedAt?.toISOString() ?? null } : null,
    cautions: [...DESIGN_CAUTIONS],
  }
}

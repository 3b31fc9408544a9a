import { and, eq, inArray, sql } from 'drizzle-orm'
import { rankPrecedents, type PrecedentCandidate, type PrecedentQuery } from '@shared/precedents/similarity'
import { DEFAULT_PRECEDENT_WEIGHTS, type PrecedentMatch, type PrecedentSearchBody, type PrecedentSearchResponse } from '@shared/schemas/precedents'
import { DESIGN_CAUTIONS } from '@shared/schemas/projects'
import { lateralTons } from '@shared/benchmarks/groups'
import { historyCache } from './history-cache'
import { LB_PER_SHORT_TON } from '@shared/units/constants'
import { knToKip } from '@shared/units/force'
import { ftToIn, mToIn } from '@shared/units/length'
import type { Db } from '../db'
import { braces, braceSnapshots, frames, levels, projects, suppliers, tonnage } from '../db/history-schema'
import { featureSpreads } from '@shared/precedents/similarity'

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
}

const candidateCache = historyCache<{ candidates: Candidate[]; spreads: ReturnType<typeof featureSpreads> }>(1)

export async function loadCandidates(db: Db): Promise<Candidate[]> {
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
    .where(eq(projects.draft, false))
    .groupBy(frames.id, projects.id, suppliers.code)
  return rows.map(({ projectStories, levelCount, ...r }) => ({ ...r, stories: projectStories ?? (levelCount || null) }))
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

/** `POST /api/precedents/search`. */
export async function searchPrecedents(db: Db, body: PrecedentSearchBody): Promise<PrecedentSearchResponse> {
  // Every past frame and the history's spread of each feature: the same for every search until the data changes.
  const { candidates, spreads } = await candidateCache(db, 'all', async () => {
    const list = await loadCandidates(db)
    return { candidates: list, spreads: featureSpreads(list) }
  })
  const weights = { ...DEFAULT_PRECEDENT_WEIGHTS, ...body.weights }
  const ranked = rankPrecedents(toStoredQuery(body), candidates, { weights, spreads, limit: body.limit })
  const frameIds = ranked.map(r => r.candidate.frameId)
  const projectIds = [...new Set(ranked.map(r => r.candidate.projectId))]

  const levelRows = frameIds.length
    ? await db
        .select({ frameId: levels.frameId, level: levels.name, levelIndex: levels.levelIndex, storyHeightIn: levels.storyHeightIn, storyShearKip: levels.storyShearKip, braceId: braces.id })
        .from(levels)
        .leftJoin(braces, eq(braces.levelId, levels.id))
        .where(inArray(levels.frameId, frameIds))
        .orderBy(levels.levelIndex)
    : []
  const braceIds = levelRows.map(l => l.braceId).filter((id): id is number => id !== null)
  const snaps = braceIds.length
    ? await db
        .select()
        .from(braceSnapshots)
        .where(and(inArray(braceSnapshots.braceId, braceIds), eq(braceSnapshots.confirmed, true), sql`(${braceSnapshots.phase} = 'sd' or ${braceSnapshots.governing})`))
    : []
  const tons = projectIds.length ? await db.select().from(tonnage).where(and(inArray(tonnage.projectId, projectIds), eq(tonnage.stage, 'final'))) : []

  return {
    candidates: candidates.length,
    weights,
    spreads,
    matches: ranked.map((r, i) => {
      const c = r.candidate
      const final: Record<string, number> = {}
      for (const t of tons) if (t.projectId === c.projectId) final[t.category] = t.tons
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
        levels: levelRows
          .filter(l => l.frameId === c.frameId)
          .map(l => {
            const sd = snaps.find(s => s.braceId === l.braceId && s.phase === 'sd')
            const fin = snaps.find(s => s.braceId === l.braceId && s.governing)
            return {
              level: l.level,
              levelIndex: l.levelIndex,
              storyHeightIn: l.storyHeightIn,
              storyShearKip: l.storyShearKip,
              preliminaryCoreAreaIn2: sd?.coreAreaIn2 ?? null,
              finalCoreAreaIn2: fin?.coreAreaIn2 ?? null,
              assumed: sd ? { beta: sd.beta, omega: sd.omega, stiffnessFactor: sd.stiffnessFactor } : null,
              final: fin ? { beta: fin.beta, omega: fin.omega, stiffnessFactor: fin.stiffnessFactor, factorDriftMultiple: fin.factorDriftMultiple } : null,
            }
          }),
        lateralLbPerFt2: perArea(lateralTons(final)),
        structuralLbPerFt2: perArea(final.structural_total),
      }
    }),
    cautions: ['Precedents show how similar past frames turned out; they do not size this frame.', ...DESIGN_CAUTIONS],
  }
}

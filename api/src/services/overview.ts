import { sql } from 'drizzle-orm'
import { HEIGHT_BANDS, MIN_PUBLISHED_GROUP, heightBandOf } from '@shared/schemas/benchmarks'
import { CalibrationFilters } from '@shared/schemas/calibration'
import type { Role } from '@shared/auth/roles'
import type { OverviewResponse } from '@shared/schemas/overview'
import { buildGroups, type BenchmarkProject } from '@shared/benchmarks/groups'
import type { Db } from '../db'
import { audienceOf, loadBenchmarkProjects } from './benchmarks'
import { calibrationCost, calibrationSummary } from './calibration/answers'
import { listRuns } from './imports'
import { listReviewItems } from './reviews'

/**
 * The landing screen's figures, from the same services the screens that explain them use
 * (calibration answers, the review queue, import runs, the benchmark groups), so the figures agree
 * with those screens. Sections by role: see `shared/schemas/overview.ts`.
 */

const q = (params: Record<string, string>) => new URLSearchParams(params).toString()

/** The Cmax headline and the latest unconservative finals (principal). */
export async function calibrationSection(db: Db): Promise<NonNullable<OverviewResponse['calibration']>> {
  const filters = CalibrationFilters.parse({})
  const [summary, cost] = await Promise.all([calibrationSummary(db, filters, 'cmax', 'none'), calibrationCost(db, filters)])
  // One row per basis; the headline is the basis most braces were compared on.
  const main = [...summary.overall].sort((a, b) => b.n - a.n)[0]
  const year = new Map(cost.projects.map(p => [p.code, p.yearDesigned]))
  const unconservative = cost.unconservative
    .map(u => ({ ...u, yearDesigned: year.get(u.code) ?? null }))
    .sort((a, b) => (b.yearDesigned ?? -1) - (a.yearDesigned ?? -1) || a.worstRatio - b.worstRatio || a.code.localeCompare(b.code))
  return {
    headline: {
      quantity: 'cmax',
      braces: main?.n ?? 0,
      medianRatio: main?.median ?? null,
      underestimateRate: main?.underestimateRate ?? null,
      attributableTons: cost.totals.projects ? cost.totals.attributableTons : null,
      attributableShare: cost.totals.projects ? cost.totals.attributableShare : null,
      href: `/calibration?${q({ quantity: 'cmax', groupBy: 'none' })}`,
      costHref: '/calibration?quantity=cmax#cost',
    },
    unconservative: unconservative.slice(0, 5).map(u => ({
      code: u.code,
      name: u.name,
      yearDesigned: u.yearDesigned,
      braces: u.braces,
      worstQuantity: u.worstQuantity,
      worstRatio: u.worstRatio,
      href: `/projects/${encodeURIComponent(u.code)}`,
    })),
    unconservativeTotal: unconservative.length,
    unconservativeHref: '/calibration?quantity=cmax',
  }
}

/** Draft projects and how many of their braces have a supplier value. */
async function drafts(db: Db) {
  const res = await db.execute<{ code: string; name: string; created_at: Date | string; braces: string; with_supplier: string }>(sql`
    select p.code, p.name, p.created_at,
           count(distinct b.id)::text as braces,
           count(distinct b.id) filter (where s.phase in ('submittal', 'approved', 'coupon'))::text as with_supplier
    from projects p
    left join frames f on f.project_id = p.id
    left join levels l on l.frame_id = f.id
    left join braces b on b.level_id = l.id
    left join brace_snapshots s on s.brace_id = b.id
    where p.draft
    group by p.id
    order by p.created_at desc, p.code`)
  return res.rows
    .map(r => ({ code: r.code, name: r.name, createdAt: new Date(r.created_at).toISOString(), braces: Number(r.braces), withSupplier: Number(r.with_supplier) }))
    .filter(d => d.withSupplier < d.braces || d.braces === 0)
}

/** The review queue, drafts awaiting supplier values and recent imports (principal, engineer). */
export async function workSection(db: Db): Promise<NonNullable<OverviewResponse['work']>> {
  const [open, waiting, runs] = await Promise.all([listReviewItems(db, 'open'), drafts(db), listRuns(db, 5)])
  return {
    review: {
      open: open.length,
      projects: new Set(open.map(i => i.projectCode)).size,
      href: '/imports?tab=review',
      items: open.slice(0, 5).map(i => ({ id: i.id, projectCode: i.projectCode, field: i.field, reason: i.reason })),
    },
    drafts: {
      awaiting: waiting.length,
      href: '/projects?status=draft',
      items: waiting.slice(0, 5).map(d => ({ ...d, href: `/projects/${encodeURIComponent(d.code)}` })),
    },
    imports: {
      href: '/imports?tab=history',
      items: runs.map(r => ({ id: r.id, fileName: r.fileName, status: r.status, startedAt: r.startedAt, loaded: r.loaded, rejected: r.rejected, queued: r.queued, href: '/imports?tab=history' })),
    },
  }
}

/**
 * Benchmark coverage: projects per use and per height band, published as the benchmarks are
 * (`publishGroup`): for bd a group under `MIN_PUBLISHED_GROUP` is suppressed. Principals also get the
 * use × height band cross-tab. Only counts leave here, never a project.
 */
export async function coverageSection(db: Db, role: Role): Promise<NonNullable<OverviewResponse['coverage']>> {
  const list = await loadBenchmarkProjects(db)
  const audience = audienceOf(role)
  const count = (members: readonly BenchmarkProject[]) => {
    const suppressed = audience === 'bd' && members.length < MIN_PUBLISHED_GROUP
    return { n: suppressed ? null : members.length, suppressed }
  }
  const byUse = buildGroups(list, 'use', 'us', audience).map(g => ({ key: g.key, n: g.n, suppressed: g.suppressed, href: `/benchmarks?${q({ groupBy: 'use', use: g.key })}` }))
  const byHeightBand = buildGroups(list, 'heightBand', 'us', audience).map(g => ({ key: g.key, n: g.n, suppressed: g.suppressed, href: `/benchmarks?${q({ groupBy: 'heightBand' })}` }))
  // The use × height-band cross-tab is for principals only: next to the published totals per use and
  // per height band (the benchmarks' own groupings), suppressed cells could be worked out by difference.
  if (audience === 'bd') return { total: list.length, minPublished: MIN_PUBLISHED_GROUP, byUse, byHeightBand, cells: [], href: '/benchmarks' }
  const uses = byUse.map(u => u.key)
  const bands = [...HEIGHT_BANDS.map(b => b.label as string), 'unknown']
  const cells = uses.flatMap(use =>
    bands
      .map(band => {
        const members = list.filter(p => (p.buildingUse ?? 'unknown') === use && (heightBandOf(p.stories) ?? 'unknown') === band)
        return { use, heightBand: band, key: `${use} · ${band}`, ...count(members), members: members.length }
      })
      .filter(c => c.members > 0 || c.heightBand !== 'unknown')
      .map(({ members: _m, ...c }) => ({ ...c, href: `/benchmarks?${q({ groupBy: 'heightBand', ...(use === 'unknown' ? {} : { use }) })}` })),
  )
  return { total: list.length, minPublished: MIN_PUBLISHED_GROUP, byUse, byHeightBand, cells, href: '/benchmarks' }
}

/** `GET /api/overview` for a caller of `role`. */
export async function overview(db: Db, role: Role): Promise<OverviewResponse> {
  const out: OverviewResponse = { role, generatedAt: new Date().toISOString() }
  if (role === 'principal') out.calibration = await calibrationSection(db)
  if (role === 'principal' || role === 'engineer') out.work = await workSection(db)
  if (role === 'principal' || role === 'bd') out.coverage = await coverageSection(db, role)
  return out
}

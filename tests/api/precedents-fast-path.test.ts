import { and, eq, inArray, sql } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'
import { handProject, loadHandProjects } from '../helpers/hand-history'
import { rankPrecedentsReference } from '../shared/precedents/reference'
import { DEFAULT_PRECEDENT_WEIGHTS, PrecedentSearchBody, type PrecedentMatch } from '@shared/schemas/precedents'
import { DESIGN_CAUTIONS } from '@shared/schemas/projects'
import { lateralTons } from '@shared/benchmarks/groups'
import { featureSpreads } from '@shared/precedents/similarity'
import { LB_PER_SHORT_TON } from '@shared/units/constants'
import { loadCandidates, onPrecedentLoad, toStoredQuery, type PrecedentLoadReport } from '../../api/src/services/precedents'
import { refreshCalibrationPairs } from '../../api/src/db/calibration'
import type { Db } from '../../api/src/db'
import { braces, braceSnapshots, levels, tonnage } from '../../api/src/db/history-schema'
import { rng } from '../../scripts/bench/synthetic'

// Own file: the service caches the history per data version in the module, so one database per file.

/**
 * Test oracle: the search as it was before the in-memory history — the candidate list ranked by the
 * reference ranking, then each match's levels, snapshots and tonnage read from the database. The
 * service now answers from columns built once per data version; its answers must be these exactly.
 */
async function searchPrecedentsReference(db: Db, body: PrecedentSearchBody) {
  const candidates = await loadCandidates(db)
  const spreads = featureSpreads(candidates)
  const weights = { ...DEFAULT_PRECEDENT_WEIGHTS, ...body.weights }
  const ranked = rankPrecedentsReference(toStoredQuery(body), candidates, { weights, spreads, limit: body.limit })
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
        .orderBy(braceSnapshots.braceId, braceSnapshots.phase, braceSnapshots.revision)
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

describe('POST /api/precedents/search answers as the straightforward search did', () => {
  // A varied invented history on its own database: two frame lines on some projects, shears,
  // configurations, bays, stories, SDCs, uses and suppliers that differ, a second schematic-design
  // revision, a value waiting in the review queue (unconfirmed), a level with no governing values,
  // tonnage as a lateral total, as parts or missing, a project without floor area, and a draft.
  let h: TestApp
  let user: Awaited<ReturnType<typeof signedIn>>
  const rand = rng(41)
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rand() * xs.length)]!

  beforeAll(async () => {
    h = await createTestApp()
    const sets = Array.from({ length: 14 }, (_, i) => {
      const code = `PV-${String(i).padStart(2, '0')}`
      const t = handProject(code, {
        name: `Varied ${i}`,
        building_use: pick(['office', 'school', 'laboratory']),
        sdc: pick(['C', 'D', 'E']),
        stories: i % 5 === 0 ? null : pick([2, 3, 6]),
        floor_area: i === 3 ? null : pick([40_000, 52_500, 81_000]),
        year_designed: 2010 + i,
        supplier_code: pick(['SUP-A', 'SUP-B']),
      })
      t.suppliers!.push({ supplier_code: 'SUP-B', display_name: 'Supplier B' })
      t.frames![0]!.configuration = pick(['inverted_v', 'v', 'single_diagonal'])
      t.frames![0]!.bay_width = pick([25, 30, 30, 35])
      t.levels![0]!.story_shear = pick([150, 300, 300, 450, 612.5])
      t.levels![1]!.story_height = pick([12, 13, 14])
      if (i % 3 === 0) {
        // A second frame line B, like A, with its own shear.
        for (const table of ['levels', 'braces', 'brace_values'] as const) t[table]!.push(...t[table]!.filter(r => r.frame_line === 'A').map(r => ({ ...r, frame_line: 'B' })))
        t.frames!.push({ ...t.frames![0]!, frame_line: 'B', bays: 2, configuration: pick(['inverted_v', 'v']) })
        t.levels!.find(l => l.frame_line === 'B' && l.level === 'L2')!.story_shear = pick([200, 300, 700])
      }
      if (i === 4) t.brace_values!.push({ ...t.brace_values![0]!, revision: 1, core_area: 7.25, beta: 1.15 }) // a later sd revision
      if (i === 5) t.brace_values = t.brace_values!.filter(v => !(v.level === 'L2' && v.phase === 'coupon')) // no final values
      if (i === 6) t.tonnage = [] // no tonnage
      if (i === 7)
        t.tonnage = [
          { project_code: code, stage: 'final', category: 'braces', weight: 12 },
          { project_code: code, stage: 'final', category: 'beams', weight: 20.5 },
          { project_code: code, stage: 'final', category: 'columns', weight: 9 },
          { project_code: code, stage: 'final', category: 'connections', weight: 3.25 },
          { project_code: code, stage: 'final', category: 'structural_total', weight: 410 },
        ]
      return t
    })
    await loadHandProjects(h.db.db, sets)
    // Before any search, so the data version the search caches is this history.
    await h.db.db.execute(sql`update projects set draft = true where code = 'PV-13'`)
    await h.db.db.execute(sql`update brace_snapshots set confirmed = false where phase = 'coupon' and brace_id = (select b.id from braces b join levels l on l.id = b.level_id join frames f on f.id = l.frame_id join projects p on p.id = f.project_id where p.code = 'PV-08' and l.name = 'L2' and f.frame_line = 'A')`)
    user = await signedIn(h.app, 'engineer@example.com')
  })
  afterAll(async () => h.close())

  /** `n` random searches, each answered by the API and by the reference; returns the levels compared. */
  async function compareSearches(n: number): Promise<number> {
    const features: Record<string, readonly (number | string)[]> = {
      storyShear: [150, 300, 420, 1334.47],
      stories: [2, 3, 6],
      storyHeight: [12, 13.5, 4.2],
      bayWidth: [25, 30, 9.1],
      configuration: ['inverted_v', 'v', 'single_diagonal'],
      sdc: ['C', 'D'],
      buildingUse: ['office', 'school', 'parking'],
      supplier: ['SUP-A', 'SUP-B', 'SUP-X'],
    }
    let levelsSeen = 0
    for (let k = 0; k < n; k++) {
      const description = Object.fromEntries(Object.entries(features).filter(() => rand() < 0.5).map(([f, vs]) => [f, pick(vs)]))
      if (Object.keys(description).length === 0) description.storyShear = 300
      const raw: Record<string, unknown> = { description, limit: pick([1, 3, 10, 50]), units: pick(['us', 'us', 'si']) }
      if (rand() < 0.3) raw.weights = { storyShear: pick([0, 1, 5]), configuration: pick([0, 2, 10]), supplier: pick([0, 3]) }
      const body = PrecedentSearchBody.parse(raw)
      const res = await user.agent.post('/api/precedents/search').set('x-csrf-token', user.csrf).send(raw).expect(200)
      const want = JSON.parse(JSON.stringify(await searchPrecedentsReference(h.db.db, body)))
      expect(res.body).toEqual(want)
      levelsSeen += want.matches.reduce((s: number, m: { levels: unknown[] }) => s + m.levels.length, 0)
    }
    return levelsSeen
  }

  it('gives the same answers to 60 varied searches, field for field', async () => {
    expect(await compareSearches(60)).toBeGreaterThan(200) // the answers carry levels to compare
  })

  it('leaves the draft out and shows the earliest sd revision, the unconfirmed final value as missing', async () => {
    const res = await user.agent.post('/api/precedents/search').set('x-csrf-token', user.csrf).send({ description: { stories: 3 }, limit: 50 }).expect(200)
    const codes = res.body.matches.map((m: { code: string }) => m.code)
    expect(codes).not.toContain('PV-13')
    expect(res.body.candidates).toBe(13 + 5) // 13 finished projects, 5 of them with a frame line B (PV-00, 03, 06, 09, 12)
    const at = (code: string) => res.body.matches.find((m: { code: string; frameLine: string }) => m.code === code && m.frameLine === 'A')
    expect(at('PV-04').levels[0]).toMatchObject({ preliminaryCoreAreaIn2: 6.5, assumed: { beta: 1.1 } })
    expect(at('PV-08').levels[0]).toMatchObject({ finalCoreAreaIn2: null, final: null, preliminaryCoreAreaIn2: 6.5 })
    expect(at('PV-05').levels[0].final).toBeNull()
    expect(at('PV-06').lateralLbPerFt2).toBeNull()
    expect(at('PV-03').structuralLbPerFt2).toBeNull()
  })

  it('after changes, reads only the changed projects again and still answers as the straightforward search', async () => {
    const loads: PrecedentLoadReport[] = []
    onPrecedentLoad(r => loads.push(r))
    try {
      const idOf = async (code: string) => Number((await h.db.pool.query('select id from projects where code = $1', [code])).rows[0].id)
      // New projects (one with a frame line B), an edited name and shear, new tonnage, a draft
      // finished, a project deleted: each change logged with its project, as the writers do.
      const fresh = ['PV-20', 'PV-21', 'PV-22'].map((code, i) => {
        const t = handProject(code, { name: `Fresh ${i}`, building_use: 'school', sdc: 'D', stories: 4, floor_area: 61_000, year_designed: 2024, supplier_code: 'SUP-A' })
        t.levels![0]!.story_shear = 275 + 50 * i
        if (i === 1) {
          for (const table of ['levels', 'braces', 'brace_values'] as const) t[table]!.push(...t[table]!.filter(r => r.frame_line === 'A').map(r => ({ ...r, frame_line: 'B' })))
          t.frames!.push({ ...t.frames![0]!, frame_line: 'B', configuration: 'v' })
        }
        return t
      })
      await loadHandProjects(h.db.db, fresh)
      const freshIds = await Promise.all(['PV-20', 'PV-21', 'PV-22'].map(idOf))
      await refreshCalibrationPairs(h.db.db, freshIds)
      const [pv02, pv06, pv13, pv01] = await Promise.all(['PV-02', 'PV-06', 'PV-13', 'PV-01'].map(idOf))
      await h.db.db.execute(sql`update projects set name = 'Varied 2, renamed' where id = ${pv02}`)
      await h.db.db.execute(sql`update levels set story_shear_kip = 333 where level_index = 1 and frame_id in (select id from frames where project_id = ${pv02})`)
      await h.db.db.execute(sql`insert into tonnage (project_id, stage, category, tons_short) values (${pv06}, 'final', 'braces', 14.5)`)
      await h.db.db.execute(sql`update projects set draft = false where id = ${pv13}`)
      await h.db.db.execute(sql`delete from projects where id = ${pv01}`)
      await refreshCalibrationPairs(h.db.db, [pv02, pv06, pv13, pv01])

      expect(await compareSearches(40)).toBeGreaterThan(100)
      expect(loads.map(l => [l.kind, l.projects])).toEqual([['delta', 7]])
      const res = await user.agent.post('/api/precedents/search').set('x-csrf-token', user.csrf).send({ description: { stories: 4 }, limit: 50 }).expect(200)
      const codes = res.body.matches.map((m: { code: string }) => m.code)
      expect(codes).toEqual(expect.arrayContaining(['PV-20', 'PV-21', 'PV-22', 'PV-13']))
      expect(codes).not.toContain('PV-01')
      // 18 frames before; PV-01 (one frame) gone, PV-13 (one) finished, PV-20…22 add four.
      expect(res.body.candidates).toBe(18 - 1 + 1 + 4)

      // A full refresh (nothing logged per project) reads everything again.
      await refreshCalibrationPairs(h.db.db, null)
      expect(await compareSearches(10)).toBeGreaterThan(0)
      expect(loads.map(l => l.kind)).toEqual(['delta', 'full'])
    } finally {
      onPrecedentLoad(null)
    }
  })
})

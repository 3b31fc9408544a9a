import { readFileSync } from 'node:fs'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { refreshCalibrationPairs } from '../../api/src/db/calibration'
import { analyticsReady, loadPhase, onPhaseLoad, phaseData, warmAnalytics, type LoadReport, type PhaseData } from '../../api/src/services/calibration/store'
import { expandPaths } from '../../etl/src/paths'
import { readInputs, runImport } from '../../etl/src/run'
import { generate } from '../../scripts/bench/etl'
import { perturb } from '../../scripts/bench/synthetic'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'

// Incremental calibration pairs. The table `calibration_pairs` is rewritten per changed project;
// the reference is the pair definition itself, the plain view `calibration_pairs_source` (the
// SELECT of the former materialized view), read in full. The API's columns after a change are
// built from the previous version's plus the changed projects' rows; the reference is a full
// load of the same version. Both comparisons are of every row and every column.

let t: TestApp
let engineer: Awaited<ReturnType<typeof signedIn>>
const reports: LoadReport[] = []

/** A history file (the bench's synthetic generator, perturbed by `seed`) with codes `prefix-…`. */
function historyFile(n: number, seed: number, prefix: string): { file: string; data: Uint8Array } {
  const tables = perturb(generate(n), seed)
  for (const rows of Object.values(tables)) for (const r of rows) if (typeof r.project_code === 'string') r.project_code = r.project_code.replace('BENCH-', `${prefix}-`)
  for (const p of tables.projects!) p.name = String(p.name).replace('Bench building', `${prefix} building`)
  return { file: `${prefix}.json`, data: new TextEncoder().encode(JSON.stringify({ format: 'backsight-history', version: 1, units: 'us', ...tables })) }
}

/** Every row of the table (without its bookkeeping column) and of the defining view, in one order. */
async function tableAndView() {
  const q = async (text: string) => (await t.db.pool.query<{ r: Record<string, unknown> }>(text)).rows.map(x => x.r)
  const table = await q(`select to_jsonb(c) - 'version' as r from calibration_pairs c order by brace_id, phase`)
  const view = await q(`select to_jsonb(s) as r from calibration_pairs_source s order by brace_id, phase`)
  return { table, view }
}

async function expectTableIsView() {
  const { table, view } = await tableAndView()
  expect(view.length).toBeGreaterThan(0)
  expect(table.length).toBe(view.length)
  expect(table).toEqual(view)
}

/** Rows the last refresh wrote (their `version` column is the current version). */
async function rowsWrittenAtCurrentVersion(): Promise<{ n: number; projects: number }> {
  const { rows } = await t.db.pool.query(
    `select count(*)::int as n, count(distinct project_id)::int as projects from calibration_pairs where version = (select version from calibration_state where id = 1)`,
  )
  return rows[0]
}

const projectIdsOf = async (codes: string[]): Promise<number[]> => (await t.db.pool.query(`select id from projects where code = any($1) order by id`, [codes])).rows.map(r => r.id)

/** A PhaseData as plain values, so toEqual compares every element (typed arrays as arrays; NaN equals NaN). */
function plain(d: PhaseData) {
  const arr = (a: Int32Array | Float64Array) => Array.from(a)
  return {
    version: d.version,
    phase: d.phase,
    n: d.n,
    braceId: arr(d.braceId),
    project: arr(d.project),
    projects: d.projects,
    frameLine: { codes: arr(d.frameLine.codes), values: d.frameLine.values },
    level: { codes: arr(d.level.codes), values: d.level.values },
    configuration: { codes: arr(d.configuration.codes), values: d.configuration.values },
    finalCoreArea: arr(d.finalCoreArea),
    yearDesigned: arr(d.yearDesigned),
    yearCompleted: arr(d.yearCompleted),
    q: Object.fromEntries(Object.entries(d.q).map(([k, c]) => [k, { assumed: arr(c.assumed), final: arr(c.final), basis: arr(c.basis), bases: c.bases }])),
  }
}

/** The columns the API serves after a change, checked against a full load of the same version; returns how they were built. */
async function expectReloadEqualsFull(phase = 'sd'): Promise<LoadReport['kind']> {
  const before = reports.length
  const served = await phaseData(t.db.db, phase)
  const built = reports.slice(before).find(r => r.phase === phase)
  expect(built, 'a rebuild happened').toBeDefined()
  const full = await loadPhase(t.db.db, phase)
  expect(full.version).toBe(served.version)
  expect(served.n).toBeGreaterThan(0)
  expect(plain(served)).toEqual(plain(full))
  return built!.kind
}

beforeAll(async () => {
  onPhaseLoad(r => reports.push(r))
  t = await createTestApp()
  engineer = await signedIn(t.app, 'engineer@example.com')
}, 60_000)
afterAll(async () => {
  onPhaseLoad(null)
  await t.close()
})

describe('analytics warm-up on /api/health', () => {
  it('says warming until the default phase is loaded, then ready; 200 throughout', async () => {
    const cold = await request(t.app).get('/api/health').expect(200)
    expect(cold.body).toMatchObject({ status: 'ok', database: 'up', analytics: 'warming' })
    expect(analyticsReady(t.db.db)).toBe(false)
    await warmAnalytics(t.db.db)
    const warm = await request(t.app).get('/api/health').expect(200)
    expect(warm.body).toMatchObject({ status: 'ok', database: 'up', analytics: 'ready' })
  })
})

describe('incremental refresh of calibration_pairs', () => {
  it('after the demo import, the table holds exactly the rows of the pair definition', async () => {
    const run = await runImport(t.db.db, await readInputs(await expandPaths(['demo-data'])), { source: 'cli' })
    expect(run.loaded).toBeGreaterThan(0)
    await expectTableIsView()
    // The first analytics load after the import: from the empty warm-up columns plus every imported project.
    expect(await expectReloadEqualsFull()).toBe('delta')
  }, 120_000)

  it('an import of new projects rewrites only those projects, and the columns follow by delta', async () => {
    const run = await runImport(t.db.db, [historyFile(12, 11, 'INC')], { source: 'cli' })
    expect(run.loaded).toBe(12)
    await expectTableIsView()
    // Only the 12 new projects' rows carry the new version: the refresh did not rewrite the others.
    const written = await rowsWrittenAtCurrentVersion()
    expect(written.projects).toBe(12)
    expect(written.n).toBe(Number((await t.db.pool.query(`select count(*)::int as n from calibration_pairs p join projects q on q.id = p.project_id where q.code like 'INC-%'`)).rows[0].n))
    expect(await expectReloadEqualsFull()).toBe('delta')
  }, 60_000)

  it('an import that replaces projects (new brace ids, other values) follows by delta', async () => {
    // Same codes, another perturbation: every project is updated (children replaced, so its braces get new, higher ids).
    const run = await runImport(t.db.db, [historyFile(6, 99, 'INC')], { source: 'cli' })
    expect(run.updated).toBe(6)
    await expectTableIsView()
    expect((await rowsWrittenAtCurrentVersion()).projects).toBe(6)
    expect(await expectReloadEqualsFull()).toBe('delta')
  }, 60_000)

  it('a review resolution rewrites its project only', async () => {
    const list = await engineer.agent.get('/api/review-items').expect(200)
    const item = list.body.items.find((i: { status: string; location: unknown }) => i.status === 'open' && i.location)
    expect(item, 'the demo data queues values for review').toBeDefined()
    await engineer.agent.post(`/api/review-items/${item.id}/resolve`).set('x-csrf-token', engineer.csrf).send({ action: 'confirm' }).expect(200)
    await expectTableIsView()
    const written = await rowsWrittenAtCurrentVersion()
    expect(written.projects).toBeLessThanOrEqual(1)
    const { rows } = await t.db.pool.query(`select version, project_ids from calibration_changes order by version desc limit 1`)
    expect(rows[0].project_ids).toEqual(await projectIdsOf([item.projectCode]))
    expect(await expectReloadEqualsFull()).toBe('delta')
  })

  it('a draft save logs its project, and a draft never has pairs', async () => {
    const example = JSON.parse(readFileSync('docs/examples/three-story-chevron.json', 'utf8'))
    const res = await engineer.agent.post('/api/projects/drafts').set('x-csrf-token', engineer.csrf).send({ name: 'Incremental draft', request: example })
    expect(res.status).toBe(201)
    await expectTableIsView()
    const { rows } = await t.db.pool.query(`select project_ids from calibration_changes order by version desc limit 1`)
    expect(rows[0].project_ids).toEqual(await projectIdsOf([res.body.code]))
    expect((await rowsWrittenAtCurrentVersion()).n).toBe(0)
    expect(await expectReloadEqualsFull()).toBe('delta')
  })

  it('a project edit (use, SDC, stories, supplier) rewrites that project, and the columns carry the new attributes', async () => {
    const { rows: [p] } = await t.db.pool.query(`select project_code as code, supplier_code from calibration_pairs where phase = 'sd' order by brace_id limit 1`)
    const { rows: [other] } = await t.db.pool.query(`select code from suppliers where code is distinct from $1 order by code limit 1`, [p.supplier_code])
    const body = { buildingUse: 'laboratory', sdc: 'E', stories: 17, supplierCode: other.code }
    await engineer.agent.patch(`/api/projects/${p.code}`).set('x-csrf-token', engineer.csrf).send(body).expect(200)
    await expectTableIsView()
    expect((await rowsWrittenAtCurrentVersion()).projects).toBe(1)
    expect(await expectReloadEqualsFull()).toBe('delta')
    const d = await phaseData(t.db.db, 'sd')
    // The edited project owns the first row (lowest brace id), so it is project index 0.
    expect(d.projects.code[d.project[0]!]).toBe(p.code)
    expect({ use: d.projects.use[d.project[0]!], sdc: d.projects.sdc[d.project[0]!], stories: d.projects.stories[d.project[0]!], supplier: d.projects.supplier[d.project[0]!] }).toEqual({
      use: 'laboratory',
      sdc: 'E',
      stories: 17,
      supplier: other.code,
    })
  })

  it('deleting projects (the first one among them) renumbers projects and codes exactly as a full load', async () => {
    const { rows } = await t.db.pool.query(`select distinct project_id as id, min(brace_id) over (partition by project_id) as first from calibration_pairs where phase = 'sd' order by first limit 3`)
    const ids = [...new Set(rows.map(r => r.id as number))]
    expect(ids.length).toBeGreaterThan(1)
    const before = await phaseData(t.db.db, 'sd')
    expect(before.projects.id[0]).toBe(ids[0])
    await t.db.pool.query(`delete from projects where id = any($1)`, [ids])
    await refreshCalibrationPairs(t.db.db, ids)
    await expectTableIsView()
    expect(await expectReloadEqualsFull()).toBe('delta')
    const after = await phaseData(t.db.db, 'sd')
    expect(after.projects.id.some(id => ids.includes(id))).toBe(false)
    expect(after.n).toBeLessThan(before.n)
  })

  it('a supplier code change reaches every project of that supplier: passing them all keeps the delta exact', async () => {
    const { rows: [s] } = await t.db.pool.query(`select sup.id, sup.code from suppliers sup join projects p on p.supplier_id = sup.id join calibration_pairs c on c.project_id = p.id group by sup.id order by count(*) desc limit 1`)
    const affected = (await t.db.pool.query(`select id from projects where supplier_id = $1`, [s.id])).rows.map(r => r.id as number)
    expect(affected.length).toBeGreaterThan(0)
    await t.db.pool.query(`update suppliers set code = $2 where id = $1`, [s.id, `${s.code}-R`])
    await refreshCalibrationPairs(t.db.db, affected)
    await expectTableIsView()
    expect(await expectReloadEqualsFull()).toBe('delta')
    const d = await phaseData(t.db.db, 'sd')
    expect(d.projects.supplier).toContain(`${s.code}-R`)
    expect(d.projects.supplier).not.toContain(s.code)
  })

})

describe('fallback to a full load', () => {
  it('after a full refresh (the log says "everything")', async () => {
    await phaseData(t.db.db, 'sd')
    await t.db.pool.query(`update suppliers set display_name = display_name || ' (renamed)'`)
    await refreshCalibrationPairs(t.db.db)
    const { rows } = await t.db.pool.query(`select project_ids from calibration_changes order by version desc limit 1`)
    expect(rows[0].project_ids).toBeNull()
    await expectTableIsView()
    expect(await expectReloadEqualsFull()).toBe('full')
  })

  it('when a version is missing from the log (pruned)', async () => {
    await phaseData(t.db.db, 'sd')
    const { rows: [p] } = await t.db.pool.query(`select project_id from calibration_pairs where phase = 'sd' order by brace_id limit 1`)
    await t.db.pool.query(`update projects set stories = stories + 1 where id = $1`, [p.project_id])
    const v1 = await refreshCalibrationPairs(t.db.db, [p.project_id])
    const v2 = await refreshCalibrationPairs(t.db.db, [])
    expect(v2).toBe(v1 + 1)
    await t.db.pool.query(`delete from calibration_changes where version = $1`, [v1])
    expect(await expectReloadEqualsFull()).toBe('full')
  })

  it('the log keeps its last 1,000 versions only', async () => {
    // Pretend 1,500 versions happened, each logged; the next refresh is version 1,501 and prunes
    // every version ≤ 1,501 − 1,000 = 501, keeping 502 … 1,501: 1,000 rows.
    await t.db.pool.query(`update calibration_state set version = 1500 where id = 1`)
    await t.db.pool.query(`insert into calibration_changes (version, project_ids) select g, '{}' from generate_series(1, 1500) g on conflict do nothing`)
    expect(await refreshCalibrationPairs(t.db.db, [])).toBe(1501)
    const { rows } = await t.db.pool.query(`select count(*)::int as n, min(version)::int as lo, max(version)::int as hi from calibration_changes`)
    expect(rows[0]).toEqual({ n: 1000, lo: 502, hi: 1501 })
  })
})

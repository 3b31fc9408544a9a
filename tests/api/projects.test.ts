import { and, count, eq } from 'drizzle-orm'
import { readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { braceSnapshots, projects } from '../../api/src/db/history-schema'
import { auditLog } from '../../api/src/db/schema'
import { runImport } from '../../etl/src/run'
import { validProject } from '../etl/bundle-builder'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'
import { handProject, loadHandProjects } from '../helpers/hand-history'
import { workbookOf } from '../helpers/history-files'
import { ProjectDetail, ProjectList, SnapshotCreated, SubmittalCheckResponse } from '@shared/schemas/projects'

// Invented history. R-001 (office, SDC D, 2019, SUP-A) is imported from a workbook so it carries its run;
// its L2 braces have: sd (6.5 in², 38–46 ksi, β 1.1, ω 1.4, KF 1.4), submittal rev 0 (7.0 in², β 1.12,
// ω 1.45, KF 1.5), submittal rev 1 (6.75 in², KF 1.45) and the governing coupon (6.5 in², 42.5 ksi measured,
// β 1.12, ω 1.45, KF 1.35), all at 2.0 × design drift. LS-01…LS-04 vary the list fields; one draft comes
// from the New frame worksheet.
let t: TestApp
let engineer: Awaited<ReturnType<typeof signedIn>>
let principal: Awaited<ReturnType<typeof signedIn>>
let draftCode: string
const example = JSON.parse(readFileSync(new URL('../../docs/examples/three-story-chevron.json', import.meta.url), 'utf8'))

beforeAll(async () => {
  t = await createTestApp()
  const r = validProject('R-001')
  Object.assign(r.projects[0]!, { name: 'Rowan Exchange', building_use: 'office', client: 'Client 042', client_confidential: 'no' })
  const l2 = { project_code: 'R-001', frame_line: 'A', level: 'L2', fysc: 38, fysc_basis: 'yield_range', fysc_max: 46, beta: 1.12, omega: 1.45, factor_drift_multiple: 2 }
  r.brace_values.push(
    { ...l2, phase: 'submittal', revision: 0, date: '2019-09-01', source_document: 'Submittal 01', core_area: 7.0, stiffness_factor: 1.5 },
    { ...l2, phase: 'submittal', revision: 1, date: '2019-10-15', source_document: 'Submittal 01 rev 1', core_area: 6.75, stiffness_factor: 1.45 },
  )
  await runImport(t.db.db, [{ file: 'hand.xlsx', data: new Uint8Array(await workbookOf(r)) }], { source: 'cli' })
  const sets = [
    handProject('LS-01', { name: 'Alder Clinic', year_designed: 2012, building_use: 'healthcare', sdc: 'C' }),
    handProject('LS-02', { name: 'Birch Offices', year_designed: 2016, building_use: 'office', sdc: 'D', stories: 6 }),
    handProject('LS-03', { name: 'Cedar Lab', year_designed: 2021, building_use: 'laboratory', sdc: 'D' }),
    handProject('LS-04', { name: 'Dogwood School', year_designed: 2024, building_use: 'school', sdc: 'B', supplier_code: 'SUP-B' }),
  ]
  sets[2]!.frames[0]!.configuration = 'single_diagonal'
  sets[3]!.suppliers = [{ supplier_code: 'SUP-B', display_name: 'Supplier B' }]
  await loadHandProjects(t.db.db, sets)
  ;[engineer, principal] = await Promise.all([signedIn(t.app, 'engineer@example.com'), signedIn(t.app, 'principal@example.com')])
  const draft = await engineer.agent.post('/api/projects/drafts').set('x-csrf-token', engineer.csrf).send({ name: 'Elm Terrace', request: example }).expect(201)
  draftCode = draft.body.code
})
afterAll(async () => t.close())

const codes = (res: { body: { items: { code: string }[] } }) => res.body.items.map(i => i.code)

describe('GET /api/projects', () => {
  it('lists every project sorted by code with the total', async () => {
    const res = await engineer.agent.get('/api/projects').expect(200)
    expect(res.body.total).toBe(6)
    ProjectList.parse(res.body) // the answer matches the shared contract
    expect(codes(res)).toEqual([draftCode, 'LS-01', 'LS-02', 'LS-03', 'LS-04', 'R-001'])
    const r1 = res.body.items.find((i: { code: string }) => i.code === 'R-001')
    expect(r1).toMatchObject({ name: 'Rowan Exchange', buildingUse: 'office', supplierCode: 'SUP-A', frameCount: 1, configurations: ['inverted_v'], draft: false })
  })

  it('pages on the server: page 2 of size 2 is the third and fourth', async () => {
    const res = await engineer.agent.get('/api/projects?page=2&pageSize=2').expect(200)
    expect(res.body).toMatchObject({ total: 6, page: 2, pageSize: 2 })
    expect(codes(res)).toEqual(['LS-02', 'LS-03'])
  })

  it('sorts on a whitelisted column, descending', async () => {
    const res = await principal.agent.get('/api/projects?sort=yearDesigned&order=desc&status=finished').expect(200)
    expect(codes(res)).toEqual(['LS-04', 'LS-03', 'R-001', 'LS-02', 'LS-01'])
  })

  it('filters by text, years, use, SDC, supplier, configuration, stories and draft state', async () => {
    const q = async (qs: string) => codes(await engineer.agent.get(`/api/projects?${qs}`).expect(200))
    expect(await q('q=cedar')).toEqual(['LS-03'])
    expect(await q('q=ls-0')).toEqual(['LS-01', 'LS-02', 'LS-03', 'LS-04'])
    expect(await q('q=%25')).toEqual([]) // a literal %, not a wildcard
    expect(await q('yearFrom=2015&yearTo=2022')).toEqual(['LS-02', 'LS-03', 'R-001'])
    expect(await q('use=office,healthcare')).toEqual(['LS-01', 'LS-02', 'R-001'])
    expect(await q('sdc=D')).toEqual(['LS-02', 'LS-03', 'R-001'])
    expect(await q('supplier=SUP-B')).toEqual(['LS-04'])
    expect(await q('configuration=single_diagonal')).toEqual(['LS-03'])
    expect(await q('storiesMin=5')).toEqual(['LS-02'])
    expect(await q('status=draft')).toEqual([draftCode])
    const r = await engineer.agent.get('/api/projects?status=finished&pageSize=1').expect(200)
    expect(r.body.total).toBe(5)
  })

  it('answers 400 naming the field for a page size over 200 or a column it does not sort by', async () => {
    expect((await engineer.agent.get('/api/projects?pageSize=201').expect(400)).body.error.fields).toHaveProperty('pageSize')
    expect((await engineer.agent.get('/api/projects?sort=client').expect(400)).body.error.fields).toHaveProperty('sort')
    expect((await engineer.agent.get('/api/projects?yearFrom=2020&yearTo=2010').expect(400)).body.error.fields).toHaveProperty('yearTo')
  })
})

describe('GET /api/projects/:code', () => {
  it('returns the summary, frames → levels → braces with assumed and final factors, the timeline, tonnage and run', async () => {
    const res = await engineer.agent.get('/api/projects/R-001').expect(200)
    ProjectDetail.parse(res.body)
    const { project, frames, tonnage, importRun, cautions } = res.body
    expect(project).toMatchObject({ code: 'R-001', client: 'Client 042', stories: 2, floorAreaFt2: 40_000, supplierName: 'Supplier A' })
    expect(frames).toHaveLength(1)
    const [l2, roof] = frames[0].levels
    expect(l2).toMatchObject({ name: 'L2', levelIndex: 1, storyShearKip: 300, storyHeightIn: 180 })
    const b = l2.brace
    expect(b).toMatchObject({ braceCount: 2, requiredStrengthKip: 212.1, requiredCoreAreaIn2: 6.2, preliminaryCoreAreaIn2: 6.5, finalCoreAreaIn2: 6.5 })
    // AISC 341-16 F4.2a, assumed: Tmax = ω·Fysc,max·Asc = 1.4 · 46 · 6.5 = 418.6 kip; Cmax = 1.1 · 418.6 = 460.46 kip
    expect(b.assumed).toMatchObject({ phase: 'sd', beta: 1.1, omega: 1.4, tmaxKip: expect.closeTo(418.6, 9), cmaxKip: expect.closeTo(460.46, 9) })
    // final (coupon, no Ry): Tmax = 1.45 · 42.5 · 6.5 = 400.5625 kip; Cmax = 1.12 · 400.5625 = 448.63 kip
    expect(b.final).toMatchObject({ phase: 'coupon', fyscBasis: 'coupon', tmaxKip: expect.closeTo(400.5625, 9), cmaxKip: expect.closeTo(448.63, 9) })
    expect(b.snapshots.map((s: { phase: string; revision: number }) => `${s.phase}${s.revision}`)).toEqual(['sd0', 'submittal0', 'submittal1', 'coupon0'])
    expect(b.snapshots[2]).toMatchObject({ sourceDocument: 'Submittal 01 rev 1', date: '2019-10-15', coreAreaIn2: 6.75 })
    expect(roof.brace.final).toBeNull()
    expect(roof.brace.finalCoreAreaIn2).toBeNull()
    expect(tonnage).toEqual([
      { stage: 'preliminary', category: 'lateral_total', tons: 42, scope: null },
      { stage: 'final', category: 'lateral_total', tons: 39.5, scope: 'braces, beams and columns of braced frames, gussets' },
    ])
    expect(importRun).toMatchObject({ fileName: 'hand.xlsx', source: 'cli', status: 'finished' })
    expect(cautions.join(' ')).toMatch(/engineer of record decides/)
  })

  it('answers 404 for a code that does not exist', async () => {
    const res = await engineer.agent.get('/api/projects/NOPE-1').expect(404)
    expect(res.body.error.message).toMatch(/NOPE-1/)
  })
})

describe('GET /api/projects/:code/submittal-check', () => {
  it('defaults to the latest supplier snapshot (the coupon) and passes it against the design', async () => {
    const res = await engineer.agent.get('/api/projects/R-001/submittal-check').expect(200)
    SubmittalCheckResponse.parse(res.body)
    expect(res.body).toMatchObject({ phase: 'coupon', revision: 0, tolerance: 0.1, summary: { braces: 2, pass: 1, exceeds: 0, missing: 1 } })
    const l2 = res.body.braces[0]
    expect(l2).toMatchObject({ level: 'L2', status: 'pass', design: { phase: 'sd', revision: 0 } })
    // core 6.5/6.5 → 0 %; KF 1.35/1.4 − 1 = −3.6 % inside ±10 % (common practice, no source)
    expect(l2.items.find((i: { item: string }) => i.item === 'stiffnessFactor').excessRatio).toBeCloseTo(1.35 / 1.4 - 1, 9)
    expect(res.body.braces[1]).toMatchObject({ level: 'Roof', status: 'missing', supplier: null })
  })

  it('checks the latest submittal revision when asked for the phase, with the excess in kip', async () => {
    const res = await engineer.agent.get('/api/projects/R-001/submittal-check?phase=submittal').expect(200)
    expect(res.body).toMatchObject({ phase: 'submittal', revision: 1 })
    const items = res.body.braces[0].items
    // AISC 341-16 F4.2a: rev 1 Tmax = 1.45 · 46 · 6.75 = 450.225 kip > 418.6 → +31.625 kip; Cmax = 1.12 · 450.225 = 504.252 > 460.46 → +43.792 kip
    expect(items.find((i: { item: string }) => i.item === 'tmax')).toMatchObject({ status: 'exceeds', excess: expect.closeTo(31.625, 9) })
    expect(items.find((i: { item: string }) => i.item === 'cmax')).toMatchObject({ status: 'exceeds', excess: expect.closeTo(43.792, 9) })
    const rev0 = await engineer.agent.get('/api/projects/R-001/submittal-check?phase=submittal&revision=0').expect(200)
    // rev 0: Tmax = 1.45 · 46 · 7.0 = 466.9 → +48.3 kip
    expect(rev0.body.braces[0].items.find((i: { item: string }) => i.item === 'tmax').excess).toBeCloseTo(48.3, 9)
  })

  it('answers 400 naming phase for a revision without a phase', async () => {
    const res = await engineer.agent.get('/api/projects/R-001/submittal-check?revision=1').expect(400)
    expect(res.body.error.fields).toHaveProperty('phase')
  })
})

describe('PATCH /api/projects/:code', () => {
  const audits = async (action: string) => (await t.db.db.select({ n: count() }).from(auditLog).where(eq(auditLog.action, action)))[0]!.n

  it('updates whitelisted fields and writes an audit entry with before and after', async () => {
    const res = await engineer.agent.patch('/api/projects/LS-02').set('x-csrf-token', engineer.csrf).send({ buildingUse: 'laboratory', floorAreaFt2: 42_000, supplierCode: 'SUP-B' }).expect(200)
    expect(res.body.project).toMatchObject({ buildingUse: 'laboratory', floorAreaFt2: 42_000, supplierCode: 'SUP-B' })
    const [entry] = await t.db.db.select().from(auditLog).where(and(eq(auditLog.action, 'project.update'), eq(auditLog.entityId, 'LS-02')))
    expect(entry!.detail).toMatchObject({ before: { buildingUse: 'office', floorAreaFt2: 40_000 }, after: { buildingUse: 'laboratory', floorAreaFt2: 42_000 } })
  })

  it('refuses bad input with a 400 naming the field, and stores nothing', async () => {
    const before = await audits('project.update')
    const [row] = await t.db.db.select().from(projects).where(eq(projects.code, 'LS-01'))
    const bad = [
      [{ stories: -2 }, 'stories'],
      [{ sdc: 'Z' }, 'sdc'],
      [{ supplierCode: 'NOPE' }, 'supplierCode'],
      [{ yearCompleted: 1999 }, 'yearCompleted'], // before the year designed, 2012
    ] as const
    for (const [body, field] of bad) {
      const res = await engineer.agent.patch('/api/projects/LS-01').set('x-csrf-token', engineer.csrf).send(body).expect(400)
      expect(Object.keys(res.body.error.fields), JSON.stringify(body)).toEqual([field])
    }
    const unknown = await engineer.agent.patch('/api/projects/LS-01').set('x-csrf-token', engineer.csrf).send({ contentHash: 'x' }).expect(400)
    expect(JSON.stringify(unknown.body.error.fields)).toMatch(/contentHash/)
    expect(await audits('project.update')).toBe(before)
    const [after] = await t.db.db.select().from(projects).where(eq(projects.code, 'LS-01'))
    expect(after).toEqual(row)
  })
})

describe('POST /api/projects/:code/snapshots', () => {
  const send = (body: Record<string, unknown>) => engineer.agent.post(`/api/projects/${draftCode}/snapshots`).set('x-csrf-token', engineer.csrf).send(body)
  const submittal = { frameLine: 'A', level: 'Level 2', phase: 'submittal', coreAreaIn2: 8.0, fyscKsi: 38, fyscBasis: 'yield_range', fyscMaxKsi: 46, beta: 1.15, omega: 1.5, stiffnessFactor: 1.5, factorDriftMultiple: 2, sourceDocument: 'Submittal 1', date: '2026-03-02' }
  const snapshotCount = async () => (await t.db.db.select({ n: count() }).from(braceSnapshots))[0]!.n

  it('records a supplier submittal on a draft with engine-computed adjusted strengths, and audits it', async () => {
    const res = await send({ ...submittal, governing: true }).expect(201)
    SnapshotCreated.parse(res.body)
    // AISC 341-16 F4.2a: Tmax = ω·Fysc,max·Asc = 1.5 · 46 · 8.0 = 552 kip; Cmax = β·Tmax = 1.15 · 552 = 634.8 kip
    expect(res.body.snapshot).toMatchObject({ phase: 'submittal', revision: 0, governing: true, adjustedTensionKip: expect.closeTo(552, 9), adjustedCompressionKip: expect.closeTo(634.8, 9) })
    expect(res.body.cautions.join(' ')).toMatch(/engineer of record decides/)
    const [entry] = await t.db.db.select().from(auditLog).where(and(eq(auditLog.action, 'snapshot.create'), eq(auditLog.entityId, String(res.body.snapshot.id))))
    expect(entry!.detail).toMatchObject({ projectCode: draftCode, level: 'Level 2', phase: 'submittal', revision: 0 })
  })

  it('numbers the next revision itself and moves the governing mark', async () => {
    const res = await send({ ...submittal, coreAreaIn2: 7.5, governing: true }).expect(201)
    expect(res.body.snapshot.revision).toBe(1)
    const detail = await engineer.agent.get(`/api/projects/${draftCode}`).expect(200)
    const snaps = detail.body.frames[0].levels[0].brace.snapshots
    expect(snaps.filter((s: { governing: boolean }) => s.governing).map((s: { revision: number }) => s.revision)).toEqual([1])
    expect(detail.body.frames[0].levels[0].brace.finalCoreAreaIn2).toBe(7.5)
    const check = await engineer.agent.get(`/api/projects/${draftCode}/submittal-check`).expect(200)
    expect(check.body).toMatchObject({ phase: 'submittal', revision: 1 })
    expect(check.body.braces[0].supplier).toEqual({ phase: 'submittal', revision: 1 })
  })

  it('refuses bad input with a 400 naming the field, and stores nothing', async () => {
    const before = { snaps: await snapshotCount(), audits: (await t.db.db.select({ n: count() }).from(auditLog))[0]!.n }
    const bad = [
      [{ ...submittal, phase: 'coupon', fyscBasis: 'coupon', fyscMaxKsi: null, ry: 1.1 }, 'ry'], // AISC 341-16 F4.2a: no Ry on a coupon value
      [{ ...submittal, beta: undefined }, 'beta'],
      [{ ...submittal, fyscMaxKsi: 30 }, 'fyscMaxKsi'],
      [{ ...submittal, fyscBasis: 'specified_min', fyscMaxKsi: null }, 'ry'],
      [{ ...submittal, phase: 'sd' }, 'phase'],
      [{ ...submittal, date: '2026-13-40' }, 'date'],
    ] as const
    for (const [body, field] of bad) {
      const res = await send(body).expect(400)
      expect(Object.keys(res.body.error.fields), field).toContain(field)
    }
    await send({ ...submittal, level: 'Level 9' }).expect(404)
    const dup = await send({ ...submittal, revision: 0 }).expect(409)
    expect(dup.body.error.message).toMatch(/next free revision is 2/)
    expect(await snapshotCount()).toBe(before.snaps)
    expect((await t.db.db.select({ n: count() }).from(auditLog))[0]!.n).toBe(before.audits)
  })
})

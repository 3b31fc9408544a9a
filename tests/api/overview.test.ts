import { readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { OverviewResponse } from '@shared/schemas/overview'
import { refreshCalibrationPairs } from '../../api/src/db/calibration'
import { reviewItems } from '../../api/src/db/history-schema'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'
import { handProject, loadHandProjects } from '../helpers/hand-history'

// Invented history: six office projects OV-01…OV-06 (BM-02-style: OV-02 and OV-05 client-confidential) and
// two healthcare ones OV-07, OV-08, each `validProject`: two stories (height band 1–3), one brace group with a
// final value (L2). OV-08's coupon Fysc is raised from 42.5 to 50 ksi, so its final Cmax exceeds the assumed one.
const PROJECTS = [
  ['OV-01', 'Open Office One', 'Client One', false, 'office'],
  ['OV-02', 'Hidden Harbour Tower', 'Secret Client Alpha', true, 'office'],
  ['OV-03', 'Open Office Three', 'Client Three', false, 'office'],
  ['OV-04', 'Open Office Four', 'Client Four', false, 'office'],
  ['OV-05', 'Quiet Vault Offices', 'Secret Client Beta', true, 'office'],
  ['OV-06', 'Open Office Six', 'Client Six', false, 'office'],
  ['OV-07', 'Clinic One', 'Client Seven', false, 'healthcare'],
  ['OV-08', 'Clinic Two', 'Client Eight', false, 'healthcare'],
] as const
const example = JSON.parse(readFileSync('docs/examples/three-story-chevron.json', 'utf8'))

let t: TestApp
let agents: Record<'bd' | 'principal' | 'engineer' | 'admin', Awaited<ReturnType<typeof signedIn>>>
let draftCode: string

beforeAll(async () => {
  t = await createTestApp()
  await loadHandProjects(
    t.db.db,
    PROJECTS.map(([code, name, client, secret, use]) => {
      const p = handProject(code, { name, client, client_confidential: secret ? 'yes' : 'no', benchmark_permitted: secret ? 'no' : 'yes', building_use: use })
      if (code === 'OV-08') p.brace_values![1]!.fysc = 50
      return p
    }),
  )
  await refreshCalibrationPairs(t.db.db)
  await t.db.db.insert(reviewItems).values([
    { projectCode: 'OV-03', field: 'fysc', value: '4.25', reason: 'likely decimal slip', status: 'open' },
    { projectCode: 'OV-03', field: 'core_area', value: '65', reason: 'likely decimal slip', status: 'open' },
    { projectCode: 'OV-04', field: 'beta', value: '11', reason: 'out of range', status: 'confirmed' },
  ])
  const roles = ['bd', 'principal', 'engineer', 'admin'] as const
  agents = Object.fromEntries(await Promise.all(roles.map(async r => [r, await signedIn(t.app, `${r}@example.com`)] as const))) as typeof agents
  const draft = await agents.engineer.agent.post('/api/projects/drafts').set('x-csrf-token', agents.engineer.csrf).send({ name: 'Draft Annex', request: example }).expect(201)
  draftCode = draft.body.code
})
afterAll(async () => t.close())

describe('GET /api/overview', () => {
  it('gives business development the coverage only, with small groups suppressed and no project named', async () => {
    const res = await agents.bd.agent.get('/api/overview').expect(200)
    const body = OverviewResponse.parse(res.body)
    expect(Object.keys(res.body).sort()).toEqual(['coverage', 'generatedAt', 'role'])
    expect(body.role).toBe('bd')
    const c = body.coverage!
    expect(c.total).toBe(8) // confidential projects count; the draft does not
    expect(c.byUse.find(g => g.key === 'office')).toMatchObject({ n: 6, suppressed: false, href: '/benchmarks?groupBy=use&use=office' })
    // Two healthcare projects: fewer than 5, so neither figure nor count is published.
    expect(c.byUse.find(g => g.key === 'healthcare')).toMatchObject({ n: null, suppressed: true })
    expect(c.byHeightBand.find(g => g.key === '1–3 stories')).toMatchObject({ n: 8, suppressed: false })
    // No use × height band cross-tab for bd: with the totals above, a suppressed cell could be found by difference.
    expect(c.cells).toEqual([])
    const text = JSON.stringify(res.body)
    for (const [code, name, client] of PROJECTS) {
      expect(text).not.toContain(code)
      expect(text).not.toContain(name)
      expect(text).not.toContain(client)
    }
    expect(text).not.toContain(draftCode)
  })

  it('gives an engineer the review queue, the drafts awaiting supplier values and recent imports, and no calibration or coverage', async () => {
    const res = await agents.engineer.agent.get('/api/overview').expect(200)
    const body = OverviewResponse.parse(res.body)
    expect(body.calibration).toBeUndefined()
    expect(body.coverage).toBeUndefined()
    const w = body.work!
    // Two open items, both of OV-03; the confirmed one is not counted.
    expect(w.review).toMatchObject({ open: 2, projects: 1, href: '/imports?tab=review' })
    expect(w.review.items.map(i => i.field).sort()).toEqual(['core_area', 'fysc'])
    // The draft has three brace groups (Level 2, Level 3, Roof), none with a supplier value yet.
    expect(w.drafts.awaiting).toBe(1)
    expect(w.drafts.items[0]).toMatchObject({ code: draftCode, name: 'Draft Annex', braces: 3, withSupplier: 0, href: `/projects/${draftCode}` })
    expect(w.imports.href).toBe('/imports?tab=history')
  })

  it('gives a principal the calibration headline worked out by hand, the unconservative final, the work and the full coverage', async () => {
    const res = await agents.principal.agent.get('/api/overview').expect(200)
    const body = OverviewResponse.parse(res.body)
    const h = body.calibration!.headline
    // Cmax = β·ω·Fysc·Asc (AISC 341-16 F4.2a; the yield-range upper bound stands in for Ry·Fysc).
    // Assumed (sd): 1.1 × 1.4 × 46 × 6.5 = 460.46 kip. Final (coupon): 1.12 × 1.45 × 42.5 × 6.5 = 448.63 kip
    // → ratio 1.02637 on seven projects; OV-08: 1.12 × 1.45 × 50 × 6.5 = 527.80 kip → 0.87242.
    // Eight braces: median = 1.02637, one of eight underestimated (0.125).
    expect(h.braces).toBe(8)
    expect(h.medianRatio).toBeCloseTo(460.46 / 448.63, 4)
    expect(h.underestimateRate).toBeCloseTo(1 / 8, 9)
    expect(h.href).toBe('/calibration?quantity=cmax&groupBy=none')
    const u = body.calibration!.unconservative
    expect(u.map(x => x.code)).toEqual(['OV-08'])
    expect(u[0]!.worstRatio).toBeCloseTo(460.46 / 527.8, 3)
    expect(u[0]!.href).toBe('/projects/OV-08')
    expect(body.work!.review.open).toBe(2)
    // Principals see every group's count, small ones included.
    expect(body.coverage!.byUse.find(g => g.key === 'healthcare')).toMatchObject({ n: 2, suppressed: false })
    const cells = body.coverage!.cells
    expect(cells.find(x => x.use === 'office' && x.heightBand === '1–3 stories')).toMatchObject({ n: 6, suppressed: false })
    expect(cells.find(x => x.use === 'healthcare' && x.heightBand === '4–7 stories')).toMatchObject({ n: 0, suppressed: false })
  })

  it('gives an administrator none of the sections, and anonymous callers a 401', async () => {
    const res = await agents.admin.agent.get('/api/overview').expect(200)
    expect(Object.keys(res.body).sort()).toEqual(['generatedAt', 'role'])
    const { default: request } = await import('supertest')
    await request(t.app).get('/api/overview').expect(401)
  })
})

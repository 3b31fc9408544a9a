import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'
import { handProject, loadHandProjects } from '../helpers/hand-history'
import { BenchmarkResponse, ProposalResponse } from '@shared/schemas/benchmarks'
import { refreshCalibrationPairs } from '../../api/src/db/calibration'

// Eight invented two-story projects on 40 000 ft², one braced frame line each (first-story shear 300 kip).
// Office BM-01…BM-06: final lateral steel 20, 30, 40, 50, 60, 70 tons (→ 1.0 … 3.5 lb/ft²), preliminary 40 tons,
// final structural 200 tons. BM-02 and BM-05 are client-confidential; BM-06 is not confidential but not
// benchmark-permitted. Healthcare BM-07, BM-08: 80 and 90 tons (4.0, 4.5 lb/ft²).
const CONFIDENTIAL = [
  { code: 'BM-02', name: 'Hidden Harbour Tower', client: 'Secret Client Alpha' },
  { code: 'BM-05', name: 'Quiet Vault Offices', client: 'Secret Client Beta' },
]
const lateral = [20, 30, 40, 50, 60, 70]

let t: TestApp
let bd: Awaited<ReturnType<typeof signedIn>>
let principal: Awaited<ReturnType<typeof signedIn>>
let engineer: Awaited<ReturnType<typeof signedIn>>

beforeAll(async () => {
  t = await createTestApp()
  const tons = (final: number) => [
    { stage: 'preliminary', category: 'lateral_total', weight: 40 },
    { stage: 'final', category: 'lateral_total', weight: final },
    { stage: 'final', category: 'structural_total', weight: 200 },
  ]
  const office = lateral.map((ton, i) => {
    const code = `BM-0${i + 1}`
    const secret = CONFIDENTIAL.find(c => c.code === code)
    return handProject(
      code,
      {
        name: secret?.name ?? `Open Office ${i + 1}`,
        client: secret?.client ?? `Client 00${i + 1}`,
        client_confidential: secret ? 'yes' : 'no',
        benchmark_permitted: secret || code === 'BM-06' ? 'no' : 'yes',
        building_use: 'office',
        region: 'Region 1',
      },
      tons(ton),
    )
  })
  const health = [80, 90].map((ton, i) =>
    handProject(`BM-0${i + 7}`, { name: `Clinic ${i + 1}`, client: `Client 01${i}`, client_confidential: 'no', benchmark_permitted: 'yes', building_use: 'healthcare', region: 'Region 1' }, tons(ton)),
  )
  await loadHandProjects(t.db.db, [...office, ...health])
  ;[bd, principal, engineer] = await Promise.all(['bd', 'principal', 'engineer'].map(r => signedIn(t.app, `${r}@example.com`)))
})
afterAll(async () => t.close())

describe('GET /api/benchmarks as business development', () => {
  it('publishes the office group with percentile bands computed by hand', async () => {
    const res = await bd.agent.get('/api/benchmarks?groupBy=use').expect(200)
    BenchmarkResponse.parse(res.body) // the answer matches the shared contract
    expect(res.body.n).toBe(8) // confidential projects count
    const office = res.body.groups.find((g: { key: string }) => g.key === 'office')
    expect(office).toMatchObject({ n: 6, suppressed: false })
    // lb/ft² = tons × 2000 / 40 000 = [1.0, 1.5, 2.0, 2.5, 3.0, 3.5]; type 7, h = 5p:
    // P10 h=0.5 → 1.25; P25 h=1.25 → 1.625; P50 h=2.5 → 2.25; P75 h=3.75 → 2.875; P90 h=4.5 → 3.25
    expect(office.metrics.lateralPerFloorArea).toEqual({ n: 6, p10: expect.closeTo(1.25, 9), p25: expect.closeTo(1.625, 9), p50: expect.closeTo(2.25, 9), p75: expect.closeTo(2.875, 9), p90: expect.closeTo(3.25, 9) })
    expect(office.metrics.structuralPerFloorArea.p50).toBeCloseTo(10, 9) // 200 × 2000 / 40 000
    expect(office.metrics.lateralPerStory.p50).toBeCloseTo(22.5, 9) // median tons 45 / 2 stories
    expect(office.metrics.lateralPerFrame.p50).toBeCloseTo(45, 9) // one frame line
    expect(office.metrics.lateralPerBaseShear.p50).toBeCloseTo(0.15, 9) // 45 tons / 300 kip (first-story shear of line A)
    // final / preliminary − 1 = t/40 − 1 = [−0.5, −0.25, 0, 0.25, 0.5, 0.75] → median 0.125
    expect(office.metrics.lateralEstimateSpread.p50).toBeCloseTo(0.125, 9)
    // The Roof braces of these projects have no final snapshot, so no total core area: no figure.
    expect(office.metrics.bracePerCoreArea).toBeNull()
    expect(res.body.metricUnits.lateralPerFloorArea).toBe('lb/ft²')
    expect(res.body.cautions.join(' ')).toMatch(/engineer of record decides/)
  })

  it('suppresses a group of fewer than five projects: the message and no figures', async () => {
    const res = await bd.agent.get('/api/benchmarks?groupBy=use').expect(200)
    const health = res.body.groups.find((g: { key: string }) => g.key === 'healthcare')
    expect(health).toEqual({ key: 'healthcare', n: null, suppressed: true, message: 'too few projects to publish' })
  })

  it('never names a confidential project (code, name or client) in any grouping, nor any client at all', async () => {
    for (const groupBy of ['use', 'heightBand', 'sdc', 'region', 'years']) {
      const res = await bd.agent.get(`/api/benchmarks?groupBy=${groupBy}`).expect(200)
      const text = JSON.stringify(res.body)
      for (const c of CONFIDENTIAL) for (const v of Object.values(c)) expect(text, `${groupBy}: ${v}`).not.toContain(v)
      expect(text).not.toMatch(/Client 0/)
      expect(text).not.toMatch(/"client"/)
    }
    const office = (await bd.agent.get('/api/benchmarks?groupBy=use').expect(200)).body.groups.find((g: { key: string }) => g.key === 'office')
    // Only non-confidential, benchmark-permitted projects are listed (BM-06 is not permitted).
    expect(office.projects.map((p: { code: string }) => p.code)).toEqual(['BM-01', 'BM-03', 'BM-04'])
  })

  it('answers in kg/m² with ?units=si (NIST SP 811: 1 lb/ft² = 4.882428 kg/m²)', async () => {
    const res = await bd.agent.get('/api/benchmarks?groupBy=use&units=si').expect(200)
    const office = res.body.groups.find((g: { key: string }) => g.key === 'office')
    expect(office.metrics.lateralPerFloorArea.p50).toBeCloseTo(2.25 * 4.882428, 5)
    // NIST SP 811: ton (short) = 907.1847 kg → 22.5 tons/story = 20.41166 t/story
    expect(office.metrics.lateralPerStory.p50).toBeCloseTo(22.5 * 0.9071847, 5)
    expect(res.body.metricUnits.lateralPerFloorArea).toBe('kg/m²')
  })

  it('applies filters before grouping, so a filtered group below five is suppressed too', async () => {
    const res = await bd.agent.get('/api/benchmarks?groupBy=region&use=healthcare').expect(200)
    expect(res.body.groups).toEqual([{ key: 'Region 1', n: null, suppressed: true, message: 'too few projects to publish' }])
  })

  it('answers 400 naming the field for a grouping it does not know', async () => {
    const res = await bd.agent.get('/api/benchmarks?groupBy=client').expect(400)
    expect(Object.keys(res.body.error.fields)).toEqual(['groupBy'])
  })
})

describe('GET /api/benchmarks as a principal', () => {
  it('sees small groups and every project by code', async () => {
    const res = await principal.agent.get('/api/benchmarks?groupBy=use').expect(200)
    const health = res.body.groups.find((g: { key: string }) => g.key === 'healthcare')
    expect(health.suppressed).toBe(false)
    expect(health.metrics.lateralPerFloorArea.p50).toBeCloseTo(4.25, 9) // [4.0, 4.5] → h = 0.5 → 4.25
    const office = res.body.groups.find((g: { key: string }) => g.key === 'office')
    expect(office.projects.map((p: { code: string }) => p.code)).toEqual(['BM-01', 'BM-02', 'BM-03', 'BM-04', 'BM-05', 'BM-06'])
  })
})

describe('POST /api/benchmarks/proposal', () => {
  it('gives the matching group, its n and the expected tonnage for the building', async () => {
    const res = await bd.agent.post('/api/benchmarks/proposal').set('x-csrf-token', bd.csrf).send({ use: 'office', stories: 2, floorArea: 100_000 }).expect(200)
    ProposalResponse.parse(res.body)
    expect(res.body.group).toEqual({ criteria: { use: 'office', heightBand: '1–3 stories' }, n: 6 })
    // P25/P50/P75 = 1.625 / 2.25 / 2.875 lb/ft² × 100 000 ft² / 2000 lb/ton
    expect(res.body.expectedLateral).toEqual({ low: expect.closeTo(81.25, 9), median: expect.closeTo(112.5, 9), high: expect.closeTo(143.75, 9), unit: 'ton' })
    expect(res.body.expectedStructural.median).toBeCloseTo(500, 9) // 10 lb/ft² × 100 000 / 2000
    expect(res.body.cautions.join(' ')).toMatch(/Based on 6 past projects/)
    expect(JSON.stringify(res.body)).not.toMatch(/BM-0/)
  })

  it('widens to the height band when the use has fewer than five projects, and says so', async () => {
    const res = await bd.agent.post('/api/benchmarks/proposal').set('x-csrf-token', bd.csrf).send({ use: 'healthcare', stories: 2, floorArea: 100_000 }).expect(200)
    expect(res.body.group).toEqual({ criteria: { heightBand: '1–3 stories' }, n: 8 })
    // all eight: [1, 1.5, 2, 2.5, 3, 3.5, 4, 4.5], h = 7p: P50 h=3.5 → 2.75 lb/ft² → 137.5 tons
    expect(res.body.expectedLateral.median).toBeCloseTo(137.5, 9)
    expect(res.body.cautions[0]).toMatch(/widened to heightBand 1–3 stories/)
  })

  it('answers 400 naming the field for a floor area that is not positive', async () => {
    const res = await bd.agent.post('/api/benchmarks/proposal').set('x-csrf-token', bd.csrf).send({ use: 'office', stories: 2, floorArea: -5 }).expect(400)
    expect(Object.keys(res.body.error.fields)).toEqual(['floorArea'])
  })
})

describe('access', () => {
  it('keeps business development out of every project- and brace-level endpoint (403)', async () => {
    const paths = ['/api/projects', '/api/projects/BM-01', '/api/projects/BM-01/submittal-check', 'PATCH /api/projects/BM-01', 'POST /api/projects/BM-01/snapshots', 'POST /api/precedents/search', '/api/history/export', '/api/review-items']
    const denied = [
      bd.agent.get('/api/projects'),
      bd.agent.get('/api/projects/BM-01'),
      bd.agent.get('/api/projects/BM-01/submittal-check'),
      bd.agent.patch('/api/projects/BM-01').set('x-csrf-token', bd.csrf).send({ name: 'x' }),
      bd.agent.post('/api/projects/BM-01/snapshots').set('x-csrf-token', bd.csrf).send({}),
      bd.agent.post('/api/precedents/search').set('x-csrf-token', bd.csrf).send({ description: { stories: 2 } }),
      bd.agent.get('/api/history/export'),
      bd.agent.get('/api/review-items'),
    ]
    for (const [i, res] of (await Promise.all(denied)).entries()) {
      expect(res.status, paths[i]).toBe(403)
      expect(res.body.error.code).toBe('FORBIDDEN')
      expect(JSON.stringify(res.body)).not.toMatch(/BM-0|Secret/)
    }
  })

  it('keeps engineers out of benchmarks (principal and business development only)', async () => {
    await engineer.agent.get('/api/benchmarks').expect(403)
  })
})

// Last in this file: it adds projects.
describe('kept answers', () => {
  it('are recomputed once the history changes (an import of three more healthcare projects)', async () => {
    const before = await principal.agent.get('/api/benchmarks?groupBy=use').expect(200)
    expect(before.body.groups.find((g: { key: string }) => g.key === 'healthcare').n).toBe(2)
    const asked = { use: 'healthcare', stories: 2, floorArea: 100_000 }
    expect((await bd.agent.post('/api/benchmarks/proposal').set('x-csrf-token', bd.csrf).send(asked).expect(200)).body.group.n).toBe(8)
    // The same question again is answered from what was kept: the same figures.
    expect((await principal.agent.get('/api/benchmarks?groupBy=use').expect(200)).body).toEqual(before.body)

    const tons = (final: number) => [
      { stage: 'final', category: 'lateral_total', weight: final },
      { stage: 'final', category: 'structural_total', weight: 200 },
    ]
    await loadHandProjects(
      t.db.db,
      [100, 110, 120].map((ton, i) => handProject(`BM-1${i}`, { name: `Clinic ${i + 3}`, client: `Client 02${i}`, client_confidential: 'no', benchmark_permitted: 'yes', building_use: 'healthcare', region: 'Region 1' }, tons(ton))),
    )
    // What every import run does after loading (etl/src/run.ts): refresh the pairs, bumping the data version.
    await refreshCalibrationPairs(t.db.db)
    const after = await principal.agent.get('/api/benchmarks?groupBy=use').expect(200)
    const health = after.body.groups.find((g: { key: string }) => g.key === 'healthcare')
    expect(health.n).toBe(5)
    // 80 … 120 tons on 40 000 ft² → 4.0, 4.5, 5.0, 5.5, 6.0 lb/ft²: median 5.0
    expect(health.metrics.lateralPerFloorArea.p50).toBeCloseTo(5.0, 9)
    const res = await bd.agent.post('/api/benchmarks/proposal').set('x-csrf-token', bd.csrf).send(asked).expect(200)
    expect(res.body.group).toEqual({ criteria: { use: 'healthcare', heightBand: '1–3 stories' }, n: 5 })
    expect(res.body.expectedLateral.median).toBeCloseTo(250, 9) // 5.0 lb/ft² × 100 000 ft² / 2000 lb/ton
  })
})

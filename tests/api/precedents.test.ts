import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'
import { handProject, loadHandProjects } from '../helpers/hand-history'
import { PrecedentSearchResponse } from '@shared/schemas/precedents'

// Three invented finished projects, one frame line each (the two-story inverted V of the bundle builder):
// PR-1 first-story shear 300 kip, inverted V; PR-2 600 kip, inverted V; PR-3 300 kip, single diagonal.
// Spread of ln V over [ln 300, ln 300, ln 600] (type-7 quartiles at h = 0.5 and 1.5): Q1 = ln 300,
// Q3 = ln 300 + 0.5·ln 2 → IQR = 0.5·ln 2.
let t: TestApp
let engineer: Awaited<ReturnType<typeof signedIn>>

beforeAll(async () => {
  t = await createTestApp()
  const pr1 = handProject('PR-1', { name: 'Poplar One', building_use: 'office' })
  const pr2 = handProject('PR-2', { name: 'Poplar Two', building_use: 'office' })
  pr2.levels[0]!.story_shear = 600
  const pr3 = handProject('PR-3', { name: 'Poplar Three', building_use: 'office' })
  pr3.frames[0]!.configuration = 'single_diagonal'
  await loadHandProjects(t.db.db, [pr1, pr2, pr3])
  engineer = await signedIn(t.app, 'engineer@example.com')
})
afterAll(async () => t.close())

const search = (body: object) => engineer.agent.post('/api/precedents/search').set('x-csrf-token', engineer.csrf).send(body)

describe('POST /api/precedents/search', () => {
  it('ranks by weighted normalised distance with the per-feature breakdown (default weights: shear 3, configuration 2)', async () => {
    const res = await search({ description: { storyShear: 300, configuration: 'inverted_v' } }).expect(200)
    PrecedentSearchResponse.parse(res.body) // the answer matches the shared contract
    // PR-1: identical → D = 0, similarity 1
    // PR-3: d_V = 0, configuration mismatch 1 → D = 2·1/5 = 0.4
    // PR-2: d_V = ln 2 / (0.5·ln 2) = 2 → D = 3·2/5 = 1.2
    expect(res.body.matches.map((m: { code: string }) => m.code)).toEqual(['PR-1', 'PR-3', 'PR-2'])
    expect(res.body.matches.map((m: { distance: number }) => m.distance)).toEqual([expect.closeTo(0, 12), expect.closeTo(0.4, 9), expect.closeTo(1.2, 9)])
    expect(res.body.matches[0].similarity).toBeCloseTo(1, 12)
    expect(res.body.matches[2].similarity).toBeCloseTo(Math.exp(-1.2), 9)
    expect(res.body.spreads.storyShear).toBeCloseTo(0.5 * Math.LN2, 9)
    expect(res.body.candidates).toBe(3)
    const shear = res.body.matches[2].breakdown.find((b: { feature: string }) => b.feature === 'storyShear')
    expect(shear).toMatchObject({ weight: 3, query: 300, candidate: 600, distance: expect.closeTo(2, 9), contribution: expect.closeTo(1.2, 9) })
  })

  it('returns the final cores by level, assumed and final factors, and tonnage per floor area', async () => {
    const res = await search({ description: { storyShear: 300, configuration: 'inverted_v' }, limit: 1 }).expect(200)
    expect(res.body.matches).toHaveLength(1)
    const m = res.body.matches[0]
    expect(m).toMatchObject({ rank: 1, code: 'PR-1', name: 'Poplar One', frameLine: 'A', yearDesigned: 2019 })
    expect(m.levels[0]).toMatchObject({ level: 'L2', storyShearKip: 300, preliminaryCoreAreaIn2: 6.5, finalCoreAreaIn2: 6.5, assumed: { beta: 1.1, omega: 1.4, stiffnessFactor: 1.4 }, final: { beta: 1.12, omega: 1.45, stiffnessFactor: 1.35, factorDriftMultiple: 2 } })
    expect(m.levels[1]).toMatchObject({ level: 'Roof', finalCoreAreaIn2: null, final: null })
    expect(m.lateralLbPerFt2).toBeCloseTo((39.5 * 2000) / 40_000, 9) // 1.975 lb/ft²
    expect(res.body.cautions.join(' ')).toMatch(/engineer of record decides/)
  })

  it('lets the user weights change the order: configuration 10 puts PR-2 before PR-3', async () => {
    // Σw = 13: PR-2 D = 3·2/13 = 0.461538; PR-3 D = 10·1/13 = 0.769231
    const res = await search({ description: { storyShear: 300, configuration: 'inverted_v' }, weights: { configuration: 10 } }).expect(200)
    expect(res.body.matches.map((m: { code: string }) => m.code)).toEqual(['PR-1', 'PR-2', 'PR-3'])
    expect(res.body.matches[1].distance).toBeCloseTo(6 / 13, 9)
  })

  it('takes SI input: 1334.47 kN is the 300 kip shear (NIST SP 811: 1 kip = 4.448222 kN)', async () => {
    const res = await search({ description: { storyShear: 300 * 4.448222, configuration: 'inverted_v' }, units: 'si' }).expect(200)
    expect(res.body.matches[0].code).toBe('PR-1')
    expect(res.body.matches[0].distance).toBeLessThan(1e-5)
  })

  it('answers 400 naming the field for an unknown weight, an empty description or a bad limit', async () => {
    expect((await search({ description: { stories: 2 }, weights: { colour: 1 } }).expect(400)).body.error.fields).toHaveProperty('weights')
    expect(Object.keys((await search({ description: {} }).expect(400)).body.error.fields)[0]).toMatch(/^description/)
    expect((await search({ description: { stories: 2 }, limit: 0 }).expect(400)).body.error.fields).toHaveProperty('limit')
  })
})

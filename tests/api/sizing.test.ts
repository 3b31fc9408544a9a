import { execFileSync, spawnSync } from 'node:child_process'
import { readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { FALLBACK_SIZING_DEFAULTS } from '@shared/schemas/settings'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'

const EXAMPLE = 'docs/examples/three-story-chevron.json'
const example = JSON.parse(readFileSync(EXAMPLE, 'utf8'))

let t: TestApp
let engineer: Awaited<ReturnType<typeof signedIn>>
let principal: Awaited<ReturnType<typeof signedIn>>
beforeAll(async () => {
  t = await createTestApp()
  engineer = await signedIn(t.app, 'engineer@example.com')
  principal = await signedIn(t.app, 'principal@example.com')
})
afterAll(async () => t.close())

describe('POST /api/sizing/frame', () => {
  it('sizes the example three-story chevron frame (hand check of the bottom story)', async () => {
    const res = await engineer.agent.post('/api/sizing/frame').set('x-csrf-token', engineer.csrf).send(example)
    expect(res.status).toBe(200)
    const [l2] = res.body.levels
    // derived: statics — inverted-V, 30 ft bay, 15 ft story: tan θ = 2·15/30 → θ = 45°
    expect(l2.angleDeg).toBeCloseTo(45, 6)
    // Pu = V / (n cos θ) = 420 / (2 · 0.70711) = 296.98 kip
    expect(l2.braceAxialDemand).toBeCloseTo(296.98, 2)
    // AISC 341-16 F4.5b (from memory): Asc,req = Pu / (0.90 · Fysc) = 296.98 / 34.2 = 8.684 in²
    expect(l2.requiredCoreArea).toBeCloseTo(8.684, 3)
    // common practice, no source: 0.5 in² steps between 5 and 10 in² → 9.0 in²
    expect(l2.coreArea).toBe(9)
    // AISC 341-16 F4.2a: Tmax = ω·Fysc,max·Asc = 1.4 · 46 · 9 = 579.6 kip (yield range upper bound, Ry = 1)
    expect(l2.adjustedTension).toBeCloseTo(579.6, 6)
    // Cmax = β·Tmax = 1.1 · 579.6 = 637.56 kip
    expect(l2.adjustedCompression).toBeCloseTo(637.56, 6)
    // derived: statics — (Cmax − Tmax)·sin θ = 57.96 · 0.70711 = 40.98 kip, upward on the beam above
    expect(l2.beamUnbalancedLoad).toBeCloseTo(40.98, 2)
    expect(l2.beamUnbalancedDirection).toBe('up')
    // AISC 341-16 F4.6c (from memory): 1.1 · Cmax = 701.32 kip
    expect(l2.connectionRequiredStrength).toBeCloseTo(701.316, 3)
    expect(res.body.units.braceAxialDemand).toBe('kip')
    expect(res.body.cautions.join(' ')).toMatch(/engineer of record/i)
  })

  it('answers 400 VALIDATION_FAILED naming the field of a bad story height', async () => {
    const bad = structuredClone(example)
    bad.levels[1].storyHeight = -13
    const res = await engineer.agent.post('/api/sizing/frame').set('x-csrf-token', engineer.csrf).send(bad)
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('VALIDATION_FAILED')
    expect(Object.keys(res.body.error.fields)).toContain('levels.1.storyHeight')
  })

  it('answers 400 naming the field for an unknown configuration', async () => {
    const res = await engineer.agent.post('/api/sizing/frame').set('x-csrf-token', engineer.csrf).send({ ...example, configuration: 'k_brace' })
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.error.fields)).toEqual(['configuration'])
  })

  it('agrees with `npm run size` on the same request', async () => {
    const res = await engineer.agent.post('/api/sizing/frame').set('x-csrf-token', engineer.csrf).send(example)
    const cli = execFileSync(process.execPath, ['--import', 'tsx', 'scripts/size.ts', EXAMPLE], { encoding: 'utf8' })
    expect(JSON.parse(cli)).toEqual(res.body)
  })

  it('`npm run size` prints the error envelope and exits 1 on invalid input', () => {
    const bad = JSON.stringify({ ...example, bayWidth: 0 })
    const r = spawnSync(process.execPath, ['--import', 'tsx', 'scripts/size.ts', '-'], { input: bad, encoding: 'utf8' })
    expect(r.status).toBe(1)
    expect(JSON.parse(r.stderr).error.fields).toHaveProperty('bayWidth')
  })
})

describe('GET and PUT /api/settings/sizing', () => {
  it('starts from the built-in defaults, and a principal can replace them (with an audit entry)', async () => {
    expect((await engineer.agent.get('/api/settings/sizing').expect(200)).body).toEqual(FALLBACK_SIZING_DEFAULTS)
    const next = { ...FALLBACK_SIZING_DEFAULTS, beta: 1.15, omega: 1.45 }
    const res = await principal.agent.put('/api/settings/sizing').set('x-csrf-token', principal.csrf).send(next)
    expect(res.status).toBe(200)
    expect((await engineer.agent.get('/api/settings/sizing')).body).toMatchObject({ beta: 1.15, omega: 1.45 })
  })

  it('refuses a core-step table whose bands do not increase, naming the field, and keeps the stored value', async () => {
    const before = (await engineer.agent.get('/api/settings/sizing')).body
    const bad = { ...FALLBACK_SIZING_DEFAULTS, coreSteps: [{ upTo: 10, step: 0.5 }, { upTo: 5, step: 0.25 }, { upTo: null, step: 1 }] }
    const res = await principal.agent.put('/api/settings/sizing').set('x-csrf-token', principal.csrf).send(bad)
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.error.fields).some(k => k.startsWith('coreSteps'))).toBe(true)
    expect((await engineer.agent.get('/api/settings/sizing')).body).toEqual(before)
  })
})

describe('GET and PUT /api/worksheets/new-frame', () => {
  it('keeps each user’s worksheet to themselves', async () => {
    const state = { configuration: 'inverted_v', levels: [{ name: 'L2', storyHeight: 15, storyShear: 400 }] }
    await engineer.agent.put('/api/worksheets/new-frame').set('x-csrf-token', engineer.csrf).send({ state }).expect(200)
    expect((await engineer.agent.get('/api/worksheets/new-frame')).body.state).toEqual(state)
    expect((await principal.agent.get('/api/worksheets/new-frame')).body.state).toBeNull()
  })

  it('refuses a worksheet over 64 KB', async () => {
    const res = await engineer.agent
      .put('/api/worksheets/new-frame')
      .set('x-csrf-token', engineer.csrf)
      .send({ state: { notes: 'x'.repeat(70_000) } })
    expect(res.status).toBe(400)
    expect(res.body.error.fields).toHaveProperty('state')
  })

  it('answers 400 for an unknown worksheet kind', async () => {
    await engineer.agent.get('/api/worksheets/other').expect(400)
  })
})

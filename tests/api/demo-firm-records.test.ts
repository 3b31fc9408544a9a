import { eq } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { projects } from '../../api/src/db/history-schema'
import { expandPaths } from '../../etl/src/paths'
import { readInputs, runImport } from '../../etl/src/run'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'

// The invented demo firm (demo-data/README.md: 150 projects, 58 client-confidential, one rejected for an empty
// story height), loaded through the real loader: the confidentiality rules must hold on a realistic history.
let t: TestApp
let bd: Awaited<ReturnType<typeof signedIn>>
let engineer: Awaited<ReturnType<typeof signedIn>>
let principal: Awaited<ReturnType<typeof signedIn>>
let confidential: { code: string; name: string; client: string | null }[]

beforeAll(async () => {
  t = await createTestApp()
  await runImport(t.db.db, await readInputs(await expandPaths(['demo-data'])), { source: 'cli' })
  confidential = await t.db.db.select({ code: projects.code, name: projects.name, client: projects.client }).from(projects).where(eq(projects.clientConfidential, true))
  ;[bd, engineer, principal] = await Promise.all(['bd', 'engineer', 'principal'].map(r => signedIn(t.app, `${r}@example.com`)))
}, 120_000)
afterAll(async () => t.close())

describe('benchmarks over the demo firm, as business development', () => {
  it('never shows a confidential project by code, name or client, and publishes only groups of five or more', async () => {
    // demo-data/README.md: 58 confidential in the files; the rejected SO-2020-002 (empty story height) is one of them.
    expect(confidential.length).toBe(57)
    for (const groupBy of ['use', 'heightBand', 'sdc', 'region', 'years']) {
      for (const units of ['us', 'si']) {
        const res = await bd.agent.get(`/api/benchmarks?groupBy=${groupBy}&units=${units}`).expect(200)
        const text = JSON.stringify(res.body)
        for (const c of confidential) {
          expect(text).not.toContain(`"${c.code}"`)
          expect(text).not.toContain(`"${c.name}"`)
          if (c.client) expect(text).not.toContain(c.client)
        }
        const principalView = await principal.agent.get(`/api/benchmarks?groupBy=${groupBy}&units=${units}`).expect(200)
        for (const g of principalView.body.groups) {
          const seen = res.body.groups.find((x: { key: string }) => x.key === g.key)
          if (g.n < 5) expect(seen).toEqual({ key: g.key, n: null, suppressed: true, message: 'too few projects to publish' })
          else expect(seen).toMatchObject({ n: g.n, suppressed: false, metrics: g.metrics })
        }
        // Confidential projects still count: the principal's groups add up to every finished project counted.
        expect(principalView.body.groups.reduce((s: number, g: { n: number }) => s + g.n, 0)).toBe(res.body.n)
      }
    }
    // 149 loaded, none a draft; the probable duplicate waits in review, so 148 count.
    const all = await bd.agent.get('/api/benchmarks?groupBy=use').expect(200)
    expect(all.body.n).toBe(148)
  })

  it('gives a proposal range without naming any project', async () => {
    const res = await bd.agent.post('/api/benchmarks/proposal').set('x-csrf-token', bd.csrf).send({ use: 'office', stories: 5, floorArea: 120_000, sdc: 'D' }).expect(200)
    expect(res.body.group.n).toBeGreaterThanOrEqual(5)
    expect(res.body.expectedLateral.low).toBeLessThanOrEqual(res.body.expectedLateral.median)
    expect(res.body.expectedLateral.median).toBeLessThanOrEqual(res.body.expectedLateral.high)
    expect(JSON.stringify(res.body)).not.toMatch(/"code"/)
  })
})

describe('project records over the demo firm', () => {
  it('pages through all 149 projects without repeats', async () => {
    const seen = new Set<string>()
    for (let page = 1; page <= 3; page++) {
      const res = await engineer.agent.get(`/api/projects?pageSize=60&page=${page}&sort=yearDesigned`).expect(200)
      expect(res.body.total).toBe(149)
      for (const i of res.body.items) seen.add(i.code)
    }
    expect(seen.size).toBe(149)
  })

  it('shows the revised submittal of SO-2025-003 as a timeline and checks rev 1 by default', async () => {
    // demo-data/README.md: submittal rev 0 and rev 1, not yet approved; rev 1 governs every brace.
    const detail = await engineer.agent.get('/api/projects/SO-2025-003').expect(200)
    const brace = detail.body.frames[0].levels[0].brace
    const supplierSteps = brace.snapshots.filter((s: { phase: string }) => s.phase === 'submittal').map((s: { revision: number }) => s.revision)
    expect(supplierSteps).toEqual([0, 1])
    expect(brace.final).toMatchObject({ phase: 'submittal', revision: 1 })
    const check = await engineer.agent.get('/api/projects/SO-2025-003/submittal-check').expect(200)
    expect(check.body).toMatchObject({ phase: 'submittal', revision: 1 })
    expect(check.body.summary.braces).toBe(check.body.braces.length)
  })

  it('finds precedents among all frame lines of the finished projects', async () => {
    const res = await engineer.agent
      .post('/api/precedents/search')
      .set('x-csrf-token', engineer.csrf)
      .send({ description: { storyShear: 250, stories: 4, storyHeight: 13, bayWidth: 30, configuration: 'inverted_v', sdc: 'D', buildingUse: 'office' }, limit: 5 })
      .expect(200)
    expect(res.body.candidates).toBeGreaterThan(1000) // 1091 frame lines less the rejected project's
    expect(res.body.matches).toHaveLength(5)
    const d = res.body.matches.map((m: { distance: number }) => m.distance)
    expect([...d].sort((a, b) => a - b)).toEqual(d)
  })
})

import { readFileSync } from 'node:fs'
import { eq, sql } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { projects } from '../../api/src/db/history-schema'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'

const example = JSON.parse(readFileSync('docs/examples/three-story-chevron.json', 'utf8'))

let t: TestApp
let engineer: Awaited<ReturnType<typeof signedIn>>
beforeAll(async () => {
  t = await createTestApp()
  engineer = await signedIn(t.app, 'engineer@example.com')
})
afterAll(async () => t.close())

describe('POST /api/projects/drafts', () => {
  it('saves the worksheet as a draft project whose assumed values are its schematic snapshot', async () => {
    const res = await engineer.agent.post('/api/projects/drafts').set('x-csrf-token', engineer.csrf).send({ name: 'Harbor Terrace Offices', request: example })
    expect(res.status).toBe(201)
    expect(res.body.code).toMatch(/^DRAFT-\d{4}-001$/)
    const [p] = await t.db.db.select().from(projects).where(eq(projects.code, res.body.code))
    expect(p).toMatchObject({ name: 'Harbor Terrace Offices', draft: true, stories: 3, phaseReached: 'sd' })
    // 15 + 13 + 13 ft = 41 ft
    expect(p!.heightFt).toBeCloseTo(41, 9)
    const rows = await t.db.db.execute(sql`
      select l.name, l.story_height_in, s.phase, s.core_area_in2, s.adjusted_tension_kip, b.required_strength_kip
      from brace_snapshots s join braces b on b.id = s.brace_id join levels l on l.id = b.level_id join frames f on f.id = l.frame_id
      where f.project_id = ${p!.id} order by l.level_index`)
    expect(rows.rows).toHaveLength(3)
    const bottom = rows.rows[0] as Record<string, number | string>
    expect(bottom).toMatchObject({ name: 'Level 2', story_height_in: 180, phase: 'sd', core_area_in2: 9 })
    // Same hand check as the sizing API: Pu = 296.98 kip, Tmax = 1.4 · 46 · 9 = 579.6 kip (AISC 341-16 F4.2a)
    expect(bottom.required_strength_kip as number).toBeCloseTo(296.98, 2)
    expect(bottom.adjusted_tension_kip as number).toBeCloseTo(579.6, 9)
  })

  it('numbers drafts one after another, and names the field of a bad request', async () => {
    const second = await engineer.agent.post('/api/projects/drafts').set('x-csrf-token', engineer.csrf).send({ name: 'Second', request: example })
    expect(second.body.code).toMatch(/-002$/)
    const bad = await engineer.agent.post('/api/projects/drafts').set('x-csrf-token', engineer.csrf).send({ name: 'Bad', request: { ...example, bayWidth: -1 } })
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields).toHaveProperty('bayWidth')
  })
})

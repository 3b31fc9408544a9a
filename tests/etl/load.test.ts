import { count, eq, sql } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { braceSnapshots, frames, levels, projects, reviewItems, tonnage } from '../../api/src/db/history-schema'
import { loadProjects, upsertSuppliers } from '../../etl/src/load'
import { transform } from '../../etl/src/transform'
import { createTestDb, type TestDb } from '../helpers/db'
import { bundle, validProject } from './bundle-builder'

let t: TestDb
beforeAll(async () => {
  t = await createTestDb()
})
afterAll(async () => t.drop())

async function load(tables: ReturnType<typeof validProject>) {
  const a = transform([bundle(tables)])
  await upsertSuppliers(t.db, a.suppliers)
  return loadProjects(t.db, a.projects)
}

/** Every table's rows (ids and all), to compare states exactly. */
async function snapshotOfDb() {
  const q = async (table: string) => (await t.db.execute(sql.raw(`select * from ${table} order by id`))).rows
  return { projects: await q('projects'), frames: await q('frames'), levels: await q('levels'), braces: await q('braces'), snaps: await q('brace_snapshots'), tonnage: await q('tonnage'), reviews: await q('review_items') }
}

describe('loadProjects(db, records)', () => {
  it('loads a project with all its children', async () => {
    const r = await load(validProject('L-001'))
    expect(r).toMatchObject({ loaded: ['L-001'], updated: [], unchanged: [], failed: [] })
    const [p] = await t.db.select().from(projects).where(eq(projects.code, 'L-001'))
    expect(p!.floorAreaFt2).toBe(40_000)
    const [{ n }] = await t.db.select({ n: count() }).from(levels).innerJoin(frames, eq(frames.id, levels.frameId)).where(eq(frames.projectId, p!.id)) as [{ n: number }]
    expect(n).toBe(2)
    expect((await t.db.select().from(tonnage).where(eq(tonnage.projectId, p!.id))).length).toBe(2)
  })

  it('changes nothing when the same data is imported twice (idempotent by natural key)', async () => {
    await load(validProject('L-002'))
    const before = await snapshotOfDb()
    const again = await load(validProject('L-002'))
    expect(again.unchanged).toContain('L-002')
    expect(again.loaded).toEqual([])
    expect(await snapshotOfDb()).toEqual(before)
  })

  it('updates a corrected project in place: one project, new values', async () => {
    await load(validProject('L-003'))
    const corrected = validProject('L-003')
    corrected.levels[0]!.story_shear = 320
    const r = await load(corrected)
    expect(r.updated).toEqual(['L-003'])
    const rows = await t.db.select().from(projects).where(eq(projects.code, 'L-003'))
    expect(rows).toHaveLength(1)
    const shear = await t.db.execute(sql`select l.story_shear_kip from levels l join frames f on f.id = l.frame_id join projects p on p.id = f.project_id where p.code = 'L-003' and l.name = 'L2'`)
    expect(shear.rows[0]!.story_shear_kip).toBe(320)
  })

  it('keeps review findings with the snapshot they concern and marks it unconfirmed', async () => {
    const tables = validProject('L-004')
    tables.brace_values[1]!.fysc = 3.8
    await load(tables)
    const items = await t.db.select().from(reviewItems).where(eq(reviewItems.projectCode, 'L-004'))
    expect(items).toHaveLength(1)
    expect(items[0]!.reason).toMatch(/decimal slip/)
    const [snap] = await t.db.select().from(braceSnapshots).where(eq(braceSnapshots.id, items[0]!.snapshotId!))
    expect(snap).toMatchObject({ phase: 'coupon', fyscKsi: 3.8, confirmed: false })
  })

  it('rejects a project naming an unknown supplier without touching the others', async () => {
    const good = transform([bundle(validProject('L-005'))])
    const bad = transform([bundle({ ...validProject('L-006'), suppliers: [] })])
    bad.projects[0]!.fields.supplierCode = 'NOBODY'
    await upsertSuppliers(t.db, good.suppliers)
    const r = await loadProjects(t.db, [...good.projects, ...bad.projects])
    expect(r.loaded).toEqual(['L-005'])
    expect(r.failed.map(f => f.code)).toEqual(['L-006'])
    expect(r.failed[0]!.message).toMatch(/supplier NOBODY/)
    expect(await t.db.select().from(projects).where(eq(projects.code, 'L-006'))).toEqual([])
  })

  it('leaves no duplicate when two imports of the same projects run at once', async () => {
    const a = transform([bundle(validProject('L-007'))])
    const b = transform([bundle(validProject('L-007'))])
    b.projects[0]!.frames[0]!.levels[0]!.storyShearKip = 333
    await upsertSuppliers(t.db, a.suppliers)
    const results = await Promise.all([loadProjects(t.db, a.projects), loadProjects(t.db, b.projects)])
    expect(results.flatMap(r => r.failed)).toEqual([])
    const rows = await t.db.select().from(projects).where(eq(projects.code, 'L-007'))
    expect(rows).toHaveLength(1)
    const frameRows = await t.db.select().from(frames).where(eq(frames.projectId, rows[0]!.id))
    expect(frameRows).toHaveLength(1)
    const levelRows = await t.db.select().from(levels).where(eq(levels.frameId, frameRows[0]!.id))
    expect(levelRows).toHaveLength(2)
  })
})

import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { refreshCalibrationPairs } from '../../api/src/db/calibration'
import { loadBenchmarkProjects, readBenchmarkList } from '../../api/src/services/benchmarks'
import { createTestApp, type TestApp } from '../helpers/app'
import { handProject, loadHandProjects } from '../helpers/hand-history'

// The benchmark list after a data change is read for the changed projects only and merged into
// the previous one; whatever the way, it must be the list a full read gives.

let t: TestApp
const tons = (final: number) => [{ stage: 'final', category: 'lateral_total', weight: final }]

beforeAll(async () => {
  t = await createTestApp()
  await loadHandProjects(t.db.db, [
    handProject('BL-1', { name: 'List one', building_use: 'office' }, tons(80)),
    handProject('BL-2', { name: 'List two', building_use: 'school' }, tons(90)),
    handProject('BL-3', { name: 'List three', building_use: 'office' }, tons(100)),
  ])
  await refreshCalibrationPairs(t.db.db)
}, 60_000)

afterAll(async () => {
  await t.close()
})

const idsOf = async (codes: string[]) => (await t.db.pool.query<{ id: number }>('select id from projects where code = any($1) order by id', [codes])).rows.map(r => r.id)

describe('benchmark list', () => {
  it('reads only the projects the change log names, and ends with the list a full read gives', async () => {
    const base = await readBenchmarkList(t.db.db)
    expect(base.kind).toBe('full')
    expect(base.projects.map(p => p.code)).toEqual(['BL-1', 'BL-2', 'BL-3'])
    expect(base.ids).toEqual(await idsOf(['BL-1', 'BL-2', 'BL-3']))
    expect((await readBenchmarkList(t.db.db, base)).kind).toBe('unchanged')

    // An edit (name, floor area, tonnage), a project turned draft (it leaves the list) and a new project.
    await t.db.pool.query(`update projects set name = 'List two, renamed', floor_area_ft2 = 50000 where code = 'BL-2'`)
    await t.db.pool.query(`update tonnage set tons_short = 95 where project_id = (select id from projects where code = 'BL-2')`)
    await t.db.pool.query(`update projects set draft = true where code = 'BL-3'`)
    await loadHandProjects(t.db.db, [handProject('BL-4', { name: 'List four', building_use: 'office' }, tons(110))])
    await refreshCalibrationPairs(t.db.db, await idsOf(['BL-2', 'BL-3', 'BL-4']))
    const delta = await readBenchmarkList(t.db.db, base)
    expect(delta.kind).toBe('delta')
    expect(delta.projects.map(p => p.code)).toEqual(['BL-1', 'BL-2', 'BL-4'])
    expect(delta.projects[1]!.name).toBe('List two, renamed')
    expect(delta.projects[1]!.floorAreaFt2).toBe(50_000)
    expect(delta.projects[1]!.tonnage.final.lateral_total).toBe(95)
    const full = await readBenchmarkList(t.db.db)
    expect(delta).toEqual({ ...full, kind: 'delta' })

    // A change the log cannot name (a full refresh) reads every project.
    await refreshCalibrationPairs(t.db.db)
    expect((await readBenchmarkList(t.db.db, delta)).kind).toBe('full')
  })

  it('serves the benchmarks from the list of the newest data version', async () => {
    expect((await loadBenchmarkProjects(t.db.db)).map(p => p.name)).toEqual(['List one', 'List two, renamed', 'List four'])
    await t.db.pool.query(`update projects set name = 'List one, renamed' where code = 'BL-1'`)
    await refreshCalibrationPairs(t.db.db, await idsOf(['BL-1']))
    expect((await loadBenchmarkProjects(t.db.db)).map(p => p.name)).toEqual(['List one, renamed', 'List two, renamed', 'List four'])
    expect((await loadBenchmarkProjects(t.db.db, { use: ['office'] })).map(p => p.code)).toEqual(['BL-1', 'BL-4'])
  })
})

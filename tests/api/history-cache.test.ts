import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { runImport } from '../../etl/src/run'
import { validProject } from '../etl/bundle-builder'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'
import { workbookOf } from '../helpers/history-files'

// Benchmarks and precedent searches are cached per data version: a cached answer must never be
// older than the history — each import, and each edit of a project, gives a fresh one.

let t: TestApp
const load = async (code: string) => runImport(t.db.db, [{ file: `${code}.xlsx`, data: new Uint8Array(await workbookOf(validProject(code) as never)) }], { source: 'cli' })
const search = { description: { storyShear: 300, stories: 2, storyHeight: 15, bayWidth: 30, configuration: 'inverted_v' }, limit: 20 }

beforeAll(async () => {
  t = await createTestApp()
  await load('HC-001')
})
afterAll(() => t.close())

describe('history caches follow the data', () => {
  it('counts a newly imported project in benchmarks and precedents at once', async () => {
    const p = await signedIn(t.app, 'principal@example.com')
    const before = await p.agent.get('/api/benchmarks').query({ groupBy: 'use' }).expect(200)
    const s1 = await p.agent.post('/api/precedents/search').set('x-csrf-token', p.csrf).send(search).expect(200)
    await load('HC-002')
    const after = await p.agent.get('/api/benchmarks').query({ groupBy: 'use' }).expect(200)
    const s2 = await p.agent.post('/api/precedents/search').set('x-csrf-token', p.csrf).send(search).expect(200)
    expect(after.body.n).toBe(before.body.n + 1)
    expect(s2.body.candidates).toBe(s1.body.candidates + 1)
  })

  it('follows an edit made in Backsight', async () => {
    const p = await signedIn(t.app, 'principal@example.com')
    const before = await p.agent.get('/api/benchmarks').query({ groupBy: 'use', use: 'laboratory' }).expect(200)
    await p.agent.patch('/api/projects/HC-001').set('x-csrf-token', p.csrf).send({ buildingUse: 'laboratory' }).expect(200)
    const after = await p.agent.get('/api/benchmarks').query({ groupBy: 'use', use: 'laboratory' }).expect(200)
    expect(after.body.n).toBe(before.body.n + 1)
  })
})

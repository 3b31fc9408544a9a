import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { runImport } from '../../etl/src/run'
import { DATA_STALE_HEADER } from '@shared/schemas/freshness'
import { validProject } from '../etl/bundle-builder'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'
import { workbookOf } from '../helpers/history-files'

// With a grace period, a request made while the next data version's answers are being built gets
// the previous version's answer at once, marked in a header, instead of waiting; once the new
// version is built, answers are of the new version again. The rebuild is held up deterministically
// here by locking the tables it reads.

let t: TestApp
const load = async (code: string) => runImport(t.db.db, [{ file: `${code}.xlsx`, data: new Uint8Array(await workbookOf(validProject(code) as never)) }], { source: 'cli' })
const search = { description: { storyShear: 300, stories: 2, storyHeight: 15, bayWidth: 30, configuration: 'inverted_v' }, limit: 20 }
const version = async () => Number((await t.db.pool.query<{ v: string }>('select version::text as v from calibration_state where id = 1')).rows[0]!.v)
const pairsOf = (body: { overall: { n: number }[] }) => body.overall.reduce((n, g) => n + g.n, 0)

beforeAll(async () => {
  t = await createTestApp({ ANSWER_GRACE_MS: '20' })
  await load('AF-001')
  await load('AF-002')
})
afterAll(() => t.close())

describe('answers while the next data version is built', () => {
  it('answers from the previous version, says so, and answers from the new one once built', async () => {
    const p = await signedIn(t.app, 'principal@example.com')
    const summary = (groupBy: string) => p.agent.get('/api/calibration/summary').query({ quantity: 'beta', groupBy }).expect(200)
    const options = () => p.agent.get('/api/calibration/options').expect(200)
    const benchmarks = (groupBy: string) => p.agent.get('/api/benchmarks').query({ groupBy }).expect(200)
    const precedents = () => p.agent.post('/api/precedents/search').set('x-csrf-token', p.csrf).send(search).expect(200)

    const s1 = await summary('supplier')
    const o1 = await options()
    const b1 = await benchmarks('use')
    const c1 = await precedents()
    for (const r of [s1, o1, b1, c1]) expect(r.headers[DATA_STALE_HEADER.toLowerCase()]).toBeUndefined()
    const v1 = await version()

    await load('AF-003')
    const v2 = await version()
    expect(v2).toBeGreaterThan(v1)

    // Hold up every rebuild: the columns, the options and the precedent and benchmark lists read these.
    const blocker = new pg.Client({ connectionString: t.db.url })
    await blocker.connect()
    try {
      await blocker.query('begin')
      await blocker.query('lock table calibration_pairs, projects in access exclusive mode')
      const stale = `version=${v1}; newest=${v2}`
      const [s2, o2, b2, c2, s2b, b2b] = [await summary('supplier'), await options(), await benchmarks('use'), await precedents(), await summary('configuration'), await benchmarks('sdc')]
      for (const r of [s2, o2, b2, c2, s2b, b2b]) expect(r.headers[DATA_STALE_HEADER.toLowerCase()]).toBe(stale)
      // The very answers of the version before…
      expect(s2.body).toEqual(s1.body)
      expect(o2.body).toEqual(o1.body)
      expect(b2.body).toEqual(b1.body)
      expect(c2.body.candidates).toBe(c1.body.candidates)
      // …and answers not asked for before, computed from the previous version's structures in memory.
      expect(pairsOf(s2b.body)).toBe(pairsOf(s1.body))
      expect(b2b.body.n).toBe(b1.body.n)
    } finally {
      await blocker.query('commit').catch(() => {})
      await blocker.end()
    }

    // Released: the new version's answers are built and served unmarked.
    const fresh = async <R extends { headers: Record<string, string | undefined> }>(ask: () => Promise<R>): Promise<R> => {
      for (let i = 0; i < 100; i++) {
        const r = await ask()
        if (r.headers[DATA_STALE_HEADER.toLowerCase()] === undefined) return r
        await new Promise(ok => setTimeout(ok, 50))
      }
      throw new Error('still answering from the previous version after 5 s')
    }
    const s3 = await fresh(() => summary('supplier'))
    const o3 = await fresh(options)
    const b3 = await fresh(() => benchmarks('use'))
    const c3 = await fresh(precedents)
    const s3b = await fresh(() => summary('configuration'))
    expect(pairsOf(s3.body)).toBeGreaterThan(pairsOf(s1.body))
    expect(pairsOf(s3b.body)).toBe(pairsOf(s3.body))
    expect(o3.body.pairs).toBe(pairsOf(s3.body))
    expect(b3.body.n).toBe(b1.body.n + 1)
    expect(c3.body.candidates).toBe(c1.body.candidates + 1)
  })
})

import { tableFromIPC } from 'apache-arrow'
import { eq } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ARROW_STREAM_TYPE, CalibrationCost, CalibrationOptions, CalibrationPoints, CalibrationSummary, CalibrationTrend, StartingFactors } from '@shared/schemas/calibration'
import { reviewItems } from '../../api/src/db/history-schema'
import { auditLog } from '../../api/src/db/schema'
import { expandPaths } from '../../etl/src/paths'
import { readInputs, runImport } from '../../etl/src/run'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'

let t: TestApp
let engineer: Awaited<ReturnType<typeof signedIn>>
let principal: Awaited<ReturnType<typeof signedIn>>

beforeAll(async () => {
  t = await createTestApp()
  await runImport(t.db.db, await readInputs(await expandPaths(['demo-data'])), { source: 'cli' })
  engineer = await signedIn(t.app, 'engineer@example.com')
  principal = await signedIn(t.app, 'principal@example.com')
}, 120_000)
afterAll(async () => t.close())

/**
 * Pairs counted straight from the base tables (not the view): the latest-revision sd snapshot and
 * the governing one of each brace, both confirmed, both with Cmax, project not a draft.
 */
async function directPairCount(where = 'true'): Promise<number> {
  const { rows } = await t.db.pool.query(`
    with a as (select distinct on (brace_id) * from brace_snapshots where phase = 'sd' order by brace_id, revision desc)
    select count(*)::int as n
    from a join brace_snapshots g on g.brace_id = a.brace_id and g.governing and g.id <> a.id
    join braces b on b.id = a.brace_id join levels l on l.id = b.level_id join frames f on f.id = l.frame_id
    join projects p on p.id = f.project_id left join suppliers s on s.id = p.supplier_id
    where a.confirmed and g.confirmed and not p.draft and a.adjusted_compression_kip > 0 and g.adjusted_compression_kip > 0 and ${where}`)
  return rows[0].n
}

describe('access', () => {
  it('bd and admin get 403 on every calibration answer; engineer and principal get 200', async () => {
    const bd = await signedIn(t.app, 'bd@example.com')
    const admin = await signedIn(t.app, 'admin@example.com')
    for (const path of ['/api/calibration/options', '/api/calibration/summary', '/api/calibration/points', '/api/calibration/cost', '/api/calibration/misses.csv', '/api/starting-factors']) {
      expect((await bd.agent.get(path)).status, path).toBe(403)
      expect((await admin.agent.get(path)).status, path).toBe(403)
      expect((await engineer.agent.get(path)).status, path).toBe(200)
    }
  })

  it('calibration settings: principal and admin save (audited), engineer may not', async () => {
    const admin = await signedIn(t.app, 'admin@example.com')
    expect((await engineer.agent.put('/api/settings/calibration').set('x-csrf-token', engineer.csrf).send({ minGroupSize: 5, habitYears: 2 })).status).toBe(403)
    const bad = await admin.agent.put('/api/settings/calibration').set('x-csrf-token', admin.csrf).send({ minGroupSize: 1, habitYears: 2 })
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields).toHaveProperty('minGroupSize')
    const ok = await admin.agent.put('/api/settings/calibration').set('x-csrf-token', admin.csrf).send({ minGroupSize: 12, habitYears: 4 })
    expect(ok.status).toBe(200)
    expect((await engineer.agent.get('/api/settings/calibration')).body).toEqual({ minGroupSize: 12, habitYears: 4 })
    const audit = await t.db.db.select().from(auditLog).where(eq(auditLog.entityId, 'calibration'))
    expect(audit.at(-1)?.detail).toEqual({ before: { minGroupSize: 10, habitYears: 3 }, after: { minGroupSize: 12, habitYears: 4 } })
    const sf = StartingFactors.parse((await engineer.agent.get('/api/starting-factors')).body)
    expect(sf).toMatchObject({ minGroupSize: 12, habitYears: 4 })
    await admin.agent.put('/api/settings/calibration').set('x-csrf-token', admin.csrf).send({ minGroupSize: 10, habitYears: 3 }).expect(200)
  })
})

describe('filters', () => {
  it('options list what the history holds, and the pair count equals a direct count', async () => {
    const o = CalibrationOptions.parse((await engineer.agent.get('/api/calibration/options').expect(200)).body)
    expect(o.suppliers.map(s => s.code)).toEqual(['SUP-A', 'SUP-B', 'SUP-C', 'SUP-D']) // demo-data/README.md
    expect(o.years).toEqual({ min: 2008, max: 2026 })
    expect(o.stiffnessTolerance).toBe(0.1)
    expect(o.minGroupSize).toBe(10)
    const { rows } = await t.db.pool.query(`
      with a as (select distinct on (brace_id) * from brace_snapshots where phase = 'sd' order by brace_id, revision desc)
      select count(*)::int as n from a join brace_snapshots g on g.brace_id = a.brace_id and g.governing and g.id <> a.id where a.confirmed and g.confirmed`)
    expect(o.pairs).toBe(rows[0].n)
  })

  it('a supplier filter gives exactly the braces a direct SQL count gives', async () => {
    const all = CalibrationPoints.parse((await engineer.agent.get('/api/calibration/points?quantity=cmax').expect(200)).body)
    const b = CalibrationPoints.parse((await engineer.agent.get('/api/calibration/points?quantity=cmax&supplier=SUP-B').expect(200)).body)
    expect(all.points.length).toBe(await directPairCount())
    expect(b.points.length).toBe(await directPairCount(`s.code = 'SUP-B'`))
    expect(b.points.length).toBeLessThan(all.points.length)
    const bd = CalibrationPoints.parse((await engineer.agent.get('/api/calibration/points?quantity=cmax&supplier=SUP-B,SUP-D&yearFrom=2015&yearTo=2020').expect(200)).body)
    expect(bd.points.length).toBe(await directPairCount(`s.code in ('SUP-B', 'SUP-D') and p.year_designed between 2015 and 2020`))
  })

  it('filters change the summary; groups split by basis and add up to the overall', async () => {
    const s = CalibrationSummary.parse((await engineer.agent.get('/api/calibration/summary?quantity=beta&groupBy=supplier').expect(200)).body)
    const total = s.overall.reduce((n, g) => n + g.n, 0)
    expect(s.groups.reduce((n, g) => n + g.n, 0)).toBe(total)
    // No pooling across bases: every group-basis pair is distinct.
    expect(new Set(s.groups.map(g => `${g.group}|${g.basis}`)).size).toBe(s.groups.length)
    expect(s.overall.every(o => /AISC 341-\d\d$/.test(o.basis))).toBe(true)
    const c = CalibrationSummary.parse((await engineer.agent.get('/api/calibration/summary?quantity=beta&groupBy=supplier&configuration=inverted_v').expect(200)).body)
    expect(c.overall.reduce((n, g) => n + g.n, 0)).toBeLessThan(total)
    // Underestimate rate of one group checked against the points: share with final > assumed.
    const pts = CalibrationPoints.parse((await engineer.agent.get('/api/calibration/points?quantity=beta&groupBy=supplier').expect(200)).body).points
    const g0 = s.groups[0]!
    const mine = pts.filter(p => p.group === g0.group && p.basis === g0.basis)
    expect(mine.length).toBe(g0.n)
    expect(g0.underestimateRate).toBeCloseTo(mine.filter(p => p.final > p.assumed).length / mine.length, 12)
  })

  it('trend by year designed, cost with its stated method', async () => {
    const tr = CalibrationTrend.parse((await engineer.agent.get('/api/calibration/trend?quantity=cmax&yearFrom=2012&yearTo=2014').expect(200)).body)
    expect(new Set(tr.years.map(y => y.year))).toEqual(new Set([2012, 2013, 2014]))
    const cost = CalibrationCost.parse((await principal.agent.get('/api/calibration/cost').expect(200)).body)
    expect(cost.method).toMatch(/estimate/i)
    expect(cost.totals.projects).toBe(cost.projects.length)
    for (const p of cost.projects) if (p.conservatism <= 1) expect(p.attributableTons).toBe(0)
    const one = cost.projects.find(p => p.conservatism > 1 && p.finalLateralTons)!
    expect(one.attributableTons).toBeGreaterThan(0)
    expect(cost.unconservative.every(u => u.worstRatio < 1)).toBe(true)
  })

  it('misses are the underestimates, worst first, and the CSV carries the same rows', async () => {
    const m = (await engineer.agent.get('/api/calibration/misses?quantity=cmax&limit=20').expect(200)).body
    expect(m.items.length).toBe(20)
    expect(m.items.every((x: { ratio: number; final: number; assumed: number }) => x.ratio < 1 && x.final > x.assumed)).toBe(true)
    const ratios = m.items.map((x: { ratio: number }) => x.ratio)
    expect(ratios).toEqual([...ratios].sort((a, b) => a - b))
    const csv = await engineer.agent.get('/api/calibration/misses.csv?quantity=cmax&limit=20').expect(200)
    expect(csv.headers['content-type']).toMatch(/text\/csv/)
    const lines = csv.text.trim().split('\n')
    expect(lines[0]).toBe('brace_id,project_code,project_name,frame_line,level,supplier,year_designed,basis,assumed,final,ratio')
    expect(lines).toHaveLength(21)
    expect(lines[1]!.startsWith(`${m.items[0].braceId},${m.items[0].projectCode},`)).toBe(true)
  })

  it('bad input is a 400 naming the field', async () => {
    const cases: [string, string][] = [
      ['/api/calibration/summary?yearFrom=abc', 'yearFrom'],
      ['/api/calibration/summary?quantity=gamma', 'quantity'],
      ['/api/calibration/points?groupBy=colour', 'groupBy'],
      ['/api/calibration/summary?phase=coupon', 'phase'],
      ['/api/calibration/trend?colour=red', 'colour'],
      ['/api/calibration/summary?yearFrom=2020&yearTo=2010', 'yearTo'],
      ['/api/calibration/misses?limit=0', 'limit'],
      ['/api/starting-factors?quantile=0.3', 'quantile'],
    ]
    for (const [path, field] of cases) {
      const res = await engineer.agent.get(path)
      expect(res.status, path).toBe(400)
      expect(Object.keys(res.body.error.fields ?? {}).join(','), path).toContain(field)
    }
  })
})

describe('points as Arrow', () => {
  it('the Arrow IPC stream agrees with the JSON row for row, strings dictionary-encoded', async () => {
    const q = '/api/calibration/points?quantity=overstrength&groupBy=yearBand&sdc=D'
    const json = CalibrationPoints.parse((await engineer.agent.get(q).expect(200)).body)
    const res = await engineer.agent
      .get(q)
      .set('Accept', ARROW_STREAM_TYPE)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = []
        r.on('data', (c: Buffer) => chunks.push(c))
        r.on('end', () => cb(null, Buffer.concat(chunks)))
      })
      .expect(200)
    expect(res.headers['content-type']).toContain(ARROW_STREAM_TYPE)
    const table = tableFromIPC(new Uint8Array(res.body as Buffer))
    expect(table.numRows).toBe(json.points.length)
    expect(table.schema.metadata.get('quantity')).toBe('overstrength')
    expect(table.schema.fields.find(f => f.name === 'projectCode')?.type.toString()).toMatch(/Dictionary/)
    const cols = ['braceId', 'projectCode', 'projectName', 'frameLine', 'level', 'group', 'basis', 'assumed', 'final'] as const
    const vectors = Object.fromEntries(cols.map(c => [c, table.getChild(c)!]))
    json.points.forEach((p, i) => {
      for (const c of cols) expect(vectors[c]!.get(i), `${c} row ${i}`).toBe(p[c])
    })
  })
})

describe('points: validators', () => {
  // RFC 9110 §8.8.3 (ETag), §13.1.2 (If-None-Match → 304 Not Modified, no body).
  it('the same point set carries the same ETag, a held one is answered 304, gzip and identity differ', async () => {
    const q = '/api/calibration/points?quantity=beta&groupBy=supplier&sdc=D'
    const one = await engineer.agent.get(q).set('Accept-Encoding', 'gzip').expect(200)
    const two = await engineer.agent.get(q).set('Accept-Encoding', 'gzip').expect(200)
    expect(one.headers.etag).toMatch(/^W\/"[0-9a-f]+-[A-Za-z0-9_-]{27}"$/)
    expect(two.headers.etag).toBe(one.headers.etag)
    expect(two.body).toEqual(one.body)
    const held = await engineer.agent.get(q).set('Accept-Encoding', 'gzip').set('If-None-Match', one.headers.etag!).expect(304)
    expect(held.text ?? '').toBe('')
    const plain = await engineer.agent.get(q).set('Accept-Encoding', 'identity').expect(200)
    expect(plain.headers['content-encoding']).toBeUndefined()
    expect(plain.headers.etag).not.toBe(one.headers.etag)
    expect(plain.body).toEqual(one.body)
    // Another set of points, another tag.
    const other = await engineer.agent.get('/api/calibration/points?quantity=beta&groupBy=supplier').set('Accept-Encoding', 'gzip').expect(200)
    expect(other.headers.etag).not.toBe(one.headers.etag)
  })
})

describe('the review queue decides what analytics see', () => {
  it('a corrected coupon value brings its brace into the pairs', async () => {
    // demo-data/README.md planted fault (a): NO-2009-006 frame A L2 coupon fysc 3.8 ksi (meant 38) waits in the queue.
    const [item] = await t.db.db.select().from(reviewItems).where(eq(reviewItems.projectCode, 'NO-2009-006'))
    const { rows } = await t.db.pool.query(`select brace_id from brace_snapshots where id = $1`, [item!.snapshotId])
    const braceId = rows[0].brace_id as number
    const before = CalibrationPoints.parse((await engineer.agent.get('/api/calibration/points?quantity=overstrength&supplier=').expect(200)).body)
    expect(before.points.some(p => p.braceId === braceId)).toBe(false)
    const beforeSummary = CalibrationSummary.parse((await engineer.agent.get('/api/calibration/summary?quantity=overstrength&groupBy=none').expect(200)).body)
    await engineer.agent.post(`/api/review-items/${item!.id}/resolve`).set('x-csrf-token', engineer.csrf).send({ action: 'correct', value: 38 }).expect(200)
    const after = CalibrationPoints.parse((await engineer.agent.get('/api/calibration/points?quantity=overstrength').expect(200)).body)
    const p = after.points.find(x => x.braceId === braceId)
    expect(p?.final).toBe(38) // the corrected coupon Fysc, no Ry on a measured value
    expect(after.points.length).toBe(before.points.length + 1)
    const afterSummary = CalibrationSummary.parse((await engineer.agent.get('/api/calibration/summary?quantity=overstrength&groupBy=none').expect(200)).body)
    const n = (s: typeof beforeSummary) => s.overall.reduce((a, g) => a + g.n, 0)
    expect(n(afterSummary)).toBe(n(beforeSummary) + 1)
  })
})

describe('starting factors', () => {
  it('suggestions per quantity and basis, with the cautions and a back-test', async () => {
    const sf = StartingFactors.parse((await engineer.agent.get('/api/starting-factors?supplier=SUP-C&quantile=0.8').expect(200)).body)
    expect(sf.quantile).toBe(0.8)
    expect(sf.cautions.join(' ')).toMatch(/preliminary design aid/i)
    expect(sf.cautions.join(' ')).toMatch(/supplier’s qualified values/)
    expect(sf.cautions.join(' ')).toMatch(/engineer of record decides/i)
    for (const q of ['beta', 'omega', 'overstrength', 'stiffness'] as const) expect(sf.suggestions.some(s => s.quantity === q), q).toBe(true)
    const stiff = sf.suggestions.find(s => s.quantity === 'stiffness')!
    expect(stiff.rule).toMatch(/Median/)
    expect(sf.capacityBasis.fyscMax).toBe(sf.suggestions.find(s => s.quantity === 'overstrength')!.suggested)
    // Back-test years train only on earlier finished projects: trainedOn never exceeds the projects finished before.
    expect(sf.backtest.beta.length).toBeGreaterThan(0)
    expect(sf.backtest.beta.every(y => y.trainedOn > 0 && y.braces > 0)).toBe(true)
    // A supplier the firm never used: the group is empty, so the firm-wide value is suggested (w = 0).
    const none = StartingFactors.parse((await engineer.agent.get('/api/starting-factors?supplier=SUP-Z').expect(200)).body)
    expect(none.suggestions.every(s => s.groupSize === 0 && s.weight === 0 && s.shrunk && s.suggested === s.firmValue)).toBe(true)
  })
})

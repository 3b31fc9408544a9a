import compression from 'compression'
import express from 'express'
import request from 'supertest'
import { describe, expect, it } from 'vitest'
import { randomBytes } from 'node:crypto'
import { gunzipSync } from 'node:zlib'
import { sendCachedJson } from '../../api/src/middleware/json-body'
import { gzipWhole } from '../../api/src/services/body-encoding'

// Bodies of cached answers are serialised and compressed once per answer object (RFC 9110 §8.8.3 ETag,
// §13.1.2 If-None-Match → 304; RFC 1952 gzip).

/** An app that serves `current.answer`, behind the same compression middleware as the real app. */
function appServing(current: { answer: object }, calls: { n: number }) {
  const app = express()
  app.use(compression())
  app.get('/a', (req, res) =>
    sendCachedJson(req, res, current.answer, () => {
      calls.n++
      return JSON.stringify(current.answer)
    }),
  )
  return app
}

/** The body's bytes after the client's Content-Encoding decoding (no JSON parsing). */
const raw = (app: express.Express, headers: Record<string, string>) =>
  request(app)
    .get('/a')
    .set(headers)
    .buffer(true)
    .parse((res, done) => {
      const chunks: Buffer[] = []
      res.on('data', (c: Buffer) => chunks.push(c))
      res.on('end', () => done(null, Buffer.concat(chunks)))
    })

const big = { rows: Array.from({ length: 200 }, (_, i) => ({ i, label: `row ${i}`, ratio: i / 7 })) }

describe('sendCachedJson', () => {
  it('serialises an answer once, gzips it once, and sends the same bytes and ETag to every request', async () => {
    const calls = { n: 0 }
    const app = appServing({ answer: big }, calls)
    const a = await raw(app, { 'accept-encoding': 'gzip' }).expect(200)
    const b = await raw(app, { 'accept-encoding': 'gzip' }).expect(200)
    expect(a.headers['content-encoding']).toBe('gzip')
    expect(a.headers['content-type']).toMatch(/^application\/json/)
    expect(a.headers.vary).toMatch(/Accept-Encoding/)
    // Compressed exactly once: the client's one gunzip (superagent decodes Content-Encoding) gives the JSON back;
    // a second gzip by the middleware would leave gzip bytes (starting 1f 8b) that do not parse.
    expect((a.body as Buffer)[0]).not.toBe(0x1f)
    expect(JSON.parse((a.body as Buffer).toString('utf8'))).toEqual(big)
    expect(Buffer.compare(a.body as Buffer, b.body as Buffer)).toBe(0)
    expect(a.headers.etag).toBe(b.headers.etag)
    expect(calls.n).toBe(1)
  })

  it('sends plain JSON to a client that does not take gzip, and small bodies uncompressed', async () => {
    const calls = { n: 0 }
    const plain = await raw(appServing({ answer: big }, calls), { 'accept-encoding': 'identity' }).expect(200)
    expect(plain.headers['content-encoding']).toBeUndefined()
    expect(JSON.parse((plain.body as Buffer).toString('utf8'))).toEqual(big)
    const small = await raw(appServing({ answer: { ok: true } }, calls), { 'accept-encoding': 'gzip' }).expect(200)
    expect(small.headers['content-encoding']).toBeUndefined()
    expect((small.body as Buffer).toString('utf8')).toBe('{"ok":true}')
  })

  it('answers 304 with no body when the client already holds that answer', async () => {
    const app = appServing({ answer: big }, { n: 0 })
    const first = await request(app).get('/a').expect(200)
    const again = await request(app).get('/a').set('if-none-match', first.headers.etag!).expect(304)
    expect(again.text ?? '').toBe('')
  })

  it('serialises a new answer object afresh, so a recomputed answer is never served from old bytes', async () => {
    const calls = { n: 0 }
    const current = { answer: { v: 1 } as object }
    const app = appServing(current, calls)
    const one = await request(app).get('/a').expect(200)
    current.answer = { v: 2 }
    const two = await request(app).get('/a').expect(200)
    expect(one.body).toEqual({ v: 1 })
    expect(two.body).toEqual({ v: 2 })
    expect(two.headers.etag).not.toBe(one.headers.etag)
    expect(calls.n).toBe(2)
  })
})

// gzipWhole: RFC 1952 members, decoded by Node's own zlib (the reference inflater) byte for byte.
describe('gzipWhole', () => {
  it('round-trips bodies that compress, that do not (output larger than its input) and that are empty', async () => {
    const text = Buffer.from(JSON.stringify(Array.from({ length: 40_000 }, (_, i) => ({ i, label: `brace ${i % 97}` }))))
    const noise = randomBytes(300_000)
    for (const body of [text, noise, Buffer.alloc(0), Buffer.from('x')]) {
      const gz = await gzipWhole(body)
      expect([gz[0], gz[1]]).toEqual([0x1f, 0x8b])
      expect(gunzipSync(gz).equals(body)).toBe(true)
    }
    // Random bytes do not compress, so the output needs more than the one input-sized buffer.
    expect((await gzipWhole(noise)).length).toBeGreaterThan(noise.length)
    expect((await gzipWhole(text)).length).toBeLessThan(text.length / 4)
  })
})

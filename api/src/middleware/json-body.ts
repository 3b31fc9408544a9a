import { gzipSync, constants as zlib } from 'node:zlib'
import type { Request, Response } from 'express'
import { bodyEtag } from '../services/body-encoding'

/**
 * Sends answers that are cached as objects (the analytics answers, kept per data version) without
 * serialising and compressing them again on every request: the JSON text, its gzip and its ETag are
 * remembered beside the answer object itself (a WeakMap), so they live exactly as long as the
 * cached answer and a recomputed answer (new object) gets new bytes. Bodies under 1 kB go
 * uncompressed, as the compression middleware would do.
 */
interface Encoded {
  json: Buffer
  etag: string
  gzip?: Buffer
}

const bodies = new WeakMap<object, Encoded>()
const MIN_GZIP_BYTES = 1024

/**
 * Sends `serialise()` as JSON for the cached answer `answer` (the identity the bytes are kept for;
 * `serialise` must depend on nothing else that varies between requests sharing `answer`).
 */
export function sendCachedJson(req: Request, res: Response, answer: object, serialise: () => string = () => JSON.stringify(answer)): void {
  let e = bodies.get(answer)
  if (!e) {
    const json = Buffer.from(serialise())
    e = { json, etag: bodyEtag(json) }
    bodies.set(answer, e)
  }
  res.vary('Accept-Encoding')
  res.setHeader('ETag', e.etag)
  res.type('application/json')
  const gzip = e.json.length >= MIN_GZIP_BYTES && req.acceptsEncodings('gzip', 'identity') === 'gzip'
  if (req.fresh) {
    res.status(304).end()
    return
  }
  if (!gzip) {
    res.send(e.json)
    return
  }
  e.gzip ??= gzipSync(e.json, { level: zlib.Z_BEST_SPEED })
  // The compression middleware leaves a body that already names its encoding alone.
  res.setHeader('Content-Encoding', 'gzip')
  res.send(e.gzip)
}

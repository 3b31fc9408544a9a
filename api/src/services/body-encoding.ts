import { createHash } from 'node:crypto'
import { promisify } from 'node:util'
import { gzip as gzipCallback, constants as zlib } from 'node:zlib'

/*
 * Bodies kept between requests (cached answers) are encoded once: their gzip and their ETag.
 */

/** A weak ETag of the bytes (length and SHA-1), as Express makes one, for bodies kept between requests. */
export function bodyEtag(body: Uint8Array): string {
  return `W/"${body.length.toString(16)}-${createHash('sha1').update(body).digest('base64url').slice(0, 27)}"`
}

const gzipAsync = promisify(gzipCallback)

/**
 * `body` gzipped at the fastest level in libuv's thread pool, in one piece. Node's zlib otherwise
 * works through the input in 16 kB output chunks and needs a turn of the event loop between two, so
 * on a busy server a megabyte point set took about ten times its compression time to come back
 * (every chunk waiting behind the requests queued meanwhile). An output buffer the size of the input
 * holds the result of anything that compresses at all in a single round; what does not fit takes
 * another round, so nothing is lost either way.
 */
export function gzipWhole(body: Uint8Array): Promise<Buffer> {
  return gzipAsync(body, { level: zlib.Z_BEST_SPEED, chunkSize: Math.max(zlib.Z_DEFAULT_CHUNK, body.length) })
}

import { createServer } from 'node:net'

/** A TCP port free on 127.0.0.1 right now. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer()
    srv.unref()
    srv.on('error', reject)
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address()
      srv.close(() => (typeof addr === 'object' && addr ? resolve(addr.port) : reject(new Error('no port'))))
    })
  })
}

/** `preferred` when it is free, otherwise any free port. */
export function portOr(preferred: number): Promise<number> {
  return new Promise(resolve => {
    const srv = createServer()
    srv.unref()
    srv.once('error', () => resolve(freePort()))
    srv.listen(preferred, '127.0.0.1', () => srv.close(() => resolve(preferred)))
  })
}

import { describe, expect, it } from 'vitest'
import { sharedRead } from '../../api/src/db/shared-read'

// Concurrent callers share reads, but never get the answer of a read sent before they called.

function deferred<T>() {
  let resolve!: (v: T) => void
  let reject!: (e: unknown) => void
  const promise = new Promise<T>((ok, fail) => ((resolve = ok), (reject = fail)))
  return { promise, resolve, reject }
}

describe('sharedRead', () => {
  it('gives callers that arrive while a read is out the next read, one for all of them', async () => {
    const reads: ReturnType<typeof deferred<number>>[] = []
    const key = {}
    const read = sharedRead((_k: object) => {
      const d = deferred<number>()
      reads.push(d)
      return d.promise
    })
    const first = read(key)
    const waiting = [read(key), read(key), read(key)]
    expect(reads.length).toBe(1)
    // The data changes after the first read was sent: the waiting callers must see the change.
    reads[0]!.resolve(5)
    expect(await first).toBe(5)
    await new Promise(r => setTimeout(r, 0))
    expect(reads.length).toBe(2)
    reads[1]!.resolve(6)
    expect(await Promise.all(waiting)).toEqual([6, 6, 6])
    // Nothing out: a new caller sends a read of its own.
    const later = read(key)
    expect(reads.length).toBe(3)
    reads[2]!.resolve(7)
    expect(await later).toBe(7)
  })

  it('keeps keys apart and does not keep a failure', async () => {
    let n = 0
    const read = sharedRead(async (k: { fail?: boolean }) => {
      n++
      if (k.fail) throw new Error('down')
      return n
    })
    const a = {}
    const bad = { fail: true }
    await expect(read(bad)).rejects.toThrow('down')
    expect(await read(a)).toBe(2)
    await expect(read(bad)).rejects.toThrow('down')
    expect(n).toBe(3)
  })
})

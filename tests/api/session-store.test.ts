import session from 'express-session'
import { describe, expect, it, vi } from 'vitest'
import { throttleTouch } from '../../api/src/session-store'

// A session's rolling expiry is written back at most once a minute; destroying it forgets that.

describe('throttleTouch', () => {
  it('touches a session once per interval and again after it was destroyed', () => {
    const store = new session.MemoryStore()
    const touched: string[] = []
    store.touch = (sid, _s, cb) => {
      touched.push(sid)
      cb?.()
    }
    throttleTouch(store, 60_000)
    const now = vi.spyOn(Date, 'now').mockReturnValue(1_000_000)
    const sess = { cookie: new session.Cookie() } as session.SessionData
    const done = vi.fn()
    store.touch('a', sess, done)
    store.touch('a', sess, done)
    store.touch('b', sess, done)
    now.mockReturnValue(1_000_000 + 59_999)
    store.touch('a', sess, done)
    expect(touched).toEqual(['a', 'b'])
    now.mockReturnValue(1_000_000 + 60_000)
    store.touch('a', sess, done)
    expect(touched).toEqual(['a', 'b', 'a'])
    store.destroy('b')
    store.touch('b', sess, done)
    expect(touched).toEqual(['a', 'b', 'a', 'b'])
    // Every touch, written or skipped, calls back.
    expect(done).toHaveBeenCalledTimes(6)
    now.mockRestore()
  })

  it('calls back before the store has written the expiry, and tries again after a failed write', () => {
    const store = new session.MemoryStore()
    const pending: ((err?: unknown) => void)[] = []
    store.touch = ((_sid: string, _s: session.SessionData, cb?: (err?: unknown) => void) => void pending.push(cb!)) as typeof store.touch
    const failures: unknown[] = []
    throttleTouch(store, 60_000, err => failures.push(err))
    const now = vi.spyOn(Date, 'now').mockReturnValue(2_000_000)
    const sess = { cookie: new session.Cookie() } as session.SessionData
    const done = vi.fn()
    store.touch('a', sess, done)
    // The write is still out; the response need not wait for it.
    expect(pending).toHaveLength(1)
    expect(done).toHaveBeenCalledTimes(1)
    pending[0]!(new Error('database gone'))
    expect(failures).toHaveLength(1)
    // Forgotten: the next request within the interval writes it again.
    now.mockReturnValue(2_000_000 + 1_000)
    store.touch('a', sess, done)
    expect(pending).toHaveLength(2)
    pending[1]!()
    store.touch('a', sess, done)
    expect(pending).toHaveLength(2)
    expect(failures).toHaveLength(1)
    expect(done).toHaveBeenCalledTimes(3)
    now.mockRestore()
  })
})

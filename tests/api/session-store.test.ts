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
})

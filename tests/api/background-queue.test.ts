import { describe, expect, it } from 'vitest'
import type { Db } from '../../api/src/db'
import { inBackground } from '../../api/src/services/answer-freshness'

// The catching-up queue of answer-freshness.ts: one job at a time per database, builds of
// structures before answers, a job queued once however often it is asked for, a job no longer
// wanted skipped, and a failure dropped.

describe('inBackground', () => {
  it('runs one job at a time, builds first, each once', async () => {
    const db = {} as Db
    const other = {} as Db
    const log: string[] = []
    const running = new Map<string, number>()
    let most = 0
    const job = (name: string, fail = false) => async () => {
      const where = name.startsWith('o') ? 'other' : 'db'
      running.set(where, (running.get(where) ?? 0) + 1)
      most = Math.max(most, running.get('db') ?? 0)
      log.push(`${name} start`)
      await new Promise(r => setTimeout(r, 5))
      log.push(`${name} end`)
      running.set(where, running.get(where)! - 1)
      if (fail) throw new Error(`${name} failed`)
    }
    inBackground(db, 'a1', 'answer', () => true, job('a1', true))
    inBackground(db, 'a2', 'answer', () => true, job('a2'))
    inBackground(db, 'a2', 'answer', () => true, job('a2 again'))
    inBackground(db, 'skipped', 'answer', () => false, job('skipped'))
    inBackground(db, 'b1', 'build', () => true, job('b1'))
    inBackground(other, 'o1', 'answer', () => true, job('o1'))
    await new Promise<void>(resolve => {
      const wait = () => (log.length === 8 ? resolve() : setTimeout(wait, 5))
      wait()
    })
    const mine = log.filter(l => !l.startsWith('o1'))
    // a1 was already running when b1 came; b1 then goes before a2, despite a1's failure.
    expect(mine).toEqual(['a1 start', 'a1 end', 'b1 start', 'b1 end', 'a2 start', 'a2 end'])
    expect(log.filter(l => l.startsWith('o1'))).toEqual(['o1 start', 'o1 end'])
    // One at a time per database (the other database's job ran alongside).
    expect(most).toBe(1)
    // Nothing more comes (the skipped job and the second a2 never ran).
    await new Promise(r => setTimeout(r, 50))
    expect(log).toHaveLength(8)
  })
})

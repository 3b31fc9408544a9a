import { sql } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { agentFor, createTestApp, DEMO_PASSWORD, signedIn, type TestApp } from '../helpers/app'

let t: TestApp
beforeAll(async () => {
  t = await createTestApp({ SIGN_IN_LIMIT: '3' })
})
afterAll(async () => t.close())

describe('rate limits and sizes', () => {
  it('answers 429 RATE_LIMITED once sign-in attempts from one address pass the limit', async () => {
    const a = await agentFor(t.app)
    const statuses: number[] = []
    for (let i = 0; i < 4; i++) {
      const res = await a.agent.post('/api/auth/sign-in').set('x-csrf-token', a.csrf).send({ email: 'engineer@example.com', password: 'wrong-password' })
      statuses.push(res.status)
      if (res.status === 429) expect(res.body.error.code).toBe('RATE_LIMITED')
    }
    expect(statuses).toEqual([401, 401, 401, 429])
  })

  it('answers 413 PAYLOAD_TOO_LARGE for a body over 1 MB', async () => {
    const a = await agentFor(t.app)
    const res = await a.agent
      .post('/api/auth/forgot-password')
      .set('x-csrf-token', a.csrf)
      .set('content-type', 'application/json')
      .send(JSON.stringify({ email: 'x'.repeat(1_100_000) }))
    expect(res.status).toBe(413)
    expect(res.body.error.code).toBe('PAYLOAD_TOO_LARGE')
  })
})

describe('sessions', () => {
  it('are stored in PostgreSQL', async () => {
    const fresh = await createTestApp()
    try {
      const before = await fresh.db.db.execute(sql`select count(*)::int as n from session`)
      await signedIn(fresh.app, 'bd@example.com', DEMO_PASSWORD)
      const after = await fresh.db.db.execute(sql`select count(*)::int as n from session where sess->'passport'->>'user' is not null`)
      expect(Number(after.rows[0]!.n)).toBe(1)
      expect(Number(before.rows[0]!.n)).toBe(0)
    } finally {
      await fresh.close()
    }
  })
})

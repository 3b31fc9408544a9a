import { eq, sql } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { session, users } from '../../api/src/db/schema'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'

// A signed-in request reads its session and its user in one query (readUserWithSession); what the
// user row says still decides every request at once (OWASP ASVS 4.0 V3.3: sessions invalidated on
// deactivation; V4.1.1: access decided server-side on every request).

let t: TestApp
beforeAll(async () => {
  t = await createTestApp()
})
afterAll(async () => t.close())

/** The SQL texts the app sends while `fn` runs. */
async function queriesDuring(fn: () => Promise<unknown>): Promise<string[]> {
  const pool = t.db.pool as unknown as { query: (...a: unknown[]) => unknown }
  const query = pool.query
  const seen: string[] = []
  pool.query = function (this: unknown, ...a: unknown[]) {
    const q = a[0] as string | { text: string }
    seen.push(typeof q === 'string' ? q : q.text)
    return query.apply(this, a)
  }
  try {
    await fn()
  } finally {
    pool.query = query
  }
  return seen
}

const sidOf = async (email: string) => {
  const rows = await t.db.db.select({ sid: session.sid, sess: session.sess }).from(session)
  const id = (await t.db.db.select({ id: users.id }).from(users).where(eq(users.email, email)))[0]!.id
  return rows.find(r => (r.sess as { passport?: { user?: number } }).passport?.user === id)!.sid
}

describe('the session and its user, read together', () => {
  it('a signed-in request (its touch done) sends one query, which reads both', async () => {
    const { agent } = await signedIn(t.app, 'engineer@example.com')
    await agent.get('/api/auth/me').expect(200) // the first request after sign-in also writes the rolling expiry
    const qs = await queriesDuring(() => agent.get('/api/auth/me').expect(200))
    expect(qs).toHaveLength(1)
    expect(qs[0]).toMatch(/from "session" left join "users"/)
  })

  it('a role change or a deactivation shows on the very next request', async () => {
    const { agent } = await signedIn(t.app, 'bd@example.com')
    expect((await agent.get('/api/auth/me').expect(200)).body.role).toBe('bd')
    await t.db.db.update(users).set({ role: 'engineer' }).where(eq(users.email, 'bd@example.com'))
    expect((await agent.get('/api/auth/me').expect(200)).body.role).toBe('engineer')
    await t.db.db.update(users).set({ active: false }).where(eq(users.email, 'bd@example.com'))
    await agent.get('/api/auth/me').expect(401)
    await t.db.db.update(users).set({ role: 'bd', active: true }).where(eq(users.email, 'bd@example.com'))
  })

  it('a session whose user is gone, whose user id is not a number, or that has expired signs nobody in (401, not 500)', async () => {
    const a = await signedIn(t.app, 'principal@example.com')
    const sid = await sidOf('principal@example.com')
    await t.db.db.update(session).set({ sess: sql`json_build_object('cookie', ${session.sess} -> 'cookie', 'passport', json_build_object('user', 987654))` }).where(eq(session.sid, sid))
    await a.agent.get('/api/auth/me').expect(401)

    const b = await signedIn(t.app, 'principal@example.com')
    const sid2 = await sidOf('principal@example.com')
    await t.db.db.update(session).set({ sess: sql`json_build_object('cookie', ${session.sess} -> 'cookie', 'passport', json_build_object('user', '1 or 1=1'))` }).where(eq(session.sid, sid2))
    await b.agent.get('/api/auth/me').expect(401)

    // Expired straight after signing in: no rolling-expiry write of an earlier request is still out
    // (those are written after their response, throttleTouch) to move the expiry back.
    const c = await signedIn(t.app, 'principal@example.com')
    const sid3 = await sidOf('principal@example.com')
    await t.db.db.update(session).set({ expire: sql`now() - interval '1 minute'` }).where(eq(session.sid, sid3))
    await c.agent.get('/api/auth/me').expect(401)
  })
})

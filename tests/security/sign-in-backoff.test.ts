import { eq, sql } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { users } from '../../api/src/db/schema'
import { blockMsAfter, FREE_ATTEMPTS, MAX_BLOCK_MS } from '../../api/src/services/sign-in-backoff'
import { issueToken } from '../../api/src/services/users'
import { agentFor, createTestApp, DEMO_PASSWORD, type TestApp } from '../helpers/app'

// Sign-in brute force (OWASP Authentication Cheat Sheet, account lockout; OWASP WSTG-ATHN-03):
// after a few wrong passwords the account backs off for a while that grows and is capped, and
// the owner can always get back in — the block ends by itself and a password reset lifts it.
// The numbers (5 free tries, 1 min doubling, 15 min cap) are our choice, common practice, no source.

let t: TestApp
const email = 'engineer@example.com'
beforeAll(async () => {
  t = await createTestApp({ SIGN_IN_LIMIT: '1000' })
})
afterAll(() => t.close())

async function tryPassword(password: string) {
  const { agent, csrf } = await agentFor(t.app)
  return agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email, password })
}

describe('sign-in back-off', () => {
  it('grows the block from 1 minute, doubling, to at most 15 minutes', () => {
    expect(FREE_ATTEMPTS).toBe(5)
    expect([4, 5, 6, 7, 8, 9, 10, 30].map(blockMsAfter)).toEqual([0, 60_000, 120_000, 240_000, 480_000, 900_000, 900_000, 900_000])
    expect(MAX_BLOCK_MS).toBe(15 * 60_000)
  })

  it('blocks the account after five wrong passwords, even for the right one, and says how long', async () => {
    for (let i = 0; i < FREE_ATTEMPTS; i++) expect((await tryPassword('wrong-password-123')).status).toBe(401)
    const blocked = await tryPassword(DEMO_PASSWORD)
    expect(blocked.status).toBe(429)
    expect(blocked.body.error.message).toMatch(/Try again in 1 minute, or reset your password/)
  })

  it('lets the owner in once the block has run out, and starts counting again', async () => {
    await t.db.db.update(users).set({ signInBlockedUntil: sql`now() - interval '1 second'` }).where(eq(users.email, email))
    expect((await tryPassword(DEMO_PASSWORD)).status).toBe(200)
    const [row] = await t.db.db.select().from(users).where(eq(users.email, email))
    expect(row!.failedSignIns).toBe(0)
    expect(row!.signInBlockedUntil).toBeNull()
  })

  it('is lifted at once by a password reset, so an attacker cannot keep the owner out', async () => {
    for (let i = 0; i < FREE_ATTEMPTS + 2; i++) await tryPassword('wrong-password-123')
    expect((await tryPassword(DEMO_PASSWORD)).status).toBe(429)
    const [row] = await t.db.db.select({ id: users.id }).from(users).where(eq(users.email, email))
    const token = await issueToken(t.db.db, row!.id, 'reset')
    const { agent, csrf } = await agentFor(t.app)
    await agent.post('/api/auth/set-password').set('x-csrf-token', csrf).send({ token, password: 'a-brand-new-passphrase' }).expect(200)
    expect((await tryPassword('a-brand-new-passphrase')).status).toBe(200)
  })
})

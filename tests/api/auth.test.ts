import { eq } from 'drizzle-orm'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { users } from '../../api/src/db/schema'
import { SIGN_IN_FAILED } from '../../api/src/routes/auth'
import { agentFor, createTestApp, DEMO_PASSWORD, signedIn, type TestApp } from '../helpers/app'

let t: TestApp
beforeAll(async () => {
  t = await createTestApp()
})
afterAll(async () => t.close())

const sidOf = (res: request.Response) =>
  ([] as string[]).concat(res.headers['set-cookie'] ?? []).find(c => c.startsWith('backsight.sid='))?.split(';')[0]

describe('POST /api/auth/sign-in', () => {
  it('signs in with the right password and returns the user with its role', async () => {
    const { agent, csrf } = await agentFor(t.app)
    const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'Engineer@Example.com', password: DEMO_PASSWORD })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ email: 'engineer@example.com', role: 'engineer', active: true })
    expect(res.body.passwordHash).toBeUndefined()
    const me = await agent.get('/api/auth/me').expect(200)
    expect(me.body.role).toBe('engineer')
  })

  it('refuses a wrong password and an unknown user with the same status and message', async () => {
    const wrong = await agentFor(t.app)
    const r1 = await wrong.agent.post('/api/auth/sign-in').set('x-csrf-token', wrong.csrf).send({ email: 'engineer@example.com', password: 'not-the-password' })
    const unknown = await agentFor(t.app)
    const r2 = await unknown.agent.post('/api/auth/sign-in').set('x-csrf-token', unknown.csrf).send({ email: 'nobody@example.com', password: 'not-the-password' })
    expect(r1.status).toBe(401)
    expect(r2.status).toBe(401)
    expect(r1.body).toEqual({ error: { code: 'UNAUTHENTICATED', message: SIGN_IN_FAILED } })
    expect(r2.body).toEqual(r1.body)
  })

  it('takes the same timing class for a wrong password and an unknown user (both pay one bcrypt compare)', async () => {
    const time = async (email: string) => {
      const a = await agentFor(t.app)
      const t0 = performance.now()
      await a.agent.post('/api/auth/sign-in').set('x-csrf-token', a.csrf).send({ email, password: 'not-the-password' })
      return performance.now() - t0
    }
    const known: number[] = []
    const unknown: number[] = []
    for (let i = 0; i < 3; i++) {
      known.push(await time('principal@example.com'))
      unknown.push(await time(`ghost${i}@example.com`))
    }
    const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[1]!
    // bcrypt cost 10 takes tens of ms; skipping it for unknown users would make them ~10x faster.
    expect(median(unknown)).toBeGreaterThan(median(known) * 0.4)
    expect(median(unknown)).toBeLessThan(median(known) * 2.5)
  })

  it('gives a new session id at sign-in (no session fixation)', async () => {
    const { agent, csrf } = await agentFor(t.app)
    const before = await agent.get('/api/auth/csrf')
    const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'bd@example.com', password: DEMO_PASSWORD })
    const sidBefore = sidOf(before) ?? 'none'
    expect(sidOf(res)).toBeDefined()
    expect(sidOf(res)).not.toBe(sidBefore)
  })

  it('sets an httpOnly, SameSite session cookie', async () => {
    const { agent, csrf } = await agentFor(t.app)
    const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'bd@example.com', password: DEMO_PASSWORD })
    const cookie = ([] as string[]).concat(res.headers['set-cookie']).find(c => c.startsWith('backsight.sid='))!
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Lax/i)
  })

  it('refuses a deactivated user, and ends the sessions they had', async () => {
    const { agent } = await signedIn(t.app, 'principal@example.com')
    await t.db.db.update(users).set({ active: false }).where(eq(users.email, 'principal@example.com'))
    await agent.get('/api/auth/me').expect(401)
    const a = await agentFor(t.app)
    const res = await a.agent.post('/api/auth/sign-in').set('x-csrf-token', a.csrf).send({ email: 'principal@example.com', password: DEMO_PASSWORD })
    expect(res.status).toBe(401)
    expect(res.body.error.message).toBe(SIGN_IN_FAILED)
    await t.db.db.update(users).set({ active: true }).where(eq(users.email, 'principal@example.com'))
  })

  it('answers 400 VALIDATION_FAILED naming the field when the e-mail is malformed', async () => {
    const { agent, csrf } = await agentFor(t.app)
    const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).send({ email: 'not-an-email', password: 'x' })
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('VALIDATION_FAILED')
    expect(Object.keys(res.body.error.fields)).toEqual(['email'])
  })
})

describe('POST /api/auth/sign-out', () => {
  it('ends the session', async () => {
    const { agent, csrf } = await signedIn(t.app, 'engineer@example.com')
    await agent.get('/api/auth/me').expect(200)
    await agent.post('/api/auth/sign-out').set('x-csrf-token', csrf).expect(204)
    await agent.get('/api/auth/me').expect(401)
  })
})

describe('CSRF', () => {
  it('refuses a state-changing request without the token, and with a wrong one', async () => {
    const { agent, csrf } = await signedIn(t.app, 'engineer@example.com')
    const none = await agent.patch('/api/auth/me').send({ units: 'si' })
    expect(none.status).toBe(403)
    expect(none.body.error.code).toBe('CSRF_INVALID')
    const wrong = await agent.patch('/api/auth/me').set('x-csrf-token', 'x'.repeat(32)).send({ units: 'si' })
    expect(wrong.status).toBe(403)
    const ok = await agent.patch('/api/auth/me').set('x-csrf-token', csrf).send({ units: 'si' })
    expect(ok.status).toBe(200)
    expect(ok.body.units).toBe('si')
  })

  it('refuses sign-in without the token (no login CSRF)', async () => {
    const res = await request(t.app).post('/api/auth/sign-in').send({ email: 'engineer@example.com', password: DEMO_PASSWORD })
    expect(res.status).toBe(403)
  })
})

describe('PATCH /api/auth/me', () => {
  it('stores the units preference per user and ignores nothing silently', async () => {
    const { agent, csrf } = await signedIn(t.app, 'bd@example.com')
    await agent.patch('/api/auth/me').set('x-csrf-token', csrf).send({ units: 'si' }).expect(200)
    expect((await agent.get('/api/auth/me')).body.units).toBe('si')
    const sneaky = await agent.patch('/api/auth/me').set('x-csrf-token', csrf).send({ role: 'admin' })
    expect(sneaky.status).toBe(400)
    expect((await agent.get('/api/auth/me')).body.role).toBe('bd')
  })
})

describe('GET /api/health', () => {
  it('reports the database up', async () => {
    const res = await request(t.app).get('/api/health').expect(200)
    expect(res.body).toMatchObject({ status: 'ok', database: 'up' })
  })
})

describe('errors', () => {
  it('answers an unknown API route with the JSON envelope', async () => {
    const res = await request(t.app).get('/api/no-such-thing').expect(404)
    expect(res.body.error.code).toBe('NOT_FOUND')
  })

  it('answers malformed JSON with 400 and no stack trace', async () => {
    const { agent, csrf } = await agentFor(t.app)
    const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', csrf).set('content-type', 'application/json').send('{"email":')
    expect(res.status).toBe(400)
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.ts/)
  })

  it('sends helmet security headers', async () => {
    const res = await request(t.app).get('/api/health')
    expect(res.headers['x-content-type-options']).toBe('nosniff')
    expect(res.headers['content-security-policy']).toContain("default-src 'self'")
    expect(res.headers['x-powered-by']).toBeUndefined()
  })
})

import { and, eq } from 'drizzle-orm'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { auditLog, userTokens } from '../../api/src/db/schema'
import { agentFor, createTestApp, signedIn, type TestApp } from '../helpers/app'
import { tokenFrom, waitForMail } from '../helpers/mail'

let t: TestApp
let admin: Awaited<ReturnType<typeof signedIn>>
beforeAll(async () => {
  t = await createTestApp()
  admin = await signedIn(t.app, 'admin@example.com')
})
afterAll(async () => t.close())

const unique = (label: string) => `${label}-${Date.now()}-${Math.floor(Math.random() * 1e6)}@example.com`

async function invite(email: string, role = 'engineer') {
  const res = await admin.agent.post('/api/users/invitations').set('x-csrf-token', admin.csrf).send({ email, name: 'New Person', role })
  expect(res.status).toBe(201)
  expect(res.body.mailDelivered).toBe(true)
  return res.body.user as { id: number; pendingInvite: boolean }
}

async function setPassword(token: string, password: string) {
  const a = await agentFor(t.app)
  return a.agent.post('/api/auth/set-password').set('x-csrf-token', a.csrf).send({ token, password })
}

describe('invitations', () => {
  it('invite → e-mail at the sink → link sets a password → sign-in works', async () => {
    const email = unique('invitee')
    const user = await invite(email, 'principal')
    expect(user.pendingInvite).toBe(true)
    const mail = await waitForMail(email)
    expect(mail.subject).toMatch(/invited/i)
    expect(mail.text).toContain('http://backsight.test/set-password?token=')
    const token = tokenFrom(mail.text)

    const info = await request(t.app).get(`/api/auth/tokens/${token}`).expect(200)
    expect(info.body).toEqual({ kind: 'invite', email, name: 'New Person' })

    expect((await setPassword(token, 'a-long-new-password')).status).toBe(200)
    const me = await signedIn(t.app, email, 'a-long-new-password')
    const whoami = await me.agent.get('/api/auth/me').expect(200)
    expect(whoami.body.role).toBe('principal')
  })

  it('refuses a reused link', async () => {
    const email = unique('reuse')
    await invite(email)
    const token = tokenFrom((await waitForMail(email)).text)
    expect((await setPassword(token, 'first-password-ok')).status).toBe(200)
    const again = await setPassword(token, 'second-password-ok')
    expect(again.status).toBe(404)
    expect(again.body.error.message).toMatch(/expired or has already been used/)
    await request(t.app).get(`/api/auth/tokens/${token}`).expect(404)
  })

  it('refuses an expired link', async () => {
    const email = unique('expired')
    const user = await invite(email)
    const token = tokenFrom((await waitForMail(email)).text)
    await t.db.db.update(userTokens).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(userTokens.userId, user.id))
    expect((await setPassword(token, 'some-password-ok')).status).toBe(404)
  })

  it('refuses a password shorter than 10 characters, naming the field', async () => {
    const email = unique('short')
    await invite(email)
    const token = tokenFrom((await waitForMail(email)).text)
    const res = await setPassword(token, 'short')
    expect(res.status).toBe(400)
    expect(res.body.error.fields.password).toMatch(/10 characters/)
  })

  it('answers 409 for an e-mail that already has an account', async () => {
    const res = await admin.agent.post('/api/users/invitations').set('x-csrf-token', admin.csrf).send({ email: 'bd@example.com', name: 'X', role: 'bd' })
    expect(res.status).toBe(409)
    expect(res.body.error.code).toBe('CONFLICT')
  })
})

describe('forgot password', () => {
  it('sends a reset link that works once; the answer does not reveal whether the address exists', async () => {
    const a = await agentFor(t.app)
    const after = Date.now()
    const known = await a.agent.post('/api/auth/forgot-password').set('x-csrf-token', a.csrf).send({ email: 'engineer@example.com' })
    const unknown = await a.agent.post('/api/auth/forgot-password').set('x-csrf-token', a.csrf).send({ email: 'nobody-here@example.com' })
    expect(known.status).toBe(202)
    expect(unknown.status).toBe(202)
    expect(unknown.body).toEqual(known.body)
    const mail = await waitForMail('engineer@example.com', { after })
    expect(mail.subject).toMatch(/reset/i)
    const token = tokenFrom(mail.text)
    expect((await setPassword(token, 'engineer-new-password')).status).toBe(200)
    expect((await setPassword(token, 'engineer-other-password')).status).toBe(404)
    await signedIn(t.app, 'engineer@example.com', 'engineer-new-password')
  })
})

describe('PATCH /api/users/:userId', () => {
  it('changes a role, records it in the audit log, and ends the user’s sessions', async () => {
    const email = unique('promote')
    const user = await invite(email, 'bd')
    await setPassword(tokenFrom((await waitForMail(email)).text), 'promote-password-1')
    const session = await signedIn(t.app, email, 'promote-password-1')
    const res = await admin.agent.patch(`/api/users/${user.id}`).set('x-csrf-token', admin.csrf).send({ role: 'engineer' })
    expect(res.status).toBe(200)
    expect(res.body.role).toBe('engineer')
    await session.agent.get('/api/auth/me').expect(401)
    const [entry] = await t.db.db.select().from(auditLog).where(and(eq(auditLog.entityId, String(user.id)), eq(auditLog.action, 'user.update')))
    expect(entry).toMatchObject({ action: 'user.update', detail: { role: { from: 'bd', to: 'engineer' } } })
  })

  it('deactivates a user, who then cannot sign in', async () => {
    const email = unique('leaver')
    const user = await invite(email)
    await setPassword(tokenFrom((await waitForMail(email)).text), 'leaver-password-1')
    await admin.agent.patch(`/api/users/${user.id}`).set('x-csrf-token', admin.csrf).send({ active: false }).expect(200)
    const a = await agentFor(t.app)
    const res = await a.agent.post('/api/auth/sign-in').set('x-csrf-token', a.csrf).send({ email, password: 'leaver-password-1' })
    expect(res.status).toBe(401)
  })

  it('does not let an admin remove their own admin access', async () => {
    const me = (await admin.agent.get('/api/auth/me')).body as { id: number }
    const res = await admin.agent.patch(`/api/users/${me.id}`).set('x-csrf-token', admin.csrf).send({ role: 'bd' })
    expect(res.status).toBe(409)
    expect((await admin.agent.get('/api/auth/me')).body.role).toBe('admin')
  })

  it('refuses a body that tries to set other fields', async () => {
    const me = (await admin.agent.get('/api/auth/me')).body as { id: number }
    const res = await admin.agent.patch(`/api/users/${me.id}`).set('x-csrf-token', admin.csrf).send({ email: 'x@example.com' })
    expect(res.status).toBe(400)
  })
})

describe('GET /api/mailbox', () => {
  it('lists what the sink captured for the admin, with the message text', async () => {
    const email = unique('mailbox')
    await invite(email)
    await waitForMail(email)
    const list = await admin.agent.get('/api/mailbox').expect(200)
    expect(list.body.enabled).toBe(true)
    const item = (list.body.items as { id: string; to: string[] }[]).find(m => m.to.includes(email))
    expect(item).toBeDefined()
    const msg = await admin.agent.get(`/api/mailbox/${item!.id}`).expect(200)
    expect(msg.body.text).toContain('set-password?token=')
  })
})

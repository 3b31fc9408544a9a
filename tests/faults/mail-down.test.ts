import { mkdtempSync, readdirSync, readFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { eq, isNull } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { outbox } from '../../api/src/db/schema'
import type { OutboxMailer } from '../../api/src/mail/outbox'
import { retryDelayMs } from '../../api/src/mail/outbox'
import { validProject } from '../etl/bundle-builder'
import { mailRunSummary } from '../../etl/src/summary-mail'
import { runImport } from '../../etl/src/run'
import { startMailSink, type MailSink } from '../../scripts/fakes/mail-sink'
import { freePort } from '../../scripts/lib/ports'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'
import { workbookOf } from '../helpers/history-files'

// The mail service down: sign-up (an invitation) and an import still complete; the messages wait
// in the outbox and go out by themselves once the service is back.

let t: TestApp
let port: number
let sink: MailSink | undefined
const dir = mkdtempSync(join(tmpdir(), 'backsight-mail-down-'))

beforeAll(async () => {
  port = await freePort() // nothing listens here yet: the mail service is down
  t = await createTestApp({ SMTP_HOST: '127.0.0.1', SMTP_PORT: String(port) })
})
afterAll(async () => {
  await sink?.close()
  await t.close()
})

const pending = () => t.db.db.select().from(outbox).where(isNull(outbox.sentAt))

describe('mail service down', () => {
  it('retries after 15 s, 30 s, 1 min … never more than 15 min apart', () => {
    expect([1, 2, 3, 4, 10, 50].map(retryDelayMs)).toEqual([15_000, 30_000, 60_000, 120_000, 900_000, 900_000])
  })

  it('still invites a user and finishes an import; the mail waits in the outbox and goes when the service is back', async () => {
    const admin = await signedIn(t.app, 'admin@example.com')
    const invite = await admin.agent.post('/api/users/invitations').set('x-csrf-token', admin.csrf).send({ email: 'new.hire@example.com', name: 'New Hire', role: 'engineer' })
    expect(invite.status).toBe(201)
    expect(invite.body.mailDelivered).toBe(false)

    const files = [{ file: 'one.xlsx', data: new Uint8Array(await workbookOf(validProject('MD-001') as never)) }]
    const summary = await runImport(t.db.db, files, { source: 'cli' })
    expect(summary.loaded).toBe(1)
    expect(await mailRunSummary(t.db.db, summary, t.config.smtp)).toBeGreaterThan(0)

    const waiting = await pending()
    expect(waiting.map(m => m.to).sort()).toEqual(['new.hire@example.com', 'principal@example.com'])
    expect(waiting.every(m => m.attempts === 1 && m.lastError)).toBe(true)

    // The service comes back on the same address.
    sink = await startMailSink({ port, dir })
    const mailer = t.app.locals.mailer as OutboxMailer
    expect(await mailer.flush({ all: true })).toBe(2)
    expect(await pending()).toEqual([])
    const received = readdirSync(dir).filter(f => f.endsWith('.json')).map(f => JSON.parse(readFileSync(join(dir, f), 'utf8')) as { to: string[]; subject: string; text: string })
    expect(received.map(m => m.to.join()).sort()).toEqual(['new.hire@example.com', 'principal@example.com'])
    expect(received.find(m => m.to.includes('new.hire@example.com'))!.text).toMatch(/set-password\?token=/)
    const [sent] = await t.db.db.select().from(outbox).where(eq(outbox.to, 'new.hire@example.com'))
    expect(sent!.attempts).toBe(2)
  }, 60_000)
})

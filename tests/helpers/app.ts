import type { Express } from 'express'
import request from 'supertest'
import { createApp } from '../../api/src/app'
import { loadConfig, type Config } from '../../api/src/config'
import { createMailer, type Mailer } from '../../api/src/mail/mailer'
import { ensureDemoUsers } from '../../api/src/services/users'
import { createTestDb, type TestDb } from './db'

export const DEMO_PASSWORD = 'correct-horse-battery'

export interface TestApp {
  app: Express
  db: TestDb
  config: Config
  mailer: Mailer
  close: () => Promise<void>
}

/** The real app on its own fresh database, with the four demo users, through the test mail sink. */
export async function createTestApp(overrides: Record<string, string> = {}): Promise<TestApp> {
  const db = await createTestDb()
  const config = loadConfig({
    ...process.env,
    NODE_ENV: 'test',
    DATABASE_URL: db.url,
    PUBLIC_URL: 'http://backsight.test',
    SESSION_SECRET: 'test-secret-test-secret-test-secret',
    // Every answer of the newest data version unless a test asks for the fallback (answer-freshness.ts).
    ANSWER_GRACE_MS: 'off',
    ...overrides,
  })
  const mailer = createMailer(config.smtp)
  await ensureDemoUsers(db.db, DEMO_PASSWORD)
  const app = createApp({ db: db.db, pool: db.pool, config, mailer })
  return {
    app,
    db,
    config,
    mailer,
    close: async () => {
      mailer.close()
      await db.drop()
    },
  }
}

/** A cookie-keeping client with its CSRF token; `send` adds the header to state-changing calls. */
export async function agentFor(app: Express) {
  const agent = request.agent(app)
  const { body } = await agent.get('/api/auth/csrf').expect(200)
  return { agent, csrf: body.token as string }
}

/** Signs in and returns the agent and token. */
export async function signedIn(app: Express, email: string, password = DEMO_PASSWORD) {
  const a = await agentFor(app)
  await a.agent.post('/api/auth/sign-in').set('x-csrf-token', a.csrf).send({ email, password }).expect(200)
  return a
}

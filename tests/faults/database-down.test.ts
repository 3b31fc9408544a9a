import { chmodSync, mkdtempSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Express } from 'express'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createApp } from '../../api/src/app'
import { loadConfig } from '../../api/src/config'
import { migrateDb, openDb, type DbHandle } from '../../api/src/db'
import { createMailer } from '../../api/src/mail/mailer'
import { DEMO_USERS, ensureDemoUsers } from '../../api/src/services/users'
import { ensureDatabase, startCluster, type Cluster } from '../../scripts/lib/postgres'
import { freePort } from '../../scripts/lib/ports'
import { DEMO_PASSWORD, signedIn } from '../helpers/app'

// PostgreSQL stopped under a running app: the API answers 503 with a clear message at once (no
// hang, no crash), /api/health says the database is down, and everything comes back by itself
// when the server returns — the signed-in session included, since sessions live in PostgreSQL.
// This file runs a cluster of its own, because it stops it.

let cluster: Cluster
let handle: DbHandle
let app: Express
const dir = mkdtempSync(join(tmpdir(), 'backsight-dbdown-'))
chmodSync(dir, 0o755)
const engineer = DEMO_USERS.find(u => u.role === 'engineer')!.email

beforeAll(async () => {
  cluster = startCluster({ dataDir: join(dir, 'pgdata'), port: await freePort() })
  await ensureDatabase(cluster.url('postgres'), 'backsight')
  handle = openDb(cluster.url('backsight'), { max: 4 })
  await migrateDb(handle.db)
  await ensureDemoUsers(handle.db, DEMO_PASSWORD)
  const config = loadConfig({ ...process.env, NODE_ENV: 'test', DATABASE_URL: cluster.url('backsight'), PUBLIC_URL: 'http://backsight.test', SESSION_SECRET: 'test-secret-test-secret-test-secret' })
  app = createApp({ db: handle.db, pool: handle.pool, config, mailer: createMailer(config.smtp) })
}, 120_000)

afterAll(async () => {
  await handle?.close().catch(() => {})
  cluster?.stop()
})

describe('PostgreSQL stops while the app runs', () => {
  it('answers 503 quickly with a clear message, reports it on /api/health, and recovers by itself', async () => {
    const a = await signedIn(app, engineer)
    await a.agent.get('/api/projects').expect(200)

    cluster.stop()

    const t0 = Date.now()
    const health = await a.agent.get('/api/health')
    expect(health.status).toBe(503)
    expect(health.body).toMatchObject({ status: 'degraded', database: 'down' })
    const list = await a.agent.get('/api/projects')
    expect(list.status).toBe(503)
    expect(list.body.error.message).toMatch(/database/i)
    const signIn = await a.agent.post('/api/auth/sign-in').set('x-csrf-token', a.csrf).send({ email: engineer, password: DEMO_PASSWORD })
    expect(signIn.status).toBe(503)
    // Each answer within the pool's 5 s connection timeout (api/src/db/index.ts), not a hang.
    expect(Date.now() - t0).toBeLessThan(20_000)

    startCluster({ dataDir: cluster.dataDir, port: cluster.port })
    let back = 0
    for (let i = 0; i < 40 && back !== 200; i++) {
      back = (await a.agent.get('/api/health')).status
      if (back !== 200) await new Promise(r => setTimeout(r, 250))
    }
    expect(back).toBe(200)
    // Same session, no sign-in again.
    await a.agent.get('/api/projects').expect(200)
  }, 90_000)
})

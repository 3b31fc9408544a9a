import { sql } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ROLES, type Role } from '@shared/auth/roles'
import { routeTableOf } from '../../api/src/app'
import { isAllowed, type RouteSpec } from '../../api/src/routes/route-table'
import { expandPaths } from '../../etl/src/paths'
import { readInputs, runImport } from '../../etl/src/run'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'

// Sweeps generated from the app's own route table, so every route mounted later is covered:
// CSRF on every state-changing route; SQL injection through every query and path parameter the
// API reads; and no 5xx for hostile input anywhere. OWASP Testing Guide v4.2: WSTG-SESS-05 (CSRF),
// WSTG-INPV-05 (SQL injection).

let t: TestApp
let agents: Record<Role, Awaited<ReturnType<typeof signedIn>>>

beforeAll(async () => {
  t = await createTestApp()
  await runImport(t.db.db, await readInputs(await expandPaths(['demo-data'])), { source: 'cli' })
  agents = Object.fromEntries(await Promise.all(ROLES.map(async r => [r, await signedIn(t.app, `${r}@example.com`)] as const))) as typeof agents
}, 120_000)
afterAll(() => t.close())

/** A role the route lets in (admin first for admin-only routes). */
const roleFor = (spec: RouteSpec): Role | undefined => ROLES.find(r => isAllowed(spec.access, r))

const INJECTIONS = [`' OR '1'='1`, `1; drop table projects; --`, `x') union select password_hash from users --`, `"; select pg_sleep(5); --`, `%27%20OR%201=1`, `\\' or 1=1 #`]

/** Every query parameter name the API's shared schemas read (a superset is harmless: unknown ones must be refused or ignored). */
const PARAMS = [
  'q', 'sort', 'order', 'dir', 'page', 'pageSize', 'limit', 'format', 'units', 'status', 'supplier', 'use', 'sdc', 'codeEdition', 'configuration',
  'groupBy', 'quantity', 'phase', 'yearFrom', 'yearTo', 'storiesMin', 'storiesMax', 'coreAreaMin', 'coreAreaMax', 'quantile', 'region', 'revision', 'table',
]

/** Downloads that rebuild the whole history file per request and take no free-text parameter. */
const WHOLE_FILE = new Set(['/api/history/export', '/api/imports/template.xlsx'])

const concrete = (path: string, value: string) => path.replace(/:(\w+)/g, () => encodeURIComponent(value))

describe('security sweeps over the route table', () => {
  it('refuses every state-changing route without the CSRF token, for a role that may call it', async () => {
    const failures: string[] = []
    for (const spec of routeTableOf(t.app).filter(s => s.method !== 'get')) {
      const role = roleFor(spec)
      const path = concrete(spec.path, '1')
      const res = role && spec.access !== 'public' ? await agents[role].agent[spec.method](path).send({}) : await agents.engineer.agent[spec.method](path).send({})
      if (!(res.status === 403 && res.body?.error?.code === 'CSRF_INVALID')) failures.push(`${spec.method} ${spec.path} → ${res.status} ${res.body?.error?.code ?? ''}`)
    }
    expect(failures).toEqual([])
  })

  it('answers SQL injection in every query and path parameter with 2xx/4xx, never 5xx, and loses nothing', async () => {
    const before = await t.db.db.execute(sql`select (select count(*) from projects)::int as p, (select count(*) from brace_snapshots)::int as s, (select count(*) from users)::int as u`)
    const failures: string[] = []
    for (const spec of routeTableOf(t.app).filter(s => s.method === 'get' && !s.path.includes('/auth/tokens/'))) {
      const role = roleFor(spec) ?? 'engineer'
      const t0 = Date.now()
      // Every parameter at once, with each payload…
      for (const inj of INJECTIONS) {
        const res = await agents[role].agent.get(concrete(spec.path, inj)).query(Object.fromEntries(PARAMS.map(p => [p, inj])))
        if (res.status >= 500) failures.push(`${spec.path} ${JSON.stringify(inj)} → ${res.status} ${res.body?.error?.message ?? ''}`)
      }
      // The whole-history export reads only `format` (an enum, refused above): one pass is enough.
      if (WHOLE_FILE.has(spec.path)) continue
      // …and one parameter at a time, so a lone free-text value passes the other fields' validation and reaches the query.
      for (const [i, p] of PARAMS.entries()) {
        const inj = INJECTIONS[i % INJECTIONS.length]!
        const one = await agents[role].agent.get(concrete(spec.path, 'x')).query({ [p]: inj })
        if (one.status >= 500) failures.push(`${spec.path}?${p}=${JSON.stringify(inj)} → ${one.status}`)
      }
      if (process.env.SWEEP_TIMES) console.log('SWEEP', Date.now() - t0, spec.path)
    }
    expect(failures).toEqual([])
    const after = await t.db.db.execute(sql`select (select count(*) from projects)::int as p, (select count(*) from brace_snapshots)::int as s, (select count(*) from users)::int as u`)
    expect(after.rows).toEqual(before.rows)
  }, 300_000)

  it('does not let a user raise their own role or reactivate themselves through extra body fields', async () => {
    const { agent, csrf } = agents.engineer
    const res = await agent.patch('/api/auth/me').set('x-csrf-token', csrf).send({ units: 'si', role: 'admin', active: true, email: 'x@example.com' })
    expect([200, 400]).toContain(res.status)
    const me = await agent.get('/api/auth/me').expect(200)
    expect(me.body.user?.role ?? me.body.role).toBe('engineer')
    expect(me.body.user?.email ?? me.body.email).toBe('engineer@example.com')
    // An engineer cannot reach the admin's user edit at all.
    const users = await agent.patch('/api/users/1').set('x-csrf-token', csrf).send({ role: 'admin' })
    expect(users.status).toBe(403)
  })
})

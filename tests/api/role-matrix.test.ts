import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ROLES, type Role } from '@shared/auth/roles'
import { routeTableOf } from '../../api/src/app'
import { isAllowed } from '../../api/src/routes/route-table'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'

// Generated from the app's own route table: a new route is covered the moment it is mounted.
let t: TestApp
let agents: Record<Role, Awaited<ReturnType<typeof signedIn>>>

beforeAll(async () => {
  t = await createTestApp()
  const entries = await Promise.all(ROLES.map(async r => [r, await signedIn(t.app, `${r}@example.com`)] as const))
  agents = Object.fromEntries(entries) as typeof agents
})
afterAll(async () => t.close())

// Side-effecting routes whose effect on the session would change the next rows.
const SKIP_FOR_SIGNED_IN = new Set(['post /api/auth/sign-out', 'post /api/auth/sign-in'])

function concretePath(path: string): string {
  return path.replace(/:(\w+)/g, (_m, name: string) => (name === 'token' ? 'a'.repeat(43) : name.endsWith('Id') ? '999999' : 'x'))
}

describe('role matrix', () => {
  it('covers every route in the table', () => {
    const table = routeTableOf(t.app)
    expect(table.length).toBeGreaterThanOrEqual(14)
    for (const spec of table) expect(spec.access === 'public' || spec.access === 'signed-in' || spec.access.length > 0).toBe(true)
  })

  it('answers each route × each role (and anonymous) with exactly the allowed status', async () => {
    const table = routeTableOf(t.app)
    const failures: string[] = []
    for (const spec of table) {
      const key = `${spec.method} ${spec.path}`
      const path = concretePath(spec.path)
      // Anonymous
      const anon = await request(t.app)[spec.method](path).send({})
      const anonAllowed = isAllowed(spec.access, undefined)
      if (anonAllowed ? anon.status === 401 || anon.status === 403 : anon.status !== 401) {
        if (!(anonAllowed && anon.status === 403 && anon.body?.error?.code === 'CSRF_INVALID')) failures.push(`${key} anonymous → ${anon.status}`)
      }
      if (SKIP_FOR_SIGNED_IN.has(key)) continue
      for (const role of ROLES) {
        const { agent, csrf } = agents[role]
        const res = await agent[spec.method](path).set('x-csrf-token', csrf).send({})
        const allowed = isAllowed(spec.access, role)
        const denied = res.status === 403 && res.body?.error?.code === 'FORBIDDEN'
        if (allowed ? denied || res.status === 401 : !denied) failures.push(`${key} as ${role} → ${res.status} ${res.body?.error?.code ?? ''}`)
      }
    }
    expect(failures).toEqual([])
  })
})

import { DrizzleQueryError } from 'drizzle-orm/errors'
import express from 'express'
import request from 'supertest'
import { describe, expect, it } from 'vitest'
import { errorHandler } from '../../api/src/middleware/error-handler'

// How driver errors reach the client: PostgreSQL's SQLSTATE codes (PostgreSQL 15 manual, Appendix A:
// 23505 unique_violation, 57P01 admin_shutdown) and the socket's ECONNREFUSED, whether node-postgres
// throws them directly or Drizzle wraps them (DrizzleQueryError, the original as `cause`).

const failingWith = (err: unknown) => {
  const app = express()
  app.get('/x', () => {
    throw err
  })
  app.use(errorHandler)
  return app
}

const pgError = (code: string, message: string) => Object.assign(new Error(message), { code })

describe('errorHandler and driver errors', () => {
  const cases: [string, unknown, number, string][] = [
    ['refused, raw', pgError('ECONNREFUSED', 'connect ECONNREFUSED 127.0.0.1:5432'), 503, 'SERVICE_UNAVAILABLE'],
    ['refused, wrapped by Drizzle', new DrizzleQueryError('select 1', [], pgError('ECONNREFUSED', 'connect ECONNREFUSED 127.0.0.1:5432')), 503, 'SERVICE_UNAVAILABLE'],
    ['shutdown, wrapped', new DrizzleQueryError('select 1', [], pgError('57P01', 'terminating connection due to administrator command')), 503, 'SERVICE_UNAVAILABLE'],
    ['terminated, wrapped (no code)', new DrizzleQueryError('select 1', [], new Error('Connection terminated unexpectedly')), 503, 'SERVICE_UNAVAILABLE'],
    ['unique violation, raw', pgError('23505', 'duplicate key value violates unique constraint'), 409, 'CONFLICT'],
    ['unique violation, wrapped', new DrizzleQueryError('insert …', [], pgError('23505', 'duplicate key value violates unique constraint')), 409, 'CONFLICT'],
    ['another SQL error, wrapped', new DrizzleQueryError('select …', [], pgError('42703', 'column "x" does not exist')), 500, 'INTERNAL'],
    ['a plain bug', new TypeError('x is undefined'), 500, 'INTERNAL'],
  ]
  for (const [name, err, status, code] of cases) {
    it(`${name} → ${status} ${code}`, async () => {
      const res = await request(failingWith(err)).get('/x')
      expect(res.status).toBe(status)
      expect(res.body.error.code).toBe(code)
    })
  }
})

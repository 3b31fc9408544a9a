import { sql } from 'drizzle-orm'
import type { HealthResponse } from '@shared/schemas/users'
import type { AppDeps } from '../app'
import type { RouteSpec } from './route-table'
import { analyticsReady } from '../services/calibration/store'

export const VERSION = '0.1.0'

export function healthRoutes({ db }: AppDeps): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/api/health',
      access: 'public',
      sessionless: true,
      handler: async (_req, res) => {
        let database: 'up' | 'down' = 'up'
        try {
          await Promise.race([
            db.execute(sql`select 1`),
            new Promise((_, reject) => setTimeout(() => reject(new Error('health check timed out')), 2_000).unref()),
          ])
        } catch {
          database = 'down'
        }
        const body: HealthResponse = { status: database === 'up' ? 'ok' : 'degraded', database, analytics: analyticsReady(db) ? 'ready' : 'warming', version: VERSION }
        res.status(database === 'up' ? 200 : 503).json(body)
      },
    },
  ]
}

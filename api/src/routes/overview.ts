import type { AppDeps } from '../app'
import { overview } from '../services/overview'
import type { RouteSpec } from './route-table'

/** Overview (every signed-in role; the answer depends on the role: `shared/schemas/overview.ts`). */
export function overviewRoutes({ db }: AppDeps): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/api/overview',
      access: 'signed-in',
      handler: async (req, res) => {
        res.json(await overview(db, req.user!.role))
      },
    },
  ]
}

import { PrecedentSearchBody } from '@shared/schemas/precedents'
import type { AppDeps } from '../app'
import { searchPrecedents } from '../services/precedents'
import type { RouteSpec } from './route-table'

/** Precedents area (principal, engineer): `shared/auth/roles.ts` `precedents`. */
export function precedentRoutes({ db }: AppDeps): RouteSpec[] {
  return [
    {
      method: 'post',
      path: '/api/precedents/search',
      access: ['principal', 'engineer'],
      handler: async (req, res) => {
        res.json(await searchPrecedents(db, PrecedentSearchBody.parse(req.body)))
      },
    },
  ]
}

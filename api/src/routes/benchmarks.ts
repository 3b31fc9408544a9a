import { BenchmarkQuery, ProposalBody } from '@shared/schemas/benchmarks'
import type { AppDeps } from '../app'
import { benchmarks, proposal } from '../services/benchmarks'
import type { RouteSpec } from './route-table'

/** Benchmarks area (principal, business development): `shared/auth/roles.ts` `benchmarks`. */
const benchmarkRoles = ['principal', 'bd'] as const

export function benchmarkRoutes({ db }: AppDeps): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/api/benchmarks',
      access: benchmarkRoles,
      handler: async (req, res) => {
        res.json(await benchmarks(db, BenchmarkQuery.parse(req.query), req.user?.role))
      },
    },
    {
      method: 'post',
      path: '/api/benchmarks/proposal',
      access: benchmarkRoles,
      handler: async (req, res) => {
        res.json(await proposal(db, ProposalBody.parse(req.body)))
      },
    },
  ]
}

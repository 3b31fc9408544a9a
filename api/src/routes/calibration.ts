import type { Request } from 'express'
import { z } from 'zod'
import {
  ARROW_STREAM_TYPE,
  CalibrationFilters,
  CalibrationSettings,
  GroupQuery,
  MissesQuery,
  QuantityQuery,
  StartingFactorsQuery,
} from '@shared/schemas/calibration'
import type { AppDeps } from '../app'
import { badRequest } from '../errors'
import { calibrationCost, calibrationMisses, calibrationOptions, calibrationSummary, calibrationTrend, pointsBody, startingFactors } from '../services/calibration/answers'
import { getCalibrationSettings, saveCalibrationSettings } from '../services/calibration/settings'
import { toSafeCsv } from '../services/csv-safe'
import { sendCachedJson } from '../middleware/json-body'
import type { RouteSpec } from './route-table'

const analysts = ['principal', 'engineer'] as const

type Query = Record<string, unknown>

/** Splits the query into the endpoint's own keys and the shared filters (strict: an unknown key is a 400 naming it). */
function parseQuery<T extends z.ZodType>(req: Request, own: readonly string[], schema: T): { filters: CalibrationFilters; own: z.infer<T> } {
  const q = req.query as Query
  const mine: Query = {}
  const rest: Query = {}
  for (const [k, v] of Object.entries(q)) (own.includes(k) ? mine : rest)[k] = Array.isArray(v) && own.includes(k) ? v[v.length - 1] : v
  rejectUnknown(rest, Object.keys(CalibrationFilters.shape), own)
  const filters = CalibrationFilters.parse(rest)
  checkRanges(filters)
  return { filters, own: schema.parse(mine) }
}

/** A query key no endpoint knows is a 400 naming it (zod's strict error would not name the field). */
function rejectUnknown(q: Query, known: readonly string[], own: readonly string[] = []) {
  const unknown = Object.keys(q).filter(k => !known.includes(k) && !own.includes(k))
  if (unknown.length) {
    const expected = [...own, ...known].join(', ')
    throw badRequest('Some fields are invalid.', Object.fromEntries(unknown.map(k => [k, `is not a filter here; expected one of ${expected}.`])))
  }
}

/** Ranges must run low to high; the message names the field. */
function checkRanges(f: { yearFrom?: number; yearTo?: number; storiesMin?: number; storiesMax?: number; coreAreaMin?: number; coreAreaMax?: number }) {
  const pairs = [
    ['yearFrom', 'yearTo', 'year'],
    ['storiesMin', 'storiesMax', 'stories'],
    ['coreAreaMin', 'coreAreaMax', 'core area'],
  ] as const
  for (const [lo, hi, what] of pairs) {
    const a = f[lo]
    const b = f[hi]
    if (a !== undefined && b !== undefined && a > b) throw badRequest('Some fields are invalid.', { [hi]: `must be at least ${lo} (${a}); the ${what} range runs low to high.` })
  }
}

const wantsArrow = (req: Request) => (req.get('accept') ?? '').toLowerCase().includes(ARROW_STREAM_TYPE)

export function calibrationRoutes({ db }: AppDeps): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/api/calibration/options',
      access: analysts,
      handler: async (req, res) => {
        rejectUnknown(req.query as Query, Object.keys(CalibrationFilters.shape))
        CalibrationFilters.parse(req.query)
        sendCachedJson(req, res, await calibrationOptions(db))
      },
    },
    {
      method: 'get',
      path: '/api/calibration/points',
      access: analysts,
      handler: async (req, res) => {
        const { filters, own } = parseQuery(req, ['quantity', 'groupBy'], QuantityQuery.extend(GroupQuery.shape))
        const arrow = wantsArrow(req)
        const gzip = req.acceptsEncodings('gzip', 'identity') === 'gzip'
        const { body, etag } = await pointsBody(db, filters, own.quantity, own.groupBy, { arrow, gzip })
        res.vary('Accept').vary('Accept-Encoding')
        res.setHeader('ETag', etag)
        if (req.fresh) {
          res.status(304).end()
          return
        }
        if (gzip) res.setHeader('Content-Encoding', 'gzip')
        res.type(arrow ? ARROW_STREAM_TYPE : 'application/json').send(body)
      },
    },
    {
      method: 'get',
      path: '/api/calibration/summary',
      access: analysts,
      handler: async (req, res) => {
        const { filters, own } = parseQuery(req, ['quantity', 'groupBy'], QuantityQuery.extend(GroupQuery.shape))
        sendCachedJson(req, res, await calibrationSummary(db, filters, own.quantity, own.groupBy))
      },
    },
    {
      method: 'get',
      path: '/api/calibration/trend',
      access: analysts,
      handler: async (req, res) => {
        const { filters, own } = parseQuery(req, ['quantity'], QuantityQuery)
        sendCachedJson(req, res, await calibrationTrend(db, filters, own.quantity))
      },
    },
    {
      method: 'get',
      path: '/api/calibration/cost',
      access: analysts,
      handler: async (req, res) => {
        const { filters } = parseQuery(req, [], z.object({}))
        // A long answer (every project): its JSON and gzip are kept beside the cached answer.
        sendCachedJson(req, res, await calibrationCost(db, filters))
      },
    },
    {
      method: 'get',
      path: '/api/calibration/misses',
      access: analysts,
      handler: async (req, res) => {
        const { filters, own } = parseQuery(req, ['quantity', 'sort', 'dir', 'limit'], QuantityQuery.extend(MissesQuery.shape))
        // The cached list is per quantity, sort and limit, so the body around it is the same for every request sharing it.
        const items = await calibrationMisses(db, filters, own.quantity, own)
        sendCachedJson(req, res, items, () => JSON.stringify({ quantity: own.quantity, items }))
      },
    },
    {
      method: 'get',
      path: '/api/calibration/misses.csv',
      access: analysts,
      handler: async (req, res) => {
        const { filters, own } = parseQuery(req, ['quantity', 'sort', 'dir', 'limit'], QuantityQuery.extend(MissesQuery.shape))
        const items = await calibrationMisses(db, filters, own.quantity, own)
        res.attachment(`calibration-misses-${own.quantity}.csv`).type('text/csv')
        res.send(
          toSafeCsv(
            ['brace_id', 'project_code', 'project_name', 'frame_line', 'level', 'supplier', 'year_designed', 'basis', 'assumed', 'final', 'ratio'],
            items.map(m => [m.braceId, m.projectCode, m.projectName, m.frameLine, m.level, m.supplier, m.yearDesigned, m.basis, m.assumed, m.final, m.ratio]),
          ),
        )
      },
    },
    {
      method: 'get',
      path: '/api/starting-factors',
      access: analysts,
      handler: async (req, res) => {
        rejectUnknown(req.query as Query, Object.keys(StartingFactorsQuery.shape))
        const q = StartingFactorsQuery.parse(req.query)
        checkRanges(q)
        sendCachedJson(req, res, await startingFactors(db, q))
      },
    },
    {
      method: 'get',
      path: '/api/settings/calibration',
      access: ['principal', 'engineer', 'admin'],
      handler: async (_req, res) => {
        res.json(await getCalibrationSettings(db))
      },
    },
    {
      method: 'put',
      path: '/api/settings/calibration',
      access: ['principal', 'admin'],
      handler: async (req, res) => {
        res.json(await saveCalibrationSettings(db, req.user!.id, CalibrationSettings.parse(req.body)))
      },
    },
  ]
}

import { sizeFrame } from '@shared/engineering/size-frame'
import { SaveWorksheetBody, SizingDefaults, WorksheetKind } from '@shared/schemas/settings'
import { SizingRequest } from '@shared/schemas/sizing'
import type { AppDeps } from '../app'
import { getSizingDefaults, saveSizingDefaults } from '../services/settings'
import { getWorksheet, saveWorksheet } from '../services/worksheets'
import type { RouteSpec } from './route-table'

export function sizingRoutes({ db }: AppDeps): RouteSpec[] {
  return [
    {
      method: 'post',
      path: '/api/sizing/frame',
      access: ['engineer', 'principal', 'admin'],
      // Pure computation: the shared engine, the same code the worksheet runs in the browser.
      // An EngineeringInputError becomes a 400 naming the field (error handler).
      handler: (req, res) => {
        res.json(sizeFrame(SizingRequest.parse(req.body)))
      },
    },
    {
      method: 'get',
      path: '/api/settings/sizing',
      access: 'signed-in',
      handler: async (_req, res) => {
        res.json(await getSizingDefaults(db))
      },
    },
    {
      method: 'put',
      path: '/api/settings/sizing',
      access: ['admin', 'principal'],
      handler: async (req, res) => {
        res.json(await saveSizingDefaults(db, req.user!.id, SizingDefaults.parse(req.body)))
      },
    },
    {
      method: 'get',
      path: '/api/worksheets/:kind',
      access: ['engineer', 'principal'],
      handler: async (req, res) => {
        res.json(await getWorksheet(db, req.user!.id, WorksheetKind.parse(req.params.kind)))
      },
    },
    {
      method: 'put',
      path: '/api/worksheets/:kind',
      access: ['engineer', 'principal'],
      handler: async (req, res) => {
        const kind = WorksheetKind.parse(req.params.kind)
        res.json(await saveWorksheet(db, req.user!.id, kind, SaveWorksheetBody.parse(req.body).state))
      },
    },
  ]
}

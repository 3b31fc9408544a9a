import multer from 'multer'
import { CreateDraftBody, ExportQuery, ResolveReviewBody, ReviewItemId, ReviewListQuery, RunId } from '@shared/schemas/imports'
import { SizingRequest } from '@shared/schemas/sizing'
import type { AppDeps } from '../app'
import { createDraftProject } from '../services/drafts'
import { HttpError } from '../errors'
import { exportHistory, templateCsv, templateWorkbook } from '../services/history-export'
import { createUploadRun, replayRun } from '../services/import-uploads'
import { dataQuality, getRun, listProblems, listRuns } from '../services/imports'
import { toSafeCsv } from '../services/csv-safe'
import { listReviewItems, resolveReviewItem } from '../services/reviews'
import type { RouteSpec } from './route-table'
import { TABLE_NAMES } from '@shared/history/columns'
import { z } from 'zod'

/** Largest upload accepted. */
export const MAX_UPLOAD_BYTES = 20 * 1024 * 1024

const importers = ['engineer', 'principal', 'admin'] as const
const reviewers = ['engineer', 'principal'] as const

export function importRoutes({ db, importRunner }: AppDeps): RouteSpec[] {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_UPLOAD_BYTES, files: 1, fields: 5 } }).single('file')
  return [
    {
      method: 'post',
      path: '/api/imports',
      access: importers,
      before: [upload],
      handler: async (req, res) => {
        if (!req.file) throw new HttpError(400, 'VALIDATION_FAILED', 'Attach the file to import as the "file" field.', { file: 'Choose a file.' })
        const runId = await createUploadRun(db, req.user!.id, req.file.originalname, new Uint8Array(req.file.buffer))
        void importRunner.enqueue(runId)
        res.status(202).json(await getRun(db, runId))
      },
    },
    {
      method: 'get',
      path: '/api/imports',
      access: importers,
      handler: async (_req, res) => {
        res.json({ items: await listRuns(db) })
      },
    },
    {
      method: 'get',
      path: '/api/imports/quality',
      access: importers,
      handler: async (_req, res) => {
        res.json(await dataQuality(db))
      },
    },
    {
      method: 'get',
      path: '/api/imports/template.xlsx',
      access: importers,
      handler: async (_req, res) => {
        res.attachment('backsight-history-template.xlsx').type('application/vnd.openxmlformats-officedocument.spreadsheetml.sheet')
        res.send(await templateWorkbook())
      },
    },
    {
      method: 'get',
      path: '/api/imports/templates/:table',
      access: importers,
      handler: (req, res) => {
        const table = z.enum(TABLE_NAMES as [string, ...string[]]).parse(String(req.params.table).replace(/\.csv$/, ''))
        res.attachment(`${table}.csv`).type('text/csv')
        res.send(templateCsv(table))
      },
    },
    {
      method: 'get',
      path: '/api/imports/:runId',
      access: importers,
      handler: async (req, res) => {
        const runId = RunId.parse(req.params.runId)
        res.json({ run: await getRun(db, runId), problems: await listProblems(db, runId) })
      },
    },
    {
      method: 'get',
      path: '/api/imports/:runId/problems.csv',
      access: importers,
      handler: async (req, res) => {
        const runId = RunId.parse(req.params.runId)
        await getRun(db, runId)
        const problems = await listProblems(db, runId, 100_000)
        res.attachment(`import-${runId}-problems.csv`).type('text/csv')
        res.send(
          toSafeCsv(
            ['severity', 'project_code', 'file', 'sheet', 'row', 'column', 'value', 'message'],
            problems.map(p => [p.severity, p.projectCode, p.file, p.sheet, p.row, p.column, p.value, p.message]),
          ),
        )
      },
    },
    {
      method: 'post',
      path: '/api/imports/:runId/replay',
      access: importers,
      handler: async (req, res) => {
        const runId = await replayRun(db, req.user!.id, RunId.parse(req.params.runId))
        void importRunner.enqueue(runId)
        res.status(202).json(await getRun(db, runId))
      },
    },
    {
      method: 'get',
      path: '/api/review-items',
      access: reviewers,
      handler: async (req, res) => {
        res.json({ items: await listReviewItems(db, ReviewListQuery.parse(req.query).status) })
      },
    },
    {
      method: 'post',
      path: '/api/review-items/:itemId/resolve',
      access: reviewers,
      handler: async (req, res) => {
        res.json(await resolveReviewItem(db, req.user!.id, ReviewItemId.parse(req.params.itemId), ResolveReviewBody.parse(req.body)))
      },
    },
    {
      method: 'post',
      path: '/api/projects/drafts',
      access: ['engineer', 'principal'],
      handler: async (req, res) => {
        const body = CreateDraftBody.parse(req.body)
        const request = SizingRequest.parse(body.request)
        res.status(201).json(await createDraftProject(db, req.user!.id, body.name, request))
      },
    },
    {
      method: 'get',
      path: '/api/history/export',
      access: ['engineer', 'principal'],
      handler: async (req, res) => {
        const { format } = ExportQuery.parse(req.query)
        const file = await exportHistory(db, format)
        res.attachment(file.name).type(file.type).send(file.data)
      },
    },
  ]
}

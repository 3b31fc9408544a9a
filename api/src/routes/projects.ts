import { CreateSnapshotBody, PatchProjectBody, ProjectCode, ProjectListQuery, SubmittalCheckQuery } from '@shared/schemas/projects'
import type { AppDeps } from '../app'
import { createSnapshot, patchProject } from '../services/project-edits'
import { getProject, listProjects } from '../services/projects'
import { submittalCheck } from '../services/submittal'
import { submittalCheckCsv } from '../services/submittal-csv'
import { mailIfExceeds } from '../services/submittal-mail'
import type { RouteSpec } from './route-table'

/** Project records area (principal, engineer): `shared/auth/roles.ts` `projects`. Business development gets 403 on all of it. */
const analysts = ['principal', 'engineer'] as const

export function projectRoutes({ db, mailer, config }: AppDeps): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/api/projects',
      access: analysts,
      handler: async (req, res) => {
        res.json(await listProjects(db, ProjectListQuery.parse(req.query)))
      },
    },
    {
      method: 'get',
      path: '/api/projects/:code',
      access: analysts,
      handler: async (req, res) => {
        res.json(await getProject(db, ProjectCode.parse(req.params.code)))
      },
    },
    {
      method: 'get',
      path: '/api/projects/:code/submittal-check',
      access: analysts,
      handler: async (req, res) => {
        res.json(await submittalCheck(db, ProjectCode.parse(req.params.code), SubmittalCheckQuery.parse(req.query)))
      },
    },
    {
      method: 'get',
      path: '/api/projects/:code/submittal-check.csv',
      access: analysts,
      handler: async (req, res) => {
        const check = await submittalCheck(db, ProjectCode.parse(req.params.code), SubmittalCheckQuery.parse(req.query))
        const name = `${check.code}-submittal-check${check.phase ? `-${check.phase}-rev${check.revision}` : ''}.csv`.replace(/[^A-Za-z0-9._-]/g, '_')
        // The byte-order mark lets spreadsheet programs read the file as UTF-8 (², β, ω, ±).
        res.attachment(name).type('text/csv').send('\uFEFF' + submittalCheckCsv(check, new Date().toISOString()))
      },
    },
    {
      method: 'patch',
      path: '/api/projects/:code',
      access: analysts,
      handler: async (req, res) => {
        const code = ProjectCode.parse(req.params.code)
        res.json(await patchProject(db, req.user!.id, code, PatchProjectBody.parse(req.body)))
      },
    },
    {
      method: 'post',
      path: '/api/projects/:code/snapshots',
      access: analysts,
      handler: async (req, res) => {
        const code = ProjectCode.parse(req.params.code)
        const body = CreateSnapshotBody.parse(req.body)
        const created = await createSnapshot(db, req.user!.id, code, body)
        res.status(201).json(created)
        // After answering: a submittal that exceeds the design is mailed to the principals and the recorder.
        const key = { code, frameLine: body.frameLine, level: body.level, phase: body.phase, revision: created.snapshot.revision, actorId: req.user!.id }
        mailIfExceeds(db, mailer, config.publicUrl, key).catch(err => req.log?.error({ err }, 'submittal exceedance mail failed'))
      },
    },
  ]
}

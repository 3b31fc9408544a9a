import { CreateSnapshotBody, PatchProjectBody, ProjectCode, ProjectListQuery, SubmittalCheckQuery } from '@shared/schemas/projects'
import type { AppDeps } from '../app'
import { createSnapshot, patchProject } from '../services/project-edits'
import { getProject, listProjects } from '../services/projects'
import { submittalCheck } from '../services/submittal'
import type { RouteSpec } from './route-table'

/** Project records area (principal, engineer): `shared/auth/roles.ts` `projects`. Business development gets 403 on all of it. */
const analysts = ['principal', 'engineer'] as const

export function projectRoutes({ db }: AppDeps): RouteSpec[] {
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
        res.status(201).json(await createSnapshot(db, req.user!.id, code, CreateSnapshotBody.parse(req.body)))
      },
    },
  ]
}

import { eq } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { projects } from '../../api/src/db/history-schema'
import { runImport } from '../../etl/src/run'
import { validProject } from '../etl/bundle-builder'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'
import { workbookOf } from '../helpers/history-files'

// An edit racing an import, by the documented rule (docs/import-format.md, "Edits and imports"):
// an edit carries the version it was made on and gets a 409 when an import changed the project
// meanwhile; an import never silently overwrites a change made in Backsight — it refuses that
// project with its reason until the file carries the change, or it is run with --replace-edits.

let t: TestApp
const CODE = 'ER-001'
const file = async (name: string) => {
  const tables = validProject(CODE) as Record<string, Record<string, unknown>[]>
  tables.projects![0]!.name = name
  return [{ file: 'er.xlsx', data: new Uint8Array(await workbookOf(tables as never)) }]
}
const stored = async () => (await t.db.db.select().from(projects).where(eq(projects.code, CODE)))[0]!

beforeAll(async () => {
  t = await createTestApp()
  await runImport(t.db.db, await file('From the file'), { source: 'cli' })
})
afterAll(() => t.close())

describe('an edit racing an import', () => {
  it('refuses an edit made on a version an import has since replaced (409), storing nothing', async () => {
    const e = await signedIn(t.app, 'engineer@example.com')
    const opened = (await e.agent.get(`/api/projects/${CODE}`).expect(200)).body.project.updatedAt as string
    // The import lands while the form is open.
    await runImport(t.db.db, await file('From the file, revised'), { source: 'cli' })
    const res = await e.agent.patch(`/api/projects/${CODE}`).set('x-csrf-token', e.csrf).send({ office: 'North', expectedUpdatedAt: opened })
    expect(res.status).toBe(409)
    expect(res.body.error.message).toMatch(/changed after you opened it/)
    expect((await stored()).office).not.toBe('North')
    // On the current version the same edit goes through.
    const now = (await e.agent.get(`/api/projects/${CODE}`).expect(200)).body.project.updatedAt as string
    await e.agent.patch(`/api/projects/${CODE}`).set('x-csrf-token', e.csrf).send({ office: 'North', expectedUpdatedAt: now }).expect(200)
    expect((await stored()).office).toBe('North')
    expect((await stored()).editedAt).not.toBeNull()
  })

  it('keeps the edit when a changed file arrives afterwards: that project is refused with its reason', async () => {
    const summary = await runImport(t.db.db, await file('From the file, third version'), { source: 'cli' })
    expect(summary.rejected).toBe(1)
    expect(summary.problems.find(p => p.projectCode === CODE && p.severity === 'error')!.message).toMatch(/changed in Backsight on .* after its last import.*--replace-edits/)
    expect(await stored()).toMatchObject({ office: 'North', name: 'From the file, revised' })
  })

  it('changes nothing when the same file comes again (unchanged content), and lets the file win only when told to', async () => {
    const same = await runImport(t.db.db, await file('From the file, revised'), { source: 'cli' })
    expect(same.unchanged).toBe(1)
    expect((await stored()).office).toBe('North')
    const forced = await runImport(t.db.db, await file('From the file, third version'), { source: 'cli', replaceEdited: true })
    expect(forced.updated).toBe(1)
    expect(await stored()).toMatchObject({ name: 'From the file, third version', editedAt: null })
  })
})

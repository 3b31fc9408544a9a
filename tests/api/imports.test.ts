import { and, eq } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { braceSnapshots, projects, reviewItems } from '../../api/src/db/history-schema'
import { auditLog } from '../../api/src/db/schema'
import { createTestApp, signedIn, type TestApp } from '../helpers/app'
import { workbookOf } from '../helpers/history-files'
import { waitForMail } from '../helpers/mail'
import { validProject } from '../etl/bundle-builder'
import { readInputs, runImport } from '../../etl/src/run'
import { historyTables } from '../../api/src/services/history-export'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'

let t: TestApp
let engineer: Awaited<ReturnType<typeof signedIn>>
beforeAll(async () => {
  t = await createTestApp()
  engineer = await signedIn(t.app, 'engineer@example.com')
})
afterAll(async () => t.close())

async function upload(name: string, data: Buffer) {
  return engineer.agent.post('/api/imports').set('x-csrf-token', engineer.csrf).attach('file', data, name)
}

async function waitForRun(runId: number) {
  for (let i = 0; i < 150; i++) {
    const res = await engineer.agent.get(`/api/imports/${runId}`)
    if (res.body.run.status === 'finished' || res.body.run.status === 'failed') return res.body
    await new Promise(r => setTimeout(r, 100))
  }
  throw new Error(`run ${runId} did not finish`)
}

describe('POST /api/imports', () => {
  it('loads an uploaded workbook in a loader process, reports progress and counts, and mails the principals', async () => {
    const tables = validProject('UP-001')
    // Final β and ω above the assumed 1.1 and 1.4: an unconservative assumption the e-mail must list.
    Object.assign(tables.brace_values[1]!, { beta: 1.18, omega: 1.5 })
    const after = Date.now()
    const res = await upload('history.xlsx', await workbookOf(tables))
    expect(res.status).toBe(202)
    expect(res.body.status).toBe('queued')
    const detail = await waitForRun(res.body.id)
    expect(detail.run).toMatchObject({ status: 'finished', loaded: 1, rejected: 0, fileName: 'history.xlsx', hasOriginal: true })
    expect((await t.db.db.select().from(projects).where(eq(projects.code, 'UP-001'))).length).toBe(1)
    const mail = await waitForMail('principal@example.com', { after })
    // AISC 341-16 F4.2a: assumed Cmax = 1.1 · 1.4 · 46 · 6.5 = 460.46 kip; final = 1.18 · 1.5 · 42.5 · 6.5 = 488.96 kip → +6.2 %
    expect(mail.text).toMatch(/UP-001: 1 brace group\(s\); worst frame A L2 \+6.2 % \(β 1.10 → 1.18, ω 1.40 → 1.50, Cmax 460 → 489 kip\)/)
  })

  it('explains rejects row by row, and offers them as a CSV with formula injection neutralised', async () => {
    const tables = validProject('=HYPERLINK("x")')
    tables.levels[1]!.story_height = 'thirteen'
    const res = await upload('bad.xlsx', await workbookOf(tables))
    const detail = await waitForRun(res.body.id)
    expect(detail.run.rejected).toBe(1)
    const p = detail.problems.find((x: { column: string }) => x.column === 'story_height')
    expect(p).toMatchObject({ severity: 'error', sheet: 'levels', row: 3, value: 'thirteen' })
    expect(p.message).toMatch(/story_height must be a number/)
    const csv = await engineer.agent.get(`/api/imports/${res.body.id}/problems.csv`).expect(200)
    expect(csv.text).toContain(`'=HYPERLINK`)
    expect(csv.text).not.toMatch(/(^|,)=HYPERLINK/m)
    expect(await t.db.db.select().from(projects).where(eq(projects.code, '=HYPERLINK("x")'))).toEqual([])
  })

  it('refuses an executable renamed .xlsx, judged by its content', async () => {
    const exe = Buffer.concat([Buffer.from('MZ\x90\x00\x03\x00\x00\x00', 'binary'), Buffer.alloc(2000, 0)])
    const res = await upload('payroll.xlsx', exe)
    expect(res.status).toBe(400)
    expect(res.body.error.message).toMatch(/judged by its content/)
  })

  it('answers 413 for a file over the upload limit', async () => {
    const res = await upload('huge.csv', Buffer.alloc(21 * 1024 * 1024, 0x61))
    expect(res.status).toBe(413)
    expect(res.body.error.code).toBe('PAYLOAD_TOO_LARGE')
  })

  it('replays a run from its kept original: the second run changes nothing', async () => {
    const res = await upload('again.xlsx', await workbookOf(validProject('UP-002')))
    await waitForRun(res.body.id)
    const replay = await engineer.agent.post(`/api/imports/${res.body.id}/replay`).set('x-csrf-token', engineer.csrf).send({})
    expect(replay.status).toBe(202)
    const detail = await waitForRun(replay.body.id)
    expect(detail.run).toMatchObject({ loaded: 0, updated: 0, unchanged: 1 })
  })
})

describe('review queue', () => {
  it('queues a likely unit slip, and a correction recomputes the adjusted strengths, confirms the value and is audited', async () => {
    const tables = validProject('RV-001')
    tables.brace_values[1]!.fysc = 4.25 // 42.5 ksi typed with a decimal slip
    const res = await upload('slip.xlsx', await workbookOf(tables))
    const detail = await waitForRun(res.body.id)
    expect(detail.run.queued).toBe(1)
    const list = await engineer.agent.get('/api/review-items').expect(200)
    const item = list.body.items.find((i: { projectCode: string }) => i.projectCode === 'RV-001')
    expect(item).toMatchObject({ field: 'fysc', value: '4.25', location: { frameLine: 'A', level: 'L2', phase: 'coupon', revision: 0 } })
    expect(item.reason).toMatch(/decimal slip/)

    const fixed = await engineer.agent.post(`/api/review-items/${item.id}/resolve`).set('x-csrf-token', engineer.csrf).send({ action: 'correct', value: 42.5 })
    expect(fixed.status).toBe(200)
    expect(fixed.body.status).toBe('corrected')
    const [row] = await t.db.db.select().from(reviewItems).where(eq(reviewItems.id, item.id))
    const [snap] = await t.db.db.select().from(braceSnapshots).where(eq(braceSnapshots.id, row!.snapshotId!))
    // AISC 341-16 F4.2a, coupon basis (no Ry): Tmax = ω·Fysc·Asc = 1.45 · 42.5 · 6.5 = 400.5625 kip
    expect(snap).toMatchObject({ fyscKsi: 42.5, confirmed: true })
    expect(snap!.adjustedTensionKip).toBeCloseTo(400.5625, 9)
    const audit = await t.db.db.select().from(auditLog).where(and(eq(auditLog.entity, 'review_item'), eq(auditLog.entityId, String(item.id))))
    expect(audit[0]!.detail).toMatchObject({ action: 'correct', from: 4.25, to: 42.5 })

    const again = await engineer.agent.post(`/api/review-items/${item.id}/resolve`).set('x-csrf-token', engineer.csrf).send({ action: 'confirm' })
    expect(again.status).toBe(409)
  })
})

describe('GET /api/history/export', () => {
  it.each(['xlsx', 'json', 'csv', 'arrow'] as const)('round-trips losslessly as %s: importing the export changes nothing', async format => {
    const res = await engineer.agent.get(`/api/history/export?format=${format}`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = []
      r.on('data', (c: Buffer) => chunks.push(c))
      r.on('end', () => cb(null, Buffer.concat(chunks)))
    })
    expect(res.status).toBe(200)
    const dir = mkdtempSync(join(tmpdir(), 'backsight-export-'))
    const files: string[] = []
    if (format === 'xlsx' || format === 'json') {
      files.push(join(dir, `export.${format}`))
      writeFileSync(files[0]!, res.body as Buffer)
    } else {
      const JSZip = (await import('jszip')).default
      const zip = await JSZip.loadAsync(res.body as Buffer)
      for (const name of Object.keys(zip.files)) {
        const path = join(dir, name)
        writeFileSync(path, await zip.file(name)!.async('nodebuffer'))
        files.push(path)
      }
    }
    const before = await historyTables(t.db.db)
    const summary = await runImport(t.db.db, await readInputs(files), { source: 'cli' })
    expect(summary.problems.filter(p => p.severity === 'error').map(p => `${p.file} ${p.sheet} ${p.row} ${p.column}: ${p.message}`)).toEqual([])
    expect(summary).toMatchObject({ loaded: 0, rejected: 0 })
    // A project corrected in the review queue since its import differs from its import, so it may be
    // rewritten once ("updated"); what is stored must be exactly what was exported.
    expect(await historyTables(t.db.db)).toEqual(before)
    expect(summary.unchanged + summary.updated).toBe(before.projects.length)
  })
})

describe('GET /api/imports/template.xlsx', () => {
  it('offers a workbook template with every table', async () => {
    const res = await engineer.agent.get('/api/imports/template.xlsx').buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = []
      r.on('data', (c: Buffer) => chunks.push(c))
      r.on('end', () => cb(null, Buffer.concat(chunks)))
    })
    expect(res.status).toBe(200)
    const ExcelJS = (await import('exceljs')).default
    const wb = new ExcelJS.Workbook()
    await wb.xlsx.load(res.body as unknown as ArrayBuffer)
    expect(wb.worksheets.map(w => w.name)).toEqual(['about', 'suppliers', 'projects', 'frames', 'levels', 'braces', 'brace_values', 'tonnage'])
    expect(wb.getWorksheet('levels')!.getRow(1).values).toContain('story_height [in]')
  })
})

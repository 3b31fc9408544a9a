import { join } from 'node:path'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { runImport } from '../../etl/src/run'
import { validProject } from '../etl/bundle-builder'
import { DEMO_PASSWORD } from '../helpers/app'
import { workbookOf } from '../helpers/history-files'
import { ARTIFACTS, signInAs, startHarness, type Harness } from './harness'

// Right after a data change the server may answer from the version before while it builds the new
// one (ANSWER_GRACE_MS): the screen says its figures are catching up, and updates by itself once
// the new version is built. The build is held up here by locking the tables it reads.

let h: Harness
const load = async (code: string) => runImport(h.t.db.db, [{ file: `${code}.xlsx`, data: new Uint8Array(await workbookOf(validProject(code) as never)) }], { source: 'cli' })

beforeAll(async () => {
  h = await startHarness({ ANSWER_GRACE_MS: '20' })
  await load('CU-001')
  await load('CU-002')
}, 120_000)
afterAll(async () => h?.close())

describe('figures catching up after a data change, in Chromium', () => {
  it('shows the notice while answers come from the version before, then the new figures without it', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'principal@example.com', DEMO_PASSWORD)
    await page.goto(`${h.baseUrl}/calibration`)
    // "N braces match these filters · …" once the answers are in ("Counting braces…" before).
    const matching = async () => Number(/^([\d,]+) brace/.exec(await page.locator('[data-test=pair-count]').innerText())?.[1]?.replace(/,/g, '') ?? Number.NaN)
    await expect.poll(matching, { timeout: 15_000 }).toBeGreaterThan(0)
    const before = await matching()
    expect(await page.locator('[data-test=catching-up]').count()).toBe(0)

    await load('CU-003')
    const blocker = new pg.Client({ connectionString: h.t.db.url })
    await blocker.connect()
    try {
      await blocker.query('begin')
      await blocker.query('lock table calibration_pairs, projects in access exclusive mode')
      await page.reload()
      await page.locator('[data-test=catching-up]').waitFor({ timeout: 15_000 })
      expect(await page.locator('[data-test=catching-up]').innerText()).toMatch(/from just before a data change/)
      await expect.poll(matching, { timeout: 15_000 }).toBe(before)
      await page.screenshot({ path: join(ARTIFACTS, 'calibration-catching-up.png') })
    } finally {
      await blocker.query('commit').catch(() => {})
      await blocker.end()
    }
    // No reload here: the screen asks again by itself and the notice goes.
    await expect.poll(matching, { timeout: 20_000 }).toBeGreaterThan(before)
    await expect.poll(() => page.locator('[data-test=catching-up]').count(), { timeout: 20_000 }).toBe(0)
    expect(h.problems).toEqual([])
  })
})

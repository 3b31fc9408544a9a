/// <reference lib="dom" />
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import type { Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_PASSWORD } from '../helpers/app'
import { workbookOf } from '../helpers/history-files'
import { validProject } from '../etl/bundle-builder'
import { ARTIFACTS, signInAs, startHarness, type Harness } from './harness'

let h: Harness
beforeAll(async () => {
  h = await startHarness()
})
afterAll(async () => h?.close())

/** Three invented projects in one workbook: one clean, one with an unreadable story height, one with a decimal slip. */
async function historyWorkbook(): Promise<Buffer> {
  const ok = validProject('IMP-OK')
  const bad = validProject('IMP-BAD')
  const slip = validProject('IMP-SLIP')
  bad.levels[1]!.story_height = 'thirteen' // sheet levels, row 5: header row 1, IMP-OK on rows 2–3, IMP-BAD's L2 on 4 and Roof on 5
  slip.brace_values[1]!.fysc = 4.25 // the coupon Fysc of L2: 42.5 ksi typed with a decimal slip
  const parts = [ok, bad, slip]
  const tables: Record<string, Record<string, string | number | boolean | null>[]> = {}
  for (const name of Object.keys(ok)) {
    // One supplier row: every project names SUP-A.
    tables[name] = name === 'suppliers' ? ok.suppliers! : parts.flatMap(p => p[name]!)
  }
  return workbookOf(tables as Parameters<typeof workbookOf>[0])
}

const count = (page: Page, key: string) => page.locator(`[data-test=run-detail] [data-test=count-${key}]`).innerText()
const tab = (page: Page, label: string | RegExp) => page.locator('.n-tabs-tab', { hasText: label }).click()

describe('Imports in Chromium', () => {
  it('uploads a workbook, shows the loader’s result and problems, offers the rejects as CSV, and takes a correction in the review queue', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'engineer@example.com', DEMO_PASSWORD)
    await page.locator('nav[aria-label=Main]').getByText('Imports', { exact: true }).click()
    await page.waitForURL('**/imports')
    await page.locator('[data-test=drop-zone]').waitFor()

    await page.setInputFiles('[data-test=import-file]', {
      name: 'history-test.xlsx',
      mimeType: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
      buffer: await historyWorkbook(),
    })
    // The loader runs in its own process: allow it a while.
    await page.locator('[data-test=run-detail] [data-test=run-counts]').waitFor({ timeout: 45_000 })
    // A project whose value waits for review is still loaded: IMP-OK and IMP-SLIP are new, IMP-BAD is not.
    expect(await count(page, 'loaded')).toBe('2')
    expect(await count(page, 'updated')).toBe('0')
    expect(await count(page, 'unchanged')).toBe('0')
    expect(await count(page, 'rejected')).toBe('1')
    expect(await count(page, 'queued')).toBe('1')
    expect(await page.locator('[data-test=severity-legend]').innerText()).toMatch(/the project was not loaded/)

    // The reject names its sheet, row, column and value.
    const reject = page.locator('[data-test=problem-row][data-severity=error]', { hasText: 'story_height' })
    expect(await reject.count()).toBe(1)
    expect((await reject.locator('td').allInnerTexts()).map(s => s.trim())).toEqual([
      'Error',
      'IMP-BAD',
      'history-test.xlsx',
      'levels',
      '5',
      'story_height',
      'thirteen',
      'story_height must be a number.',
    ])
    const review = page.locator('[data-test=problem-row][data-severity=review]')
    expect(await review.count()).toBe(1)
    expect(await review.innerText()).toMatch(/IMP-SLIP[\s\S]*fysc[\s\S]*4\.25[\s\S]*decimal slip/)
    await page.setViewportSize({ width: 1360, height: 1300 })
    await page.screenshot({ path: join(ARTIFACTS, 'imports.png') })
    await page.setViewportSize({ width: 1360, height: 860 })

    // The rejects as CSV, through the browser's download.
    const [download] = await Promise.all([page.waitForEvent('download'), page.click('[data-test=run-detail] [data-test=download-problems]')])
    expect(download.suggestedFilename()).toMatch(/^import-\d+-problems\.csv$/)
    const csv = readFileSync((await download.path())!, 'utf8')
    expect(csv.split(/\r?\n/)[0]).toBe('severity,project_code,file,sheet,row,column,value,message')
    expect(csv).toMatch(/^error,IMP-BAD,history-test\.xlsx,levels,5,story_height,thirteen,story_height must be a number\.$/m)
    expect(csv).toMatch(/^review,IMP-SLIP,.*fysc,4\.25,.*decimal slip/m)

    // The review queue: correct the slipped Fysc to 42.5 ksi; the item leaves the open list.
    await page.click('[data-test=go-review]')
    const item = page.locator('[data-test=review-row][data-project=IMP-SLIP][data-field=fysc]')
    await item.waitFor()
    expect(await page.locator('[data-test=review-row]').count()).toBe(1)
    expect(await item.innerText()).toMatch(/Frame A · L2 · coupon[\s\S]*4\.25 ksi[\s\S]*decimal slip/)
    await item.locator('[data-test=review-correct]').click()
    const modal = page.locator('.n-modal')
    expect(await modal.innerText()).toMatch(/ksi for stresses/)
    await modal.locator('[data-test=correct-value]').fill('42.5')
    await page.screenshot({ path: join(ARTIFACTS, 'imports-correct.png') })
    await modal.locator('[data-test=correct-save]').click()
    await page.getByText('IMP-SLIP fysc corrected to 42.5 ksi.').waitFor()
    await item.waitFor({ state: 'detached' })
    await page.locator('[data-test=review-empty]').waitFor()
    // Under "Corrected" it is listed with its new status.
    await page.locator('[data-test=review-filter] .n-radio-button', { hasText: 'Corrected' }).click()
    await item.waitFor()
    expect(await item.getAttribute('data-status')).toBe('corrected')

    // Data quality: two projects stored, nothing waiting; each has a final value for one of its two braces.
    await tab(page, 'Data quality')
    await expect.poll(() => page.locator('[data-test=quality-projects]').innerText()).toBe('2')
    expect(await page.locator('[data-test=quality-awaiting]').innerText()).toBe('0')
    expect(await page.locator('[data-test=quality-without-finals]').innerText()).toBe('0')
    const completeness = page.locator('[data-test=completeness] tbody tr')
    expect(await completeness.count()).toBe(2)
    expect(await completeness.first().innerText()).toMatch(/IMP-OK[\s\S]*2[\s\S]*1[\s\S]*50 %/)
    await page.screenshot({ path: join(ARTIFACTS, 'imports-quality.png') })

    // Run history: the run is listed; selecting it shows the same problems; "Run again" loads the kept original.
    await tab(page, 'Run history')
    const run = page.locator('[data-test=run-row]', { hasText: 'history-test.xlsx' })
    await run.waitFor()
    expect(await run.innerText()).toMatch(/Finished/)
    await run.click()
    await page.locator('[data-test=run-detail] [data-test=problems-table]').waitFor()
    const firstRunId = await page.locator('[data-test=run-detail]').getAttribute('data-run')
    expect(await page.locator('[data-test=run-detail] [data-test=problem-row][data-severity=error]').count()).toBeGreaterThanOrEqual(1)
    await page.screenshot({ path: join(ARTIFACTS, 'imports-history.png') })
    await page.click('[data-test=run-detail] [data-test=replay]')
    await page.locator(`[data-test=run-detail]:not([data-run="${firstRunId}"]) [data-test=run-counts]`).waitFor({ timeout: 45_000 })
    // Both stored projects are already there; IMP-BAD is still unreadable.
    expect(await count(page, 'loaded')).toBe('0')
    expect(await count(page, 'rejected')).toBe('1')

    // Templates and export.
    await tab(page, 'Templates and export')
    expect(await page.locator('.templates').innerText()).toContain('story_shear [kN]')
    const [template] = await Promise.all([page.waitForEvent('download'), page.click('[data-test=template-csv-levels]')])
    expect(template.suggestedFilename()).toBe('levels.csv')
    expect(readFileSync((await template.path())!, 'utf8')).toContain('story_height')
    const [exported] = await Promise.all([page.waitForEvent('download'), page.click('[data-test=export-json]')])
    expect(JSON.stringify(JSON.parse(readFileSync((await exported.path())!, 'utf8')))).toContain('IMP-SLIP')
    await page.screenshot({ path: join(ARTIFACTS, 'imports-templates.png') })

    expect(h.problems).toEqual([])
    await page.close()
  })

  it('tells an administrator why the review queue and the export are not theirs, without asking the API for them', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'admin@example.com', DEMO_PASSWORD)
    await page.goto(`${h.baseUrl}/imports?tab=review`)
    expect(await page.locator('[data-test=review-not-for-role]').innerText()).toMatch(/only engineers and principals confirm, correct or discard/)
    expect(await page.locator('[data-test=review-table]').count()).toBe(0)
    await tab(page, 'Templates and export')
    expect(await page.locator('[data-test=export-not-for-role]').innerText()).toMatch(/for engineers and principals/)
    expect(await page.locator('[data-test=export-json]').count()).toBe(0)
    await tab(page, 'Run history')
    await page.locator('[data-test=run-row]').first().waitFor()
    expect(h.problems).toEqual([])
    await page.close()
  })
})

/// <reference lib="dom" />
// page.evaluate() callbacks run in the browser, hence the DOM types.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import type { Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { PrecedentSearchResponse } from '@shared/schemas/precedents'
import { projects } from '../../api/src/db/history-schema'
import { expandPaths } from '../../etl/src/paths'
import { readInputs, runImport } from '../../etl/src/run'
import { DEMO_PASSWORD } from '../helpers/app'
import { ARTIFACTS, signInAs, startHarness, type Harness } from './harness'

let h: Harness
let names: { code: string; name: string; client: string | null; clientConfidential: boolean }[]
beforeAll(async () => {
  h = await startHarness()
  // The harness starts without history: load the invented demo firm through the real loader.
  await runImport(h.t.db.db, await readInputs(await expandPaths(['demo-data'])), { source: 'cli' })
  names = await h.t.db.db.select({ code: projects.code, name: projects.name, client: projects.client, clientConfidential: projects.clientConfidential }).from(projects)
}, 240_000)
afterAll(async () => h?.close())

const tall = async (page: Page, file: string, height = 2000) => {
  await page.setViewportSize({ width: 1360, height })
  await page.screenshot({ path: join(ARTIFACTS, file) })
  await page.setViewportSize({ width: 1360, height: 860 })
}

/** No project of the history is named on the page: no code, name or client. */
async function expectNoProjectNamed(page: Page) {
  const text = await page.locator('main, body').first().innerText()
  const leaks = names.flatMap(p => [p.code, p.name, p.client ?? ''].filter(s => s.length >= 4 && text.includes(s)))
  expect(leaks).toEqual([])
}

describe('Precedents, benchmarks and the overview in Chromium', () => {
  it('lets an engineer find a precedent and start a New frame worksheet from it', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'engineer@example.com', DEMO_PASSWORD)
    await page.locator('nav[aria-label=Main]').getByText('Precedents', { exact: true }).click()
    await page.waitForURL('**/precedents')
    expect(await page.getByRole('note').first().innerText()).toMatch(/Preliminary design aid[\s\S]*engineer of record decides/)
    await page.fill('[data-test=pf-shear]', '400')
    await page.fill('[data-test=pf-stories]', '4')
    await page.fill('[data-test=pf-height]', '14')
    await page.locator('[data-test=pf-height]').blur()
    // Weights are sliders a keyboard can reach and move.
    await page.getByText('How much each feature counts').click()
    const slider = page.locator('[data-test=weight-bayWidth] [role=slider]').first()
    await slider.focus()
    await page.keyboard.press('ArrowLeft')
    await page.keyboard.press('ArrowLeft')
    await expect.poll(() => page.locator('#w-bayWidth').innerText()).toBe('Bay width: 0')

    const [answer] = await Promise.all([page.waitForResponse(r => r.url().endsWith('/api/precedents/search') && r.status() === 200), page.click('[data-test=pf-search]')])
    const search = PrecedentSearchResponse.parse(await answer.json())
    expect(search.matches.length).toBeGreaterThan(3)
    expect(search.weights.bayWidth).toBe(0)
    await page.locator('[data-test=match-row]').first().waitFor()
    expect(await page.locator('[data-test=match-row]').count()).toBe(search.matches.length)
    // Each match explains its score: a bar per match, as an image with a text alternative.
    const bar = page.locator('[data-test=match-row] svg[data-test=breakdown-bar]').first()
    expect(await bar.getAttribute('role')).toBe('img')
    expect(await bar.getAttribute('aria-label')).toMatch(/^Similarity \d+ %\./)
    // The top three side by side, each linking to its project record.
    expect(await page.locator('[data-test=compare-col]').count()).toBe(3)
    const top = search.matches[0]!
    expect(await page.locator('[data-test=match-link]').first().getAttribute('href')).toBe(`/projects/${encodeURIComponent(top.code)}`)
    await tall(page, 'precedents.png', 2200)

    await page.locator('[data-test=start-from]').first().click()
    await page.waitForURL('**/new-frame')
    await page.locator('[data-test=prefill-notice]').waitFor()
    expect(await page.locator('[data-test=prefill-notice]').innerText()).toContain(`precedent ${top.code}, frame line ${top.frameLine}`)
    const levels = [...top.levels].sort((a, b) => a.levelIndex - b.levelIndex)
    // The worksheet holds the precedent's stories, bottom first, with their shears (kip) and heights (in → ft) (float noise dropped: within 1e-6 relative).
    await expect.poll(() => page.locator('[data-test=levels-table] tbody tr').count()).toBe(levels.length)
    for (let i = 0; i < levels.length; i++) {
      expect(Number(await page.inputValue(`[data-test=level-shear-${i}]`))).toBeCloseTo(levels[i]!.storyShearKip, 2)
      expect(Number(await page.inputValue(`[data-test=level-height-${i}]`))).toBeCloseTo(levels[i]!.storyHeightIn / 12, 3)
      expect(await page.inputValue(`[data-test=level-name-${i}]`)).toBe(levels[i]!.level)
    }
    expect(Number(await page.inputValue('[data-test=bay-width]'))).toBeCloseTo(top.bayWidthIn / 12, 3)
    await tall(page, 'precedent-worksheet.png', 1400)
    expect(h.problems).toEqual([])
    await page.close()
  })

  it('lets business development make a proposal sheet and download its PDF, naming no project', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'bd@example.com', DEMO_PASSWORD)
    await page.locator('nav[aria-label=Main]').getByText('Benchmarks', { exact: true }).click()
    await page.waitForURL('**/benchmarks')
    await page.locator('svg[data-test=band-chart]').waitFor()
    expect(await page.locator('svg[data-test=band-chart]').getAttribute('role')).toBe('img')
    expect(await page.locator('svg[data-test=band-chart]').getAttribute('aria-label')).toMatch(/Lateral-system steel per floor area \(lb\/ft²\)/)
    expect(await page.locator('[data-test=band-table] tbody tr').count()).toBeGreaterThan(2)
    await page.click('[data-test=bm-group]')
    await page.locator('.n-base-select-option', { hasText: 'Region' }).click()
    await page.waitForURL(/groupBy=region/)
    await expect.poll(() => page.locator('[data-test=band-table] caption').innerText()).toMatch(/by region/)
    await expectNoProjectNamed(page)
    await tall(page, 'benchmarks-bd.png', 2000)

    await page.locator('.n-tabs-tab', { hasText: 'Proposal sheet' }).click()
    await page.fill('[data-test=pp-stories]', '6')
    await page.fill('[data-test=pp-area]', '120000')
    await page.locator('[data-test=pp-area]').blur()
    await page.click('[data-test=pp-make]')
    await page.locator('[data-test=proposal-sheet]').waitFor()
    expect(await page.locator('[data-test=proposal-sheet]').innerText()).toMatch(/Preliminary design aid[\s\S]*engineer of record decides/)
    expect(await page.locator('[data-test=pp-expected] tbody tr').count()).toBeGreaterThanOrEqual(1)
    expect(await page.locator('[data-test=pp-expected]').innerText()).toMatch(/\d[\d,.]* tons/)
    await expectNoProjectNamed(page)
    await tall(page, 'proposal-sheet.png', 1600)
    await page.emulateMedia({ media: 'print' })
    await page.screenshot({ path: join(ARTIFACTS, 'proposal-sheet-print.png'), fullPage: true })
    expect(await page.locator('nav[aria-label=Main]').isVisible()).toBe(false)
    await page.emulateMedia({ media: 'screen' })

    const [download] = await Promise.all([page.waitForEvent('download'), page.click('[data-test=pp-pdf]')])
    expect(download.suggestedFilename()).toBe('tonnage-benchmark-office-6-stories.pdf')
    const bytes = readFileSync((await download.path())!)
    expect(bytes.subarray(0, 4).toString('latin1')).toBe('%PDF')
    const [csv] = await Promise.all([page.waitForEvent('download'), page.click('[data-test=pp-csv]')])
    expect(readFileSync((await csv.path())!, 'utf8')).toMatch(/expected tonnage,Lateral-system steel,tons/)
    expect(h.problems).toEqual([])
    await page.close()
  })

  it('shows each role an overview whose figures all link to the screen that explains them', async () => {
    for (const role of ['principal', 'engineer', 'bd'] as const) {
      const page = await h.context.newPage()
      await signInAs(page, h.baseUrl, `${role}@example.com`, DEMO_PASSWORD)
      await page.waitForURL('**/overview')
      await page.locator('[data-test=overview] .n-card').first().waitFor()
      const sections = { principal: ['ov-calibration', 'ov-work', 'ov-coverage'], engineer: ['ov-work'], bd: ['ov-coverage'] }[role]
      for (const s of ['ov-calibration', 'ov-work', 'ov-coverage']) expect(await page.locator(`[data-test=${s}]`).count()).toBe(sections.includes(s) ? 1 : 0)
      // Every headline figure is a link into the app.
      const figures = page.locator('[data-test=overview] a.figure')
      expect(await figures.count()).toBeGreaterThan(0)
      for (const href of await figures.evaluateAll(els => els.map(e => e.getAttribute('href')))) expect(href).toMatch(/^\/(calibration|imports|projects|benchmarks)/)
      if (role === 'bd') await expectNoProjectNamed(page)
      await tall(page, `overview-${role}.png`, 1500)
      // Following a figure opens its screen.
      const first = figures.first()
      const target = (await first.getAttribute('href'))!.split(/[?#]/)[0]!
      await first.click()
      await page.waitForURL(`**${target}*`)
      await page.close()
    }
    expect(h.problems).toEqual([])
  })
})

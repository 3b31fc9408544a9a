/// <reference lib="dom" />
// page.evaluate() callbacks run in the browser, hence the DOM types.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import type { Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { StartingFactors } from '@shared/schemas/calibration'
import { expandPaths } from '../../etl/src/paths'
import { readInputs, runImport } from '../../etl/src/run'
import { DEMO_PASSWORD } from '../helpers/app'
import { ARTIFACTS, signInAs, startHarness, type Harness } from './harness'

let h: Harness
beforeAll(async () => {
  h = await startHarness()
  // The harness starts without history: load the invented demo firm through the real loader.
  await runImport(h.t.db.db, await readInputs(await expandPaths(['demo-data'])), { source: 'cli' })
}, 240_000)
afterAll(async () => h?.close())

const matchCount = async (page: Page) => Number(/^([\d,]+) brace/.exec(await page.locator('[data-test=pair-count]').innerText())?.[1]?.replace(/,/g, '') ?? Number.NaN)

describe('Calibration review in Chromium', () => {
  it('lets a principal filter every chart by supplier, keeps the filter in the URL, and download the largest misses as CSV', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'principal@example.com', DEMO_PASSWORD)
    await page.locator('nav[aria-label=Main]').getByText('Calibration review', { exact: true }).click()
    await page.waitForURL('**/calibration')
    expect(await page.getByRole('note').first().innerText()).toMatch(/Preliminary design aid/)
    await expect.poll(() => matchCount(page), { timeout: 30_000 }).toBeGreaterThan(0)
    const allBraces = await matchCount(page)
    await page.locator('[data-test=scatter-card] [data-test=legend] li').first().waitFor()
    const groupsBefore = await page.locator('[data-test=scatter-card] [data-test=legend] li').count()
    // The demo firm has four invented suppliers, grouped by supplier by default.
    expect(groupsBefore).toBe(4)
    // Each chart is an image with a summary for screen readers.
    expect(await page.locator('svg[data-test=scatter]').getAttribute('role')).toBe('img')
    expect(await page.locator('svg[data-test=scatter]').getAttribute('aria-label')).toContain(`for ${allBraces} braces in 4 groups`)
    await page.locator('svg[data-test=distribution]').waitFor()
    await page.locator('svg[data-test=trend-chart]').waitFor()
    await page.locator('[data-test=cost-method]').waitFor()
    // Thousands of braces: the points are drawn on a canvas.
    expect(allBraces).toBeGreaterThan(3000)
    expect(await page.locator('[data-test=scatter-card] .scatter').getAttribute('data-renderer')).toBe('canvas')
    await page.setViewportSize({ width: 1360, height: 3200 })
    await page.screenshot({ path: join(ARTIFACTS, 'calibration-all.png') })
    await page.setViewportSize({ width: 1360, height: 860 })
    // The canvas scatter still exports as SVG: every brace becomes a circle.
    const [allSvg] = await Promise.all([page.waitForEvent('download'), page.click('[data-test=scatter-card-svg]')])
    expect((readFileSync((await allSvg.path())!, 'utf8').match(/<circle /g) ?? []).length).toBeGreaterThanOrEqual(allBraces)

    // One supplier: the counts, the legend and the URL follow.
    await page.click('[data-test=filter-supplier]')
    const option = page.locator('.n-base-select-option').first()
    const supplierName = (await option.innerText()).trim()
    await option.click()
    await page.keyboard.press('Escape')
    await page.waitForURL(/supplier=SUP-/)
    await expect.poll(() => matchCount(page), { timeout: 20_000 }).toBeLessThan(allBraces)
    const oneSupplier = await matchCount(page)
    expect(oneSupplier).toBeGreaterThan(0)
    await expect.poll(() => page.locator('[data-test=scatter-card] [data-test=legend] li').count()).toBe(1)
    expect(supplierName).toContain(await page.locator('[data-test=scatter-card] [data-test=legend] li').first().innerText().then(t => t.replace(/\s*\(\d+\)$/, '')))
    expect(await page.locator('[data-test=distribution-table] tbody tr').count()).toBeGreaterThanOrEqual(1)
    const code = new URL(page.url()).searchParams.get('supplier')!

    // Largest misses: the table and its CSV under the same filters.
    await page.locator('[data-test=misses-table] [data-test=miss-row]').first().waitFor()
    const [csvDownload] = await Promise.all([page.waitForEvent('download'), page.click('[data-test=misses-csv]')])
    expect(csvDownload.suggestedFilename()).toBe('calibration-misses-cmax.csv')
    const csv = readFileSync((await csvDownload.path())!, 'utf8').replace(/^\uFEFF/, '')
    const lines = csv.split(/\r?\n/).filter(Boolean)
    expect(lines[0]).toBe('brace_id,project_code,project_name,frame_line,level,supplier,year_designed,basis,assumed,final,ratio')
    expect(lines.length).toBeGreaterThan(1)
    // Every row is of the chosen supplier.
    expect(lines.slice(1).every(l => l.includes(`,${code},`))).toBe(true)

    // A bookmarked address opens the same view.
    await page.goto(`${h.baseUrl}/calibration?supplier=${encodeURIComponent(code)}&quantity=beta`)
    await expect.poll(() => matchCount(page), { timeout: 20_000 }).toBeGreaterThan(0)
    expect(await page.locator('[data-test=scatter-card] [data-test=legend] li').count()).toBe(1)
    expect(await page.locator('[data-test=scatter-card] .chart-title').innerText()).toContain('β')
    expect(await page.locator('[data-test=quantity-picker]').innerText()).toContain('β (compression strength adjustment)')

    // Hovering a brace names it.
    const renderer = await page.locator('[data-test=scatter-card] .scatter').getAttribute('data-renderer')
    if (renderer === 'svg') {
      // Points overlap, so move the mouse to one rather than hovering an element.
      const box = (await page.locator('svg[data-test=scatter] circle.point').first().boundingBox())!
      await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2)
      await expect.poll(() => page.locator('[data-test=scatter-tooltip]').innerText(), { timeout: 5_000 }).toMatch(/Frame .+ · level .+/)
    }

    // The scatter exports as SVG with its points as circles.
    const [svgDownload] = await Promise.all([page.waitForEvent('download'), page.click('[data-test=scatter-card-svg]')])
    const svgText = readFileSync((await svgDownload.path())!, 'utf8')
    expect(svgText.startsWith('<?xml')).toBe(true)
    expect(svgText).toContain('xmlns="http://www.w3.org/2000/svg"')
    expect((svgText.match(/<circle /g) ?? []).length).toBeGreaterThanOrEqual(oneSupplier)
    const [pngDownload] = await Promise.all([page.waitForEvent('download'), page.click('[data-test=distribution-card-png]')])
    // PNG signature (ISO/IEC 15948 §5.2): 89 50 4E 47 0D 0A 1A 0A
    expect(readFileSync((await pngDownload.path())!).subarray(0, 8).toString('hex')).toBe('89504e470d0a1a0a')

    await page.setViewportSize({ width: 1360, height: 3200 })
    await page.screenshot({ path: join(ARTIFACTS, 'calibration-supplier.png') })
    await page.setViewportSize({ width: 1360, height: 860 })
    expect(h.problems).toEqual([])
    await page.close()
  })

  it('lets an engineer get starting factors and carry them into the New frame worksheet', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'engineer@example.com', DEMO_PASSWORD)
    await page.locator('nav[aria-label=Main]').getByText('Starting factors', { exact: true }).click()
    await page.waitForURL('**/starting-factors')
    await page.click('[data-test=sf-suggest]')
    await page.locator('[data-test=suggestion-beta] [data-test=suggested]').waitFor({ timeout: 30_000 })
    for (const q of ['beta', 'omega', 'overstrength', 'stiffness']) await page.locator(`[data-test=suggestion-${q}]`).waitFor()
    expect(await page.locator('[data-test=cautions]').innerText()).toMatch(/engineer of record/i)
    // What the API suggested for "supplier not yet chosen, 90th percentile", read independently of the screen.
    const answer = StartingFactors.parse(await page.evaluate(async () => (await fetch('/api/starting-factors?quantile=0.9')).json()))
    // One suggestion per basis; the screen starts from the largest comparable group (then the newer AISC 341 edition).
    const edition = (b: string) => Number(/341-(\d{2})/.exec(b)?.[1] ?? 0)
    const suggested = (q: string) =>
      answer.suggestions.filter(s => s.quantity === q).sort((a, b) => b.groupSize - a.groupSize || edition(b.basis) - edition(a.basis))[0]!.suggested
    expect(await page.locator('[data-test=suggestion-beta] [data-test=suggested]').innerText()).toBe(suggested('beta').toFixed(2))
    await page.setViewportSize({ width: 1360, height: 2400 })
    await page.screenshot({ path: join(ARTIFACTS, 'starting-factors.png') })
    await page.setViewportSize({ width: 1360, height: 860 })

    await page.click('[data-test=sf-use]')
    await page.waitForURL('**/new-frame')
    await page.locator('[data-test=prefill-notice]').waitFor()
    expect(await page.locator('[data-test=prefill-notice]').innerText()).toMatch(/Starting factors applied from the 90th percentile of all suppliers’ braces/)
    // Rounded to three decimals on the way (1.1347 → 1.135).
    const round3 = (v: number) => String(Math.round(v * 1000) / 1000)
    await expect.poll(() => page.locator('.new-frame [data-test=beta]').inputValue(), { timeout: 10_000 }).toBe(round3(suggested('beta')))
    expect(await page.locator('.new-frame [data-test=omega]').inputValue()).toBe(round3(suggested('omega')))
    expect(await page.locator('.new-frame [data-test=stiffness-factor]').inputValue()).toBe(round3(suggested('stiffness')))
    // Fysc,max from the chosen expected-yield suggestion, to 0.1 ksi.
    expect(await page.locator('.new-frame [data-test=fysc-max]').inputValue()).toBe(String(Math.round(suggested('overstrength') * 10) / 10))
    await page.screenshot({ path: join(ARTIFACTS, 'starting-factors-applied.png') })

    // Applied once: after a reload the notice is gone and the saved worksheet keeps the values.
    await expect.poll(() => page.locator('[data-test=save-status]').innerText(), { timeout: 10_000 }).toMatch(/^Saved/)
    await page.reload()
    await page.locator('.new-frame [data-test=beta]').waitFor()
    await expect.poll(() => page.locator('.new-frame [data-test=beta]').inputValue(), { timeout: 10_000 }).toBe(round3(suggested('beta')))
    expect(await page.locator('[data-test=prefill-notice]').count()).toBe(0)
    expect(h.problems).toEqual([])
    await page.close()
  })
})

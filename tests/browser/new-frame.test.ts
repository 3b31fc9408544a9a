/// <reference lib="dom" />
// page.evaluate() callbacks run in the browser, hence the DOM types.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import type { Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_PASSWORD } from '../helpers/app'
import { ARTIFACTS, signInAs, startHarness, type Harness } from './harness'

let h: Harness
beforeAll(async () => {
  h = await startHarness()
})
afterAll(async () => h?.close())

const cell = (page: Page, story: number, field: string) => page.locator(`[data-test=result-row-${story}] [data-field=${field}]`)

async function waitForSaved(page: Page) {
  await expect.poll(() => page.locator('[data-test=save-status]').innerText(), { timeout: 10_000 }).toMatch(/^Saved/)
}

describe('New frame worksheet in Chromium', () => {
  it('sizes a three-story chevron frame as the engineer types, draws it, checks it on the server, exports it and keeps it across a reload', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'engineer@example.com', DEMO_PASSWORD)
    await page.locator('nav[aria-label=Main]').getByText('New frame', { exact: true }).click()
    await page.waitForURL('**/new-frame')
    await page.locator('[data-test=bay-width]').waitFor()
    // The standing caution is on the screen.
    expect(await page.getByRole('note').first().innerText()).toMatch(/Preliminary design aid/)

    // Our own invented frame: 3 stories, inverted-V (chevron), 28 ft bays, 2 braced bays.
    await page.fill('[data-test=frame-label]', '=Grid 7 test frame')
    await page.click('[data-test=configuration]')
    await page.locator('.n-base-select-option', { hasText: 'Inverted-V (chevron)' }).click()
    await page.fill('[data-test=bay-width]', '28')
    await page.fill('[data-test=braced-bays]', '2')
    await page.locator('[data-test=braced-bays]').blur()
    await page.fill('[data-test=level-height-0]', '15')
    await page.fill('[data-test=level-height-1]', '13')
    await page.fill('[data-test=level-height-2]', '13')
    // Shears through "paste a column from a spreadsheet" (bottom story first).
    await page.click('[data-test=paste-open]')
    await page.click('[data-test=paste-target-shear]')
    await page.fill('[data-test=paste-text]', '260\n190\n105\n')
    await page.click('[data-test=paste-apply]')
    expect(await page.locator('[data-test=paste-note]').innerText()).toContain('3 values written to story shears')
    expect(await page.locator('[data-test=level-shear-2]').inputValue()).toBe('105')
    // Sizing basis: LRFD with Fysc,min = 38 ksi (the firm default, entered again so the test does not depend on it).
    await page.fill('[data-test=fysc-min]', '38')

    // Hand check of story 1 (derived: statics; AISC 341 F4.5b for the LRFD core area):
    //   brace projection = 28/2 = 14 ft, h = 15 ft, Lwp = √(14² + 15²) = √421 = 20.518 ft, cos θ = 14/20.518 = 0.68232
    //   n = 2 braces per bay × 2 bays = 4
    //   Pu = V/(n cos θ) = 260/(4 × 0.68232) = 95.26 kip
    //   Asc,req = Pu/(0.9 × Fysc,min) = 95.26/(0.9 × 38) = 95.26/34.2 = 2.785 in² → shown as 2.79
    //   chosen core: next 0.25 in² step above 2.785 = 3.00 in² (default increment table, common practice)
    await expect.poll(() => cell(page, 0, 'requiredCoreArea').innerText(), { timeout: 5_000 }).toBe('2.79')
    expect(await cell(page, 0, 'braceAxialDemand').innerText()).toBe('95.3')
    expect(await cell(page, 0, 'coreArea').innerText()).toBe('3.00')
    // Story 3: Pu = 105/(4 × 0.73274) = 35.82 kip (cos θ = 14/√(14² + 13²) = 0.73274); Asc,req = 35.82/34.2 = 1.047 in² → 1.25 in².
    expect(await cell(page, 2, 'requiredCoreArea').innerText()).toBe('1.05')
    expect(await cell(page, 2, 'coreArea').innerText()).toBe('1.25')
    // Column headers carry the units from the result's own units map.
    const headers = await page.locator('[data-test=results-table] thead th').allInnerTexts()
    expect(headers.join(' | ')).toMatch(/Asc,req\s*in²/)
    expect(headers.join(' | ')).toMatch(/Pu\s*kip/)

    // Elevation: 3 stories × 2 bays × 2 braces = 12 brace lines; each brace of story 1 labelled 3.00.
    const svg = page.locator('svg[data-test=elevation]')
    expect(await svg.getAttribute('role')).toBe('img')
    expect(await svg.locator('line.brace').count()).toBe(12)
    expect(await svg.locator('line.column').count()).toBe(9) // 3 column lines × 3 stories
    expect(await svg.locator('text.brace-label', { hasText: '3.00' }).count()).toBe(4)
    expect(await svg.locator('.level-labels text').allTextContents()).toEqual(['L1', 'L2', 'L3'])

    // The server's authoritative result agrees with the browser's.
    await page.click('[data-test=server-check]')
    await expect.poll(() => page.locator('[data-test=server-check-status]').innerText(), { timeout: 10_000 }).toBe('Server result matches.')

    // CSV export: cautions in the header block, one row per story, formula injection neutralised.
    const [download] = await Promise.all([page.waitForEvent('download'), page.click('[data-test=export-csv]')])
    expect(download.suggestedFilename()).toMatch(/^grid-7-test-frame-\d{4}-\d{2}-\d{2}\.csv$/)
    const csv = readFileSync((await download.path())!, 'utf8')
    expect(csv).toContain('This is a preliminary design aid, not for construction.')
    expect(csv).toContain('The engineer of record decides')
    expect(csv).toMatch(/selected brace supplier’s qualified values/)
    expect(csv).toContain('governing code and edition')
    expect(csv).toContain("Frame,'=Grid 7 test frame,")
    expect(csv).toContain('Server check,matches')
    expect(csv).toContain('"Asc,req (in²)"')
    const rows = csv.split('\r\n').filter(l => /^L[123],/.test(l))
    expect(rows).toHaveLength(3)
    expect(rows[0]).toMatch(/^L1,15,260,/)
    expect(rows[0]).toContain(',2.7854814,3,') // Asc,req and Asc of story 1 (hand check above)

    // Today's frame becomes a draft project of the history.
    await page.click('[data-test=save-draft]')
    await page.getByText(/Saved as draft project DRAFT-\d{4}-001/).waitFor()

    // The app scrolls inside its layout, so a tall viewport shows the whole worksheet.
    await page.setViewportSize({ width: 1360, height: 2000 })
    await page.screenshot({ path: join(ARTIFACTS, 'new-frame.png') })
    await page.emulateMedia({ media: 'print' })
    await page.screenshot({ path: join(ARTIFACTS, 'new-frame-print.png'), fullPage: true })
    expect(await page.locator('[data-test=print-inputs]').isVisible()).toBe(true)
    expect(await page.locator('[data-test=bay-width]').isVisible()).toBe(false)
    expect(await page.locator('[data-test=cautions]').innerText()).toContain('The engineer of record decides')
    await page.emulateMedia({ media: 'screen' })
    await page.setViewportSize({ width: 1360, height: 860 })

    // The worksheet is kept on the server: after a reload it comes back as it was.
    await waitForSaved(page)
    await page.reload()
    await page.locator('[data-test=bay-width]').waitFor()
    await expect.poll(() => page.locator('[data-test=bay-width]').inputValue(), { timeout: 5_000 }).toBe('28')
    expect(await page.locator('[data-test=braced-bays]').inputValue()).toBe('2')
    expect(await page.locator('[data-test=level-shear-0]').inputValue()).toBe('260')
    expect(await page.locator('[data-test=frame-label]').inputValue()).toBe('=Grid 7 test frame')
    await expect.poll(() => cell(page, 0, 'coreArea').innerText(), { timeout: 5_000 }).toBe('3.00')
    expect(await page.locator('svg[data-test=elevation] line.brace').count()).toBe(12)

    // Switching to SI converts the form, so the physical frame (and its cores) stay the same.
    await page.locator('.n-radio-button', { hasText: 'SI' }).click()
    await expect.poll(() => page.locator('[data-test=bay-width]').inputValue(), { timeout: 5_000 }).toBe('8.5344') // 28 ft × 0.3048
    expect(await page.locator('[data-test=level-height-0]').inputValue()).toBe('4.572') // 15 ft
    // 3.00 in² × 645.16 = 1,935.48 mm², shown to the nearest mm²
    await expect.poll(() => cell(page, 0, 'coreArea').innerText(), { timeout: 5_000 }).toBe('1,935')
    expect((await page.locator('[data-test=results-table] thead th').allInnerTexts()).join(' ')).toMatch(/Asc\s*mm²/)
    await page.locator('.n-radio-button', { hasText: 'US' }).click()
    await expect.poll(() => page.locator('[data-test=bay-width]').inputValue(), { timeout: 5_000 }).toBe('28')
    expect(await page.locator('[data-test=level-shear-0]').inputValue()).toBe('260')

    // An invalid story height is flagged beside its input and the results wait for it.
    await page.fill('[data-test=level-height-1]', '0')
    await expect.poll(() => page.locator('[data-test=level-row-1] small.error').innerText(), { timeout: 5_000 }).toMatch(/greater than 0/)
    expect(await page.locator('[data-test=results-table]').count()).toBe(0)
    await page.fill('[data-test=level-height-1]', '13')
    await expect.poll(() => cell(page, 1, 'coreArea').innerText(), { timeout: 5_000 }).toBe('2.00')
    await waitForSaved(page)

    expect(h.problems).toEqual([])
    await page.close()
  })

  it('lets a principal open the firm defaults from the worksheet', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'principal@example.com', DEMO_PASSWORD)
    await page.goto(`${h.baseUrl}/new-frame`)
    await page.click('[data-test=firm-defaults-open]')
    const form = page.locator('.n-drawer [data-test=sizing-defaults-form]')
    await form.locator('[data-test=defaults-fysc-min]').waitFor()
    // The built-in firm defaults: Fysc,min 38 ksi, ±10 % stiffness band (shared/schemas/settings.ts).
    expect(await form.locator('[data-test=defaults-fysc-min]').inputValue()).toBe('38')
    expect(await form.locator('[data-test=defaults-tolerance]').inputValue()).toBe('10')
    await form.locator('[data-test=defaults-beta]').fill('1.15')
    await page.screenshot({ path: join(ARTIFACTS, 'new-frame-defaults.png') })
    await form.locator('[data-test=defaults-save]').click()
    await page.getByText('Firm defaults saved').waitFor()
    // A fresh worksheet for this principal starts from the saved β.
    await page.keyboard.press('Escape')
    await page.click('[data-test=reset-defaults]')
    await page.locator('.n-dialog').getByRole('button', { name: 'Reset' }).click()
    await expect.poll(() => page.locator('.new-frame [data-test=beta]').inputValue(), { timeout: 5_000 }).toBe('1.15')
    expect(h.problems).toEqual([])
    await page.close()
  })

  it('shows the firm defaults in the admin’s Firm settings tab', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'admin@example.com', DEMO_PASSWORD)
    await page.goto(`${h.baseUrl}/admin?tab=settings`)
    const form = page.locator('[data-test=sizing-defaults-form]')
    await form.locator('[data-test=defaults-beta]').waitFor()
    // β = 1.15 as the principal saved it in the test above.
    expect(await form.locator('[data-test=defaults-beta]').inputValue()).toBe('1.15')
    await form.locator('[data-test=defaults-beta]').fill('')
    await form.locator('[data-test=defaults-save]').click()
    await expect.poll(() => form.locator('.n-form-item-feedback--error').count()).toBeGreaterThan(0)
    await page.screenshot({ path: join(ARTIFACTS, 'admin-firm-settings.png'), fullPage: true })
    expect(h.problems).toEqual([])
    await page.close()
  })

  it('does not show the firm defaults to an engineer', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'engineer@example.com', DEMO_PASSWORD)
    await page.goto(`${h.baseUrl}/new-frame`)
    await page.locator('[data-test=bay-width]').waitFor()
    expect(await page.locator('[data-test=firm-defaults-open]').count()).toBe(0)
    await page.close()
  })
})

/// <reference lib="dom" />
// page.evaluate() callbacks run in the browser, hence the DOM types.
import { join } from 'node:path'
import type { Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { runImport } from '../../etl/src/run'
import { validProject } from '../etl/bundle-builder'
import { DEMO_PASSWORD } from '../helpers/app'
import { workbookOf } from '../helpers/history-files'
import { ARTIFACTS, startHarness, type Harness } from './harness'

// Keyboard-only use of the main flows (WCAG 2.1 SC 2.1.1 Keyboard, 2.4.7 Focus visible): only Tab, Shift+Tab,
// typing, arrow keys, Enter and Space; no clicks, no fill(), no focus() calls.

let h: Harness
beforeAll(async () => {
  h = await startHarness()
  // One invented project whose coupon Fysc of L2 was typed with a decimal slip (4.25 for 42.5 ksi): the loader queues it for review.
  const p = validProject('KBD-001')
  p.brace_values![1]!.fysc = 4.25
  await runImport(h.t.db.db, [{ file: 'keyboard.xlsx', data: new Uint8Array(await workbookOf(p as Parameters<typeof workbookOf>[0])) }], { source: 'cli' })
}, 120_000)
afterAll(async () => h?.close())

/** A short description of the focused element, for failure messages. */
const focused = (page: Page) =>
  page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null
    if (!el || el === document.body) return 'body'
    return `${el.tagName.toLowerCase()}${el.getAttribute('data-test') ? `[data-test=${el.getAttribute('data-test')}]` : ''}${el.getAttribute('name') ? `[name=${el.getAttribute('name')}]` : ''} "${(el.getAttribute('aria-label') ?? el.innerText ?? '').trim().slice(0, 40)}"`
  })

/** Presses Tab (or Shift+Tab) until the focused element matches `test` (run in the page); fails listing the stops. */
async function tabTo(page: Page, test: string, { max = 80, back = false } = {}) {
  const stops: string[] = []
  for (let i = 0; i < max; i++) {
    await page.keyboard.press(back ? 'Shift+Tab' : 'Tab')
    if (await page.evaluate(t => new Function('el', `return (${t})(el)`)(document.activeElement), test)) return
    stops.push(await focused(page))
  }
  throw new Error(`Tab never reached ${test}; stops: ${stops.join(' → ')}`)
}

/** The focused element shows a focus indicator: an outline, or naive-ui's focus border/box-shadow on its input. */
async function expectFocusVisible(page: Page) {
  const ring = await page.evaluate(() => {
    const el = document.activeElement as HTMLElement
    const s = getComputedStyle(el)
    const wrap = el.closest('.n-input, .n-input-number, .n-base-selection')
    const ws = wrap ? getComputedStyle(wrap.querySelector('.n-input__state-border, .n-base-selection__state-border') ?? wrap) : undefined
    return {
      outline: s.outlineStyle !== 'none' && parseFloat(s.outlineWidth) >= 1,
      wrapped: !!wrap && !!ws && ws.boxShadow !== 'none',
      what: el.outerHTML.slice(0, 120),
    }
  })
  expect(ring.outline || ring.wrapped, `no focus indicator on ${ring.what}`).toBe(true)
}

const is = {
  email: `el => el?.name === 'email'`,
  navLink: (label: string) => `el => el?.tagName === 'A' && !!el.closest('nav[aria-label=Main]') && el.textContent.trim() === ${JSON.stringify(label)}`,
  dataTest: (v: string) => `el => el?.getAttribute('data-test') === ${JSON.stringify(v)}`,
  tab: (label: string) => `el => el?.getAttribute('role') === 'tab' && el.textContent.trim().startsWith(${JSON.stringify(label)})`,
}

const cell = (page: Page, story: number, field: string) => page.locator(`[data-test=result-row-${story}] [data-field=${field}]`).innerText()

describe('Keyboard-only use in Chromium', () => {
  it('signs in, reaches the navigation, and sizes a frame in the New frame worksheet with the keyboard alone', async () => {
    const page = await h.context.newPage()
    await page.goto(`${h.baseUrl}/sign-in`)
    await page.locator('input[name=email]').waitFor()
    await tabTo(page, is.email)
    await expectFocusVisible(page)
    await page.keyboard.type('engineer@example.com')
    await page.keyboard.press('Tab')
    expect(await page.evaluate(() => (document.activeElement as HTMLInputElement).name)).toBe('password')
    await page.keyboard.type(DEMO_PASSWORD)
    await page.keyboard.press('Enter')
    await page.waitForSelector('nav[aria-label=Main]')
    await page.waitForURL('**/overview')

    // The first Tab stop is the skip link, shown when focused; the navigation comes next.
    await page.keyboard.press('Tab')
    expect(await focused(page)).toMatch(/^a "Skip to content"/)
    expect(await page.locator('.skip-link').boundingBox().then(b => (b?.y ?? -1) >= 0)).toBe(true)
    await tabTo(page, is.navLink('New frame'))
    await expectFocusVisible(page)
    await page.keyboard.press('Enter')
    await page.waitForURL('**/new-frame')
    await page.locator('[data-test=bay-width]').waitFor()

    // A fresh worksheet: bay width and the three stories' heights and shears, typed field by field.
    await tabTo(page, is.dataTest('bay-width'))
    await expectFocusVisible(page)
    await page.keyboard.type('28')
    const typeInto = async (dataTest: string, text: string) => {
      await tabTo(page, is.dataTest(dataTest))
      await page.keyboard.type(text)
    }
    await typeInto('level-height-0', '15')
    await typeInto('level-shear-0', '260')
    await typeInto('level-height-1', '13')
    await typeInto('level-shear-1', '190')
    await typeInto('level-height-2', '13')
    await typeInto('level-shear-2', '105')
    await page.keyboard.press('Tab')
    await expect.poll(() => cell(page, 0, 'requiredCoreArea'), { timeout: 10_000 }).toMatch(/^\d+\.\d\d$/)
    const before = Number(await cell(page, 0, 'requiredCoreArea'))
    const pu = Number(await cell(page, 0, 'braceAxialDemand'))

    // Change story 1's shear from 260 to 130 kip with the keyboard (Shift+Tab back to it, select all, type).
    // Statics and AISC 341-16 F4.5b: Pu = V/(n cos θ) and Asc,req = Pu/(0.9 Fysc,min), both proportional to V, so halving V halves both.
    await tabTo(page, is.dataTest('level-shear-0'), { back: true })
    await expectFocusVisible(page)
    await page.keyboard.press('Control+A')
    await page.keyboard.type('130')
    await page.keyboard.press('Tab')
    await expect.poll(async () => Number(await cell(page, 0, 'braceAxialDemand')), { timeout: 10_000 }).toBeCloseTo(pu / 2, 1)
    // Shown to 0.01 in²: half of the rounded value is within 0.01 of the rounded half.
    expect(Math.abs(Number(await cell(page, 0, 'requiredCoreArea')) - before / 2)).toBeLessThanOrEqual(0.01)
    expect(await page.locator('[data-test=level-shear-0]').inputValue()).toBe('130')
    expect(h.problems).toEqual([])
    await page.close()
  })

  it('imports a history file, then reaches the Imports review queue and confirms a flagged value with the keyboard alone', async () => {
    const page = await h.context.newPage()
    await page.context().clearCookies()
    await page.goto(`${h.baseUrl}/sign-in`)
    await page.locator('input[name=email]').waitFor()
    await tabTo(page, is.email)
    await page.keyboard.type('principal@example.com')
    await page.keyboard.press('Tab')
    await page.keyboard.type(DEMO_PASSWORD)
    await page.keyboard.press('Enter')
    await page.waitForURL('**/overview')

    await tabTo(page, is.navLink('Imports'))
    await page.keyboard.press('Enter')
    await page.waitForURL('**/imports')
    await page.locator('[data-test=drop-zone]').waitFor()

    // Import: Tab to the file picker (its focus shows on the whole drop zone), Space opens the browser's file chooser.
    await tabTo(page, is.dataTest('import-file'))
    const zoneRing = await page.locator('[data-test=drop-zone]').evaluate(el => {
      const s = getComputedStyle(el)
      return s.outlineStyle !== 'none' && parseFloat(s.outlineWidth) >= 1
    })
    expect(zoneRing, 'the drop zone shows the file picker’s keyboard focus').toBe(true)
    await page.screenshot({ path: join(ARTIFACTS, 'keyboard-import-focus.png') })
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.keyboard.press('Space')])
    // The operating system's dialog is outside the app: the test hands the chosen file to the browser.
    await chooser.setFiles({ name: 'keyboard-upload.xlsx', mimeType: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet', buffer: await workbookOf(validProject('KBD-002') as Parameters<typeof workbookOf>[0]) })
    await page.locator('[data-test=run-detail] [data-test=run-counts]').waitFor({ timeout: 45_000 })
    expect(await page.locator('[data-test=run-detail] [data-test=count-loaded]').innerText()).toBe('1')
    expect(await page.locator('[data-test=run-detail] [data-test=count-rejected]').innerText()).toBe('0')

    // The tabs follow the WAI-ARIA tabs pattern: the selected tab is the one Tab stop, arrow keys move between tabs.
    await tabTo(page, is.tab('Upload'), { back: true })
    await expectFocusVisible(page)
    expect(await page.locator('[role=tablist] [role=tab]').count()).toBe(5)
    await page.keyboard.press('ArrowRight')
    await page.keyboard.press('ArrowRight')
    await page.waitForURL(/tab=review/)
    expect(await focused(page)).toMatch(/Review queue/)
    expect(await page.locator('[role=tab][aria-selected=true]').innerText()).toMatch(/^Review queue/)

    const item = page.locator('[data-test=review-row][data-project=KBD-001][data-field=fysc]')
    await item.waitFor()
    await tabTo(page, `el => el?.getAttribute('data-test') === 'review-confirm' && !!el.closest('[data-project="KBD-001"]')`)
    await expectFocusVisible(page)
    await page.keyboard.press('Enter')
    await page.getByText('KBD-001 fysc confirmed as written.').waitFor()
    await item.waitFor({ state: 'detached' })
    await page.locator('[data-test=review-empty]').waitFor()
    // The server agrees: nothing left open.
    const open = await page.evaluate(async () => (await fetch('/api/review-items?status=open')).json())
    expect(JSON.stringify(open)).not.toContain('KBD-001')
    expect(h.problems).toEqual([])
    await page.close()
  })
})

/// <reference lib="dom" />
// page.evaluate() callbacks run in the browser, hence the DOM types.
import type { Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { runImport } from '../../etl/src/run'
import { validProject } from '../etl/bundle-builder'
import { DEMO_PASSWORD } from '../helpers/app'
import { workbookOf } from '../helpers/history-files'
import { signInAs, startHarness, type Harness } from './harness'

// Stored XSS (OWASP "Cross Site Scripting Prevention Cheat Sheet": output encoding for HTML contexts): text from
// an imported workbook reaches the page only as text. Each payload would set window.__xss if it ran as markup.
const IMG = '<img src=x onerror="window.__xss=1">'
const SCRIPT = '"><script>window.__xss=2</script>'
const JS_URL = 'javascript:alert(1)//<svg onload="window.__xss=3">'

let h: Harness
beforeAll(async () => {
  h = await startHarness()
  // Three invented finished projects whose name, client and office carry the payloads (rotated, so each field
  // carries each payload once); XSS-3's coupon Fysc is a decimal slip (4.25 for 42.5 ksi) so it waits for review.
  const payloads = [IMG, SCRIPT, JS_URL]
  const parts = [1, 2, 3].map(i => {
    const p = validProject(`XSS-${i}`)
    Object.assign(p.projects![0]!, {
      name: payloads[(i - 1) % 3],
      client: payloads[i % 3],
      client_confidential: false,
      office: payloads[(i + 1) % 3],
    })
    return p
  })
  parts[2]!.brace_values![1]!.fysc = 4.25
  // XSS-1 and XSS-2 come back stronger than assumed, so they are among the largest misses:
  // assumed Cmax = β·ω·Fysc,max·Asc = 1.1 × 1.4 × 46 × 6.5 = 460.5 kip; final = 1.12 × 1.45 × 48 × 6.5 = 506.7 kip (AISC 341-16 F4.2a).
  parts[0]!.brace_values![1]!.fysc = 48
  parts[1]!.brace_values![1]!.fysc = 48
  const tables: Record<string, Record<string, string | number | boolean | null>[]> = {}
  for (const name of Object.keys(parts[0]!)) tables[name] = name === 'suppliers' ? parts[0]!.suppliers! : parts.flatMap(p => p[name]!)
  const summary = await runImport(h.t.db.db, [{ file: 'hostile.xlsx', data: new Uint8Array(await workbookOf(tables as Parameters<typeof workbookOf>[0])) }], { source: 'cli' })
  // All three stored (the loader does not reject text for looking like markup).
  expect(summary.loaded).toBe(3)
}, 120_000)
afterAll(async () => h?.close())

/** Nothing ran, no element came from the payloads, and no link points at javascript:. */
async function expectInert(page: Page, screen: string) {
  const state = await page.evaluate(() => ({
    xss: (window as unknown as { __xss?: unknown }).__xss,
    injected: document.querySelectorAll('#app img[src=x], #app script, #app [onerror], #app [onload]').length,
    jsLinks: Array.from(document.querySelectorAll('a[href]')).filter(a => /^\s*javascript:/i.test(a.getAttribute('href') ?? '')).length,
  }))
  expect(state, screen).toEqual({ xss: undefined, injected: 0, jsLinks: 0 })
}

/** Each payload appears on the screen as the literal text it is. */
async function expectLiteral(page: Page, screen: string, payloads: string[], where = '#app') {
  const text = await page.locator(where).first().innerText()
  for (const p of payloads) expect(text, `${screen} shows ${p} literally`).toContain(p)
}

describe('Stored XSS in Chromium', () => {
  it('shows hostile project names, clients and offices as text on every screen that renders them', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'principal@example.com', DEMO_PASSWORD)

    // Project list: name and client columns.
    await page.goto(`${h.baseUrl}/projects`)
    await page.locator('[data-test=project-row][data-code=XSS-1]').waitFor()
    await expectLiteral(page, 'project list', [IMG, SCRIPT, JS_URL])
    await expectInert(page, 'project list')

    // Project page: title, client and office.
    for (const i of [1, 2, 3]) {
      await page.goto(`${h.baseUrl}/projects/XSS-${i}`)
      await page.locator('[data-test=frame-record]').first().waitFor()
      await expectLiteral(page, `project XSS-${i}`, [IMG, SCRIPT, JS_URL])
      await expectInert(page, `project XSS-${i}`)
    }

    // Calibration review: the scatter's tooltip on hover and the largest-misses table.
    await page.goto(`${h.baseUrl}/calibration`)
    await page.locator('[data-test=misses-table] [data-test=miss-row]').first().waitFor({ timeout: 30_000 })
    await expectLiteral(page, 'calibration misses', [IMG, SCRIPT], '[data-test=misses-table]')
    expect(await page.locator('[data-test=scatter-card] .scatter').getAttribute('data-renderer')).toBe('svg')
    const points = page.locator('svg[data-test=scatter] circle.point')
    expect(await points.count()).toBeGreaterThan(0)
    const seen = new Set<string>()
    for (let i = 0; i < (await points.count()); i++) {
      const box = (await points.nth(i).boundingBox())!
      await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2)
      const tip = page.locator('[data-test=scatter-tooltip]')
      await tip.waitFor()
      seen.add(await tip.innerText())
      await expectInert(page, `calibration tooltip ${i}`)
    }
    const tips = [...seen].join('\n')
    // Points may overlap, so at least one payload must have shown in a tooltip, as text.
    expect([IMG, SCRIPT, JS_URL].some(p => tips.includes(p)), tips).toBe(true)
    await expectInert(page, 'calibration')

    // Overview: unconservative projects and work lists name projects.
    await page.goto(`${h.baseUrl}/overview`)
    await page.locator('[data-test=overview] .n-card').first().waitFor()
    await page.waitForLoadState('networkidle')
    await expectInert(page, 'overview')
    expect(await page.locator('#app').innerText()).toMatch(/XSS-\d/)

    // Precedent finder results: two stories, 300 kip base shear, 15 ft stories like the invented projects.
    await page.goto(`${h.baseUrl}/precedents`)
    await page.fill('[data-test=pf-shear]', '300')
    await page.fill('[data-test=pf-stories]', '2')
    await page.fill('[data-test=pf-height]', '15')
    await page.click('[data-test=pf-search]')
    await page.locator('[data-test=match-row]').first().waitFor()
    await expectLiteral(page, 'precedents', [IMG, SCRIPT, JS_URL])
    await expectInert(page, 'precedents')

    // The review queue holds XSS-3's slipped value.
    await page.goto(`${h.baseUrl}/imports?tab=review`)
    await page.locator('[data-test=review-row][data-project=XSS-3]').waitFor()
    await expectInert(page, 'review queue')

    expect(await page.evaluate(() => (window as unknown as { __xss?: unknown }).__xss)).toBeUndefined()
    expect(h.problems).toEqual([])
    await page.close()
  })
})

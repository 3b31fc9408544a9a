/// <reference lib="dom" />
import { join } from 'node:path'
import { readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { expandPaths } from '../../etl/src/paths'
import { readInputs, runImport } from '../../etl/src/run'
import { DEMO_PASSWORD, signedIn } from '../helpers/app'
import { ARTIFACTS, signInAs, startHarness, type Harness } from './harness'

// The demo firm (demo-data/README.md): SO-2025-003 has submittal rev 0 and rev 1, not yet approved; rev 1 governs every brace.
let h: Harness
let draftCode: string
const example = JSON.parse(readFileSync('docs/examples/three-story-chevron.json', 'utf8'))

beforeAll(async () => {
  h = await startHarness()
  await runImport(h.t.db.db, await readInputs(await expandPaths(['demo-data'])), { source: 'cli' })
  const engineer = await signedIn(h.t.app, 'engineer@example.com')
  const draft = await engineer.agent.post('/api/projects/drafts').set('x-csrf-token', engineer.csrf).send({ name: 'Quarry Lane Studios', request: example }).expect(201)
  draftCode = draft.body.code
}, 240_000)
afterAll(async () => h?.close())

describe('Project records in Chromium', () => {
  it('searches the list, opens a project with a revised submittal, shows its elevation, timeline and submittal check', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'engineer@example.com', DEMO_PASSWORD)
    await page.locator('nav[aria-label=Main]').getByText('Project records', { exact: true }).click()
    await page.waitForURL('**/projects')
    await page.locator('[data-test=project-row]').first().waitFor()
    await page.screenshot({ path: join(ARTIFACTS, 'projects-list.png') })

    await page.fill('[data-test=project-search]', 'SO-2025-00')
    await page.waitForURL(/q=SO-2025-00/)
    await page.waitForFunction(() => Array.from(document.querySelectorAll('[data-test=project-row]')).every(r => r.getAttribute('data-code')?.startsWith('SO-2025-00')))
    const codes = await page.locator('[data-test=project-row]').evaluateAll(rows => rows.map(r => r.getAttribute('data-code')))
    expect(codes).toContain('SO-2025-003')
    expect(codes.every(c => c?.startsWith('SO-2025-00'))).toBe(true)

    await page.locator('[data-test=project-row][data-code="SO-2025-003"]').click()
    await page.waitForURL('**/projects/SO-2025-003')
    await page.locator('[data-test=frame-record]').first().waitFor()
    expect(await page.locator('[data-test=project-title]').innerText()).toContain('SO-2025-003')
    // The elevation: an image with a text alternative, every brace labelled with its final core area.
    const svg = page.locator('[data-test=frame-record] svg[role=img]').first()
    expect(await svg.getAttribute('aria-label')).toMatch(/final core area/)
    const labels = await page.locator('[data-test=frame-record]').first().locator('.brace-label').allTextContents()
    expect(labels.length).toBeGreaterThan(0)
    expect(labels.every(l => /^\d+\.\d{2} in²$/.test(l))).toBe(true)
    expect(await page.locator('[data-test=strength-legend]').first().innerText()).toMatch(/final Cmax \/ assumed Cmax − 1/)
    // The timeline: submittal rev 0 and rev 1, rev 1 governing.
    const rev1 = page.locator('[data-test=timeline-item][data-phase=submittal][data-revision="1"]')
    expect(await page.locator('[data-test=timeline-item][data-phase=submittal][data-revision="0"]').count()).toBe(1)
    expect(await rev1.locator('[data-test=governing-tag]').innerText()).toMatch(/governing on (\d+) of \1/)
    expect(await page.locator('[data-test=import-run]').innerText()).toMatch(/Import run \d+/)
    await page.setViewportSize({ width: 1360, height: 1800 })
    await page.screenshot({ path: join(ARTIFACTS, 'projects-record.png'), fullPage: true })
    await page.setViewportSize({ width: 1360, height: 860 })

    // The submittal check: by default the latest recorded snapshot (submittal rev 1).
    await page.locator('.n-tabs-tab', { hasText: 'Submittal check' }).click()
    await page.waitForURL(/tab=check/)
    const summary = page.locator('[data-test=check-summary]')
    await summary.waitFor()
    await page.locator('[data-test=check-sheet][data-loading=false]').waitFor()
    expect(await summary.innerText()).toMatch(/Submittal rev\. 1 against the design/)
    const rows = page.locator('[data-test=check-row]')
    expect(await rows.count()).toBeGreaterThan(0)
    // Every verdict is in words with a mark, not colour alone.
    for (const v of await rows.locator('.verdict').allInnerTexts()) expect(v).toMatch(/^(✓ Passes|✗ Exceeds|\? Values missing)$/)
    await page.setViewportSize({ width: 1360, height: 1400 })
    await page.screenshot({ path: join(ARTIFACTS, 'projects-check.png'), fullPage: true })
    await page.emulateMedia({ media: 'print' })
    await page.screenshot({ path: join(ARTIFACTS, 'projects-check-print.png'), fullPage: true })
    expect(await page.locator('nav[aria-label=Main]').isVisible()).toBe(false)
    expect(await page.locator('[data-test=check-cautions]').isVisible()).toBe(true)
    await page.emulateMedia({ media: 'screen' })
    await page.setViewportSize({ width: 1360, height: 860 })

    // Pick rev 0 instead.
    await page.locator('[data-test=check-snapshot]').click()
    await page.locator('.n-base-select-option', { hasText: 'Submittal rev. 0' }).click()
    await page.waitForURL(/phase=submittal&revision=0/)
    await page.waitForFunction(() => /Submittal rev\. 0 against/.test(document.querySelector('[data-test=check-summary]')?.textContent ?? ''))

    // CSV export through the browser's download.
    const [download] = await Promise.all([page.waitForEvent('download'), page.click('[data-test=check-csv]')])
    expect(download.suggestedFilename()).toBe('SO-2025-003-submittal-check-submittal-rev0.csv')
    expect(h.problems).toEqual([])
    await page.close()
  })

  it('opens a project from /projects?code=…, records supplier values on a draft and shows the new check', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'engineer@example.com', DEMO_PASSWORD)
    await page.goto(`${h.baseUrl}/projects?code=${draftCode}`)
    await page.waitForURL(`**/projects/${draftCode}`)
    await page.locator('[data-test=draft-tag]').waitFor()
    const labels = await page.locator('[data-test=frame-record] .brace-label').allTextContents()
    expect(new Set(labels)).toEqual(new Set(['pending']))
    expect(await page.locator('[data-test=import-run]').innerText()).toMatch(/New frame worksheet/)

    await page.click('[data-test=record-supplier]')
    const form = page.locator('[data-test=snapshot-form]')
    await form.waitFor()
    // Level 2 is the bottom story: the level picker lists the top first, so choose it explicitly.
    await form.locator('[data-test=snap-level]').click()
    await page.locator('.n-base-select-option', { hasText: 'Level 2' }).click()
    // Nothing typed: the shared schema's messages show beside the fields.
    await page.click('[data-test=snap-save]')
    await form.getByText('must be a number (core area in in²).').waitFor()
    expect(await form.innerText()).toMatch(/must be a number \(core yield stress in ksi\)/)
    // A yield range without its upper bound.
    await page.fill('[data-test=snap-core]', '10')
    await page.fill('[data-test=snap-fysc]', '44')
    await page.fill('[data-test=snap-beta]', '1.15')
    await page.fill('[data-test=snap-omega]', '1.45')
    await page.fill('[data-test=snap-source]', 'Submittal 01')
    await page.click('[data-test=snap-save]')
    await form.getByText('A yield range needs its upper bound.').waitFor()
    await page.fill('[data-test=snap-fysc-max]', '48')
    await page.screenshot({ path: join(ARTIFACTS, 'projects-snapshot-form.png') })
    await page.click('[data-test=snap-save]')

    // Recorded: the page reloads on the check of the snapshot just recorded.
    await page.waitForURL(/tab=check.*phase=submittal&revision=0/)
    const row = page.locator('[data-test=check-row][data-level="Level 2"]')
    await row.waitFor()
    // Design (draft sd): core 9 in², 38–46 ksi, β 1.1, ω 1.4 → Tmax = 1.4·46·9 = 579.6 kip (AISC 341-16 F4.2a; see tests/api/drafts.test.ts).
    // Supplier: 10 in², yield range 44–48 ksi, ω 1.45 → Tmax = 1.45·48·10 = 696 kip: exceeds by 116.4 kip (+20.1 %).
    expect(await row.locator('.verdict').innerText()).toBe('✗ Exceeds')
    expect(await row.locator('[data-item=tmax]').innerText()).toMatch(/✗\s*Exceeds\s*\+116\.4 kip \(\+20\.1 %\)/)
    // Core 10 / 9 − 1 = +11.1 %: outside the ±10 % band.
    expect(await row.locator('[data-item=coreArea]').innerText()).toMatch(/✗\s*Exceeds\s*\+1\.00 in² \(\+11\.1 %\)/)
    await page.setViewportSize({ width: 1360, height: 1100 })
    await page.screenshot({ path: join(ARTIFACTS, 'projects-draft-check.png'), fullPage: true })
    expect(h.problems).toEqual([])
    await page.close()
  })
})

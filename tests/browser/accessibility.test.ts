/// <reference lib="dom" />
// page.evaluate() callbacks run in the browser, hence the DOM types.
import AxeBuilder from '@axe-core/playwright'
import type { Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { AREA_INFO, isAreaAllowed, ROLES, type Area, type Role } from '@shared/auth/roles'
import { expandPaths } from '../../etl/src/paths'
import { readInputs, runImport } from '../../etl/src/run'
import { agentFor, DEMO_PASSWORD } from '../helpers/app'
import { waitForMail } from '../helpers/mail'
import { signInAs, startHarness, type Harness } from './harness'

// Every screen of the dashboard checked with axe-core (the open-source WCAG 2.x rules engine, npm `axe-core` via
// `@axe-core/playwright`): no violation of impact "serious" or "critical" as axe-core rates them.

let h: Harness
beforeAll(async () => {
  h = await startHarness()
  // The harness starts without history: load the invented demo firm through the real loader.
  await runImport(h.t.db.db, await readInputs(await expandPaths(['demo-data'])), { source: 'cli' })
  // At least one captured message, so the demo mailbox is analysed with its list and an open message.
  const a = await agentFor(h.t.app)
  await a.agent.post('/api/auth/forgot-password').set('x-csrf-token', a.csrf).send({ email: 'engineer@example.com' }).expect(202)
  await waitForMail('engineer@example.com')
}, 240_000)
afterAll(async () => h?.close())

interface Screen {
  name: string
  path: string
  /** The area whose roles may open it; none: every signed-in role. */
  area?: Area
  /** Selectors that show the screen's data has arrived. */
  ready: string[]
  /**
   * Sub-tabs and pages whose content is the same for every role that may open them (only the navigation differs,
   * and it is analysed on every other screen) are analysed for these roles only, to keep the file quick.
   */
  onlyFor?: Role[]
  /** Something to do before analysing (e.g. run a search so the results are on the screen too). */
  act?: (page: Page) => Promise<void>
}

// SO-2025-003 is a finished demo project with submittal rev 0 and rev 1 (demo-data/README.md).
const PROJECT = 'SO-2025-003'

const SCREENS: Screen[] = [
  { name: 'overview', path: '/overview', area: 'overview', ready: ['[data-test=overview] .n-card'] },
  {
    name: 'calibration',
    path: '/calibration',
    area: 'calibration',
    ready: ['[data-test=scatter-card] [data-test=legend] li', 'svg[data-test=distribution]', 'svg[data-test=trend-chart]', '[data-test=cost-method]', '[data-test=misses-table] [data-test=miss-row]'],
  },
  {
    name: 'starting factors (with a suggestion)',
    path: '/starting-factors',
    area: 'starting-factors',
    ready: ['[data-test=starting-form]'],
    act: async page => {
      await page.click('[data-test=sf-suggest]')
      await page.locator('[data-test=suggestion-beta] [data-test=suggested]').waitFor({ timeout: 30_000 })
    },
  },
  {
    name: 'precedents (with results)',
    path: '/precedents',
    area: 'precedents',
    ready: ['[data-test=pf-search]'],
    act: async page => {
      await page.fill('[data-test=pf-shear]', '400')
      await page.fill('[data-test=pf-stories]', '4')
      await page.fill('[data-test=pf-height]', '14')
      await page.click('[data-test=pf-search]')
      await page.locator('[data-test=match-row]').first().waitFor()
    },
  },
  { name: 'project list', path: '/projects', area: 'projects', ready: ['[data-test=project-row]'] },
  { name: 'project record', path: `/projects/${PROJECT}`, area: 'projects', ready: ['[data-test=frame-record]', '[data-test=timeline-item]'] },
  { name: 'project submittal check', path: `/projects/${PROJECT}?tab=check`, area: 'projects', onlyFor: ['engineer'], ready: ['[data-test=check-sheet][data-loading=false] [data-test=check-row]'] },
  { name: 'benchmarks', path: '/benchmarks', area: 'benchmarks', ready: ['svg[data-test=band-chart]', '[data-test=band-table] tbody tr'] },
  { name: 'benchmarks proposal sheet', path: '/benchmarks?tab=proposal', area: 'benchmarks', onlyFor: ['bd'], ready: ['[data-test=pp-make]'] },
  { name: 'new frame', path: '/new-frame', area: 'new-frame', ready: ['[data-test=bay-width]', '[data-test=save-status]'] },
  { name: 'imports upload', path: '/imports', area: 'imports', ready: ['[data-test=drop-zone]'] },
  { name: 'imports run history', path: '/imports?tab=history', area: 'imports', onlyFor: ['principal', 'admin'], ready: ['[data-test=run-row]'] },
  { name: 'imports review queue', path: '/imports?tab=review', area: 'imports', ready: ['[data-test=review-empty], [data-test=review-row], [data-test=review-not-for-role]'] },
  { name: 'imports data quality', path: '/imports?tab=quality', area: 'imports', onlyFor: ['engineer'], ready: ['[data-test=quality-projects]'] },
  { name: 'imports templates', path: '/imports?tab=templates', area: 'imports', onlyFor: ['engineer', 'admin'], ready: ['.templates'] },
  { name: 'admin users', path: '/admin', area: 'admin', ready: ['[data-test=invite-open]', '.n-data-table-td'] },
  {
    name: 'admin mailbox (a message open)',
    path: '/admin?tab=mailbox',
    area: 'admin',
    ready: ['[data-test=mail-item]'],
    act: async page => {
      await page.locator('[data-test=mail-item]').first().click()
      await page.locator('.message pre').waitFor()
    },
  },
  { name: 'admin firm settings', path: '/admin?tab=settings', area: 'admin', ready: ['[data-test=defaults-beta]'] },
  { name: 'account', path: '/account', onlyFor: ['admin', 'bd'], ready: ['.n-card input'] },
  { name: 'not found', path: '/no-such-screen', onlyFor: ['engineer'], ready: ['.n-result'] },
]

const inFlight = new WeakMap<Page, { n: number; since: number }>()
/** Counts the page's open requests, so `settle` can wait for quiet. */
function track(page: Page) {
  const s = { n: 0, since: Date.now() }
  inFlight.set(page, s)
  page.on('request', () => s.n++)
  const done = () => {
    s.n--
    s.since = Date.now()
  }
  page.on('requestfinished', done)
  page.on('requestfailed', done)
  return page
}
const idleFor = (page: Page, ms = 150) => {
  const s = inFlight.get(page)!
  return s.n <= 0 && Date.now() - s.since >= ms
}

/** Waits until nothing is loading: network quiet, no spinner or skeleton on screen. */
async function settle(page: Page) {
  // No request in flight for a moment (quicker than Playwright's 500 ms "networkidle").
  await expect.poll(() => idleFor(page), { timeout: 20_000, interval: 50 }).toBe(true)
  // A spinner or skeleton that is on screen (naive-ui keeps some in the DOM, hidden) means data is still coming.
  await page.waitForFunction(
    () => Array.from(document.querySelectorAll('.n-spin, .n-skeleton, [aria-busy=true]')).every(el => el.getClientRects().length === 0 || getComputedStyle(el).visibility === 'hidden'),
    undefined,
    { timeout: 20_000 },
  )
}

/** axe-core's serious and critical violations, one line each: screen, rule id, target. */
async function violations(page: Page, screen: string): Promise<string[]> {
  const result = await new AxeBuilder({ page }).setLegacyMode(true).analyze()
  return result.violations
    .filter(v => v.impact === 'serious' || v.impact === 'critical')
    .flatMap(v => v.nodes.map(n => `${screen}: ${v.id} (${v.impact}) at ${JSON.stringify(n.target)} — ${n.failureSummary?.split('\n')[1]?.trim() ?? v.help}`))
}

/** Charts (role="img" in the app) without a text alternative. */
async function unlabelledCharts(page: Page, screen: string): Promise<string[]> {
  const bad = await page.evaluate(() =>
    // Decorative icons hidden from assistive technology are not charts.
    Array.from(document.querySelectorAll('#app [role=img]'))
      .filter(el => el.getAttribute('aria-hidden') !== 'true' && !(el.getAttribute('aria-label') ?? '').trim())
      .map(el => `${el.tagName.toLowerCase()}${el.getAttribute('data-test') ? `[data-test=${el.getAttribute('data-test')}]` : ''}.${el.getAttribute('class') ?? ''}`),
  )
  return bad.map(b => `${screen}: chart without aria-label: ${b}`)
}

async function check(page: Page, label: string, path: string, ready: string[], act?: (page: Page) => Promise<void>) {
  await page.goto(`${h.baseUrl}${path}`)
  for (const sel of ready) await page.locator(sel).first().waitFor({ timeout: 30_000 })
  await settle(page)
  if (act) {
    await act(page)
    await settle(page)
  }
  return { axe: await violations(page, label), charts: await unlabelledCharts(page, label), charted: await page.locator('#app [role=img]:not([aria-hidden=true])').count() }
}

describe('Accessibility (axe-core) in Chromium', () => {
  it('passes axe-core on sign-in and forgot-password, signed out', async () => {
    const page = track(await h.context.newPage())
    await page.context().clearCookies()
    const found: string[] = []
    for (const [name, path] of [['sign-in', '/sign-in'], ['forgot-password', '/forgot-password']] as const) {
      const r = await check(page, name, path, ['main form, form'])
      found.push(...r.axe, ...r.charts)
    }
    expect(found, found.join('\n')).toEqual([])
    expect(h.problems).toEqual([])
    await page.close()
  })

  it.each(ROLES)('passes axe-core on every screen %s may open, with every chart labelled', async (role: Role) => {
    const page = track(await h.context.newPage())
    await signInAs(page, h.baseUrl, `${role}@example.com`, DEMO_PASSWORD)
    const found: string[] = []
    const opened: string[] = []
    let charts = 0
    for (const s of SCREENS.filter(s => (!s.area || isAreaAllowed(s.area, role)) && (!s.onlyFor || s.onlyFor.includes(role)))) {
      const r = await check(page, `${role} · ${s.name}`, s.path, s.ready, s.act)
      found.push(...r.axe, ...r.charts)
      opened.push(s.name)
      charts += r.charted
    }
    // The forbidden page: an area the role may not use.
    const barred = (Object.keys(AREA_INFO) as Area[]).find(a => !isAreaAllowed(a, role))!
    const r = await check(page, `${role} · forbidden`, AREA_INFO[barred].path, ['[data-test=forbidden]'])
    found.push(...r.axe, ...r.charts)
    expect(found, found.join('\n')).toEqual([])
    // Sanity: the walk reached the screens and their charts (the analysts' screens carry several charts each).
    expect(opened.length).toBeGreaterThanOrEqual(3)
    if (role === 'principal' || role === 'engineer') expect(charts).toBeGreaterThan(5)
    expect(h.problems).toEqual([])
    await page.close()
  }, 240_000)
})

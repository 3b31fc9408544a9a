import { mkdirSync, mkdtempSync } from 'node:fs'
import type { Server } from 'node:http'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { chromium, type BrowserContext, type Page } from 'playwright-core'
import { createTestApp, type TestApp } from '../helpers/app'

export const ARTIFACTS = process.env.TEST_ARTIFACTS ?? resolve('test-artifacts')

export interface Harness {
  baseUrl: string
  context: BrowserContext
  t: TestApp
  /** Console errors and failed requests collected from every page. */
  problems: string[]
  close: () => Promise<void>
}

/** The real app with the built dashboard on a free port, and a headless Debian Chromium. `env` adds to its configuration. */
export async function startHarness(env: Record<string, string> = {}): Promise<Harness> {
  const t = await createTestApp({ DASHBOARD_DIST: resolve('dist/dashboard'), ...env })
  const server: Server = await new Promise(ok => {
    const s = t.app.listen(0, '127.0.0.1', () => ok(s))
  })
  const addr = server.address()
  const baseUrl = `http://127.0.0.1:${typeof addr === 'object' && addr ? addr.port : 0}`
  const context = await chromium.launchPersistentContext(mkdtempSync(join(tmpdir(), 'backsight-chromium-')), {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    viewport: { width: 1360, height: 860 },
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  })
  const problems: string[] = []
  context.on('page', page => watch(page, problems))
  for (const p of context.pages()) watch(p, problems)
  mkdirSync(ARTIFACTS, { recursive: true })
  return {
    baseUrl,
    context,
    t,
    problems,
    close: async () => {
      await context.close()
      server.closeAllConnections()
      await new Promise(r => server.close(r))
      await t.close()
    },
  }
}

function watch(page: Page, problems: string[]) {
  page.on('console', m => {
    // Failed requests are reported below with their URL; the browser's own line says less.
    if (m.type() === 'error' && !/^Failed to load resource/.test(m.text())) problems.push(`console: ${m.text()}`)
  })
  page.on('response', r => {
    // A 401 from /api/auth/me before sign-in is the expected "nobody signed in yet" answer.
    if (r.status() >= 400 && !(r.status() === 401 && r.url().endsWith('/api/auth/me'))) {
      problems.push(`${r.request().method()} ${new URL(r.url()).pathname} → ${r.status()}`)
    }
  })
  page.on('pageerror', e => problems.push(`page error: ${e.message}`))
}

export async function signInAs(page: Page, baseUrl: string, email: string, password: string) {
  await page.context().clearCookies()
  await page.goto(`${baseUrl}/sign-in`)
  await page.fill('input[name=email]', email)
  await page.fill('input[name=password]', password)
  await page.click('button[type=submit]')
  await page.waitForSelector('nav[aria-label=Main]')
}

export async function signOut(page: Page) {
  await page.click('[data-test=user-menu]')
  await page.getByText('Sign out', { exact: true }).click()
  await page.waitForURL(/\/sign-in/)
}

/// <reference lib="dom" />
// page.evaluate() callbacks run in the browser, hence the DOM types.
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { AREA_INFO, areasFor, homePathFor, ROLES } from '@shared/auth/roles'
import { DEMO_PASSWORD } from '../helpers/app'
import { tokenFrom, waitForMail } from '../helpers/mail'
import { ARTIFACTS, signInAs, signOut, startHarness, type Harness } from './harness'

let h: Harness
beforeAll(async () => {
  h = await startHarness()
})
afterAll(async () => h?.close())

describe('app frame in Chromium', () => {
  it.each(ROLES)('as %s: shows only that role’s navigation, opens each area, signs out', async role => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, `${role}@example.com`, DEMO_PASSWORD)
    const expected = areasFor(role).map(a => AREA_INFO[a].label)
    const shown = await page.locator('nav[aria-label=Main] .n-menu-item-content-header').allInnerTexts()
    expect(shown.map(s => s.trim())).toEqual(expected)
    // Lands on the role's home area.
    expect(new URL(page.url()).pathname).toBe(homePathFor(role))

    for (const area of areasFor(role)) {
      await page.locator('nav[aria-label=Main]').getByText(AREA_INFO[area].label, { exact: true }).click()
      await page.waitForURL(`**${AREA_INFO[area].path}`)
      await expect.poll(() => page.locator('h1.title').innerText()).toBe(AREA_INFO[area].label)
      // Every screen carries the design caution.
      expect(await page.getByRole('note').first().innerText()).toMatch(/Preliminary design aid/)
    }
    await page.screenshot({ path: join(ARTIFACTS, `app-frame-${role}.png`) })
    await signOut(page)
    await page.goto(`${h.baseUrl}/projects`)
    await page.waitForURL(u => u.pathname === '/sign-in' && u.searchParams.get('redirect') === '/projects')
    await page.close()
  })

  it('shows the 403 page when a role opens an area it may not use', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'bd@example.com', DEMO_PASSWORD)
    await page.goto(`${h.baseUrl}/projects`)
    await page.waitForSelector('[data-test=forbidden]')
    expect(await page.locator('[data-test=forbidden]').innerText()).toMatch(/Not available to your role/)
    await signOut(page)
    await page.close()
  })

  it('returns to the page asked for after sign-in, but never to another site', async () => {
    const page = await h.context.newPage()
    await page.goto(`${h.baseUrl}/calibration`)
    await page.waitForURL(/\/sign-in\?redirect=/)
    await page.fill('input[name=email]', 'principal@example.com')
    await page.fill('input[name=password]', DEMO_PASSWORD)
    await page.click('button[type=submit]')
    await page.waitForURL('**/calibration')
    await signOut(page)
    await page.goto(`${h.baseUrl}/sign-in?redirect=//evil.example/x`)
    await page.fill('input[name=email]', 'principal@example.com')
    await page.fill('input[name=password]', DEMO_PASSWORD)
    await page.click('button[type=submit]')
    await page.waitForSelector('nav[aria-label=Main]')
    expect(new URL(page.url()).host).toBe(new URL(h.baseUrl).host)
    await signOut(page)
    await page.close()
  })

  it('lets an admin invite a user who sets a password from the e-mail and signs in', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'admin@example.com', DEMO_PASSWORD)
    await page.click('[data-test=invite-open]')
    const email = `browser-invitee-${Date.now()}@example.com`
    const dialog = page.locator('.n-modal')
    await dialog.locator('input[name=name]').fill('Morgan Newhire')
    await dialog.locator('input[name=email]').fill(email)
    await page.click('[data-test=invite-send]')
    await page.getByText(`Invitation sent to ${email}`).waitFor()
    await page.getByRole('cell', { name: email, exact: true }).waitFor()
    await page.locator('.n-modal').waitFor({ state: 'detached' })
    await page.screenshot({ path: join(ARTIFACTS, 'admin-users.png') })

    // The demo mailbox shows the captured invitation.
    await page.locator('.n-tabs-tab', { hasText: 'Demo mailbox' }).click()
    await page.getByText(`To ${email}`, { exact: false }).first().click()
    await page.getByText('set-password?token=', { exact: false }).waitFor()
    await page.screenshot({ path: join(ARTIFACTS, 'admin-mailbox.png') })
    await signOut(page)

    const token = tokenFrom((await waitForMail(email)).text)
    await page.goto(`${h.baseUrl}/set-password?token=${token}`)
    await page.getByText('Welcome, Morgan Newhire').waitFor()
    await page.fill('input[name=password]', 'morgan-first-password')
    await page.fill('input[name=confirm]', 'morgan-first-password')
    await page.click('button[type=submit]')
    await page.getByText('Your password is set').waitFor()
    await signInAs(page, h.baseUrl, email, 'morgan-first-password')
    expect(await page.locator('[data-test=user-menu]').innerText()).toContain('Morgan Newhire')
    await page.close()
  })

  it('loads with no console errors and in Public Sans', async () => {
    const page = await h.context.newPage()
    await signInAs(page, h.baseUrl, 'engineer@example.com', DEMO_PASSWORD)
    const font = await page.evaluate(() => getComputedStyle(document.body).fontFamily)
    expect(font).toMatch(/Public Sans/)
    expect(await page.evaluate(() => document.fonts.check('16px "Public Sans"'))).toBe(true)
    expect(h.problems).toEqual([])
    await page.close()
  })
})

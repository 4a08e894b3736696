import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import type { Browser } from 'playwright-core'
import { builtServer } from '../support/http'
import { closeTestDb, site, user } from '../support/db'
import { captureMail, linkTokenMailedTo } from '../support/mail'
import { launchChromium, newContext, signInAt, untilHydrated } from '../support/chromium'

// The link is read from what reached the SMTP fake; the outbox never keeps a working one.
const fake = await captureMail()
await setup(builtServer)

let browser: Browser
let siteId: string

beforeAll(async () => {
  browser = await launchChromium()
  siteId = (await site()).id
})
afterAll(async () => {
  await fake.stop()
  await browser?.close()
  await closeTestDb()
})

describe('a new password from the sign-in page', () => {
  it('asks for a link, opens it, sets the password and signs in with it', async () => {
    const who = await user({ siteId })
    const context = await newContext(browser, url('/'))
    const page = await context.newPage()
    await page.goto(url('/sign-in'))
    await page.getByRole('link', { name: 'Forgot your password?' }).click()
    await page.waitForURL(/\/reset-password$/)
    await untilHydrated(page, 'form input')
    await page.getByLabel('E-mail').fill(who.email)
    await page.getByRole('button', { name: 'Send me a link' }).click()
    await expect.poll(() => page.getByRole('status').textContent()).toContain('It works for 30 minutes, once.')

    await page.goto(url(`/reset-password?token=${await linkTokenMailedTo(fake, who.email)}`))
    await untilHydrated(page, 'form input')
    await page.getByLabel('New password').fill('forklift-aisle-nine-3381')
    await page.getByLabel('The same again').fill('forklift-aisle-nine-3381')
    await page.getByRole('button', { name: 'Set the new password' }).click()
    await page.waitForURL(/\/sign-in\?password=set/)
    expect(await page.getByRole('status').textContent()).toContain('Your new password is set.')

    await untilHydrated(page, 'form input')
    await page.getByLabel('E-mail').fill(who.email)
    await page.getByLabel('Password', { exact: true }).fill('forklift-aisle-nine-3381')
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL(u => !u.pathname.startsWith('/sign-in'))
    await context.close()
  })
})

describe('changing the password while signed in', () => {
  it('is reachable from the header and keeps this browser signed in', async () => {
    const who = await user({ siteId })
    const { context, page } = await signInAt(browser, who, '/due')
    await page.getByRole('link', { name: 'Password', exact: true }).click()
    await page.waitForURL(/\/account$/)
    await page.getByLabel('Current password').fill('not-the-password-0')
    await page.getByLabel('New password').fill('charger-bank-west-2290')
    await page.getByLabel('The same again').fill('charger-bank-west-2290')
    await page.getByRole('button', { name: 'Change password' }).click()
    await expect.poll(() => page.getByText('That is not your current password.').count()).toBe(1)

    await page.getByLabel('Current password').fill(who.password)
    await page.getByRole('button', { name: 'Change password' }).click()
    await expect.poll(() => page.getByText('Password changed.').count()).toBe(1)
    await page.goto(url('/due'))
    await page.waitForLoadState('networkidle')
    expect(new URL(page.url()).pathname).toBe('/due')
    await context.close()
  })
})

import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import type { Browser } from 'playwright-core'
import { builtServer } from '../support/http'
import { closeTestDb, site, user } from '../support/db'
import { DESKTOP, launchChromium, newContext, PHONE, untilHydrated } from '../support/chromium'

await setup(builtServer)

let browser: Browser
let siteId: string
const people: Record<string, { email: string, password: string }> = {}

beforeAll(async () => {
  browser = await launchChromium()
  const s = await site()
  siteId = s.id
  people.operator = await user({ siteId, roles: ['operator'] })
  people.facilities = await user({ siteId, roles: ['facilities_lead'] })
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

async function signInAndOpenMenu(who: { email: string, password: string }, viewport: typeof PHONE) {
  const context = await newContext(browser, url('/'), viewport)
  const page = await context.newPage()
  await page.goto(url('/trucks'))
  await page.waitForURL(/\/sign-in\?next=(%2F|\/)trucks/)
  await untilHydrated(page, 'form input')
  await page.getByLabel('E-mail').fill(who.email)
  await page.getByLabel('Password').fill(who.password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForURL(/\/trucks$/)
  if (viewport === PHONE) await page.getByRole('button', { name: 'Open menu' }).click()
  const nav = page.getByRole('navigation', { name: 'Main' }).filter({ visible: true })
  await nav.getByRole('link', { name: 'Home' }).waitFor()
  const labels = (await nav.getByRole('link').allInnerTexts()).map(t => t.trim()).filter(Boolean)
  return { context, labels }
}

describe('navigation by role', () => {
  it('keeps an e-mail and password typed before the page\'s scripts arrived (a slow network), and signs in with them', async () => {
    const context = await newContext(browser, url('/'), PHONE)
    const page = await context.newPage()
    let release!: () => void
    const scriptsHeld = new Promise<void>(r => (release = r))
    await page.route('**/_nuxt/**', async (route) => {
      await scriptsHeld
      await route.continue()
    })
    // the server-rendered form is there while its scripts are held (the document is not "loaded" until they run)
    await page.goto(url('/sign-in?next=/trucks'), { waitUntil: 'commit' })
    await page.getByLabel('E-mail').waitFor()
    await page.getByLabel('E-mail').fill(people.operator!.email)
    await page.getByLabel('Password').fill(people.operator!.password)
    release()
    await untilHydrated(page, 'form input')
    expect(await page.getByLabel('E-mail').inputValue()).toBe(people.operator!.email)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL(/\/trucks$/)
    await context.close()
  })

  it('an operator at phone width sees the floor items, not the lead pages', async () => {
    const { context, labels } = await signInAndOpenMenu(people.operator!, PHONE)
    expect(labels).toContain('Home')
    expect(labels).toContain('Trucks')
    expect(labels).not.toContain('Areas')
    expect(labels).not.toContain('People')
    expect(labels).not.toContain('Site settings')
    expect(labels).not.toContain('Schedules')
    // a lead's page opened by its address says why it is not theirs, with no form that can do nothing
    const page = context.pages()[0]!
    await page.goto(url('/labels'))
    await expect.poll(() => page.getByRole('alert').innerText()).toMatch(/To print label sheets you need one of these roles/)
    expect(await page.getByRole('button', { name: 'Make PDF' }).count()).toBe(0)
    await context.close()
  })

  it('a facilities lead at desktop width sees the registry and people', async () => {
    const { context, labels } = await signInAndOpenMenu(people.facilities!, DESKTOP)
    expect(labels).toEqual(expect.arrayContaining(['Home', 'Trucks', 'Batteries', 'Chargers', 'LP cylinders', 'Areas', 'People', 'Due list', 'Schedules']))
    expect(labels).not.toContain('Site settings')
    // the site settings opened by their address are there to read (the cool-down, the tariff), not to change
    const page = context.pages()[0]!
    await page.goto(url('/site'))
    await expect.poll(() => page.getByText('Only an admin can change these settings').isVisible()).toBe(true)
    expect(await page.getByLabel('Cool-down after charge (minutes)').isDisabled()).toBe(true)
    expect(await page.getByRole('button', { name: 'Save settings' }).count()).toBe(0)
    expect(await page.getByRole('button', { name: 'Add another site' }).count()).toBe(0)
    await context.close()
  })
})

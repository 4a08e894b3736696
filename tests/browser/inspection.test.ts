import { mkdirSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import type { Browser, Page } from 'playwright-core'
import { builtServer } from '../support/http'
import { eq } from 'drizzle-orm'
import { closeTestDb, site, tables, user, useTestDb } from '../support/db'
import { PHONE, launchChromium, signInAt } from '../support/chromium'
import { fittedTruck, tagFor } from '../support/battery-room'
import { lpTruck } from '../support/fuel'
import { classQualification } from '../support/inspection'

await setup(builtServer)

let browser: Browser
let siteId: string
const people: Record<string, { email: string, password: string }> = {}

// Invented site: an electric rider truck and an LP-gas truck; an operator trained and evaluated on both classes.
beforeAll(async () => {
  mkdirSync('screenshots', { recursive: true })
  browser = await launchChromium()
  siteId = (await site({ name: `Orchard Reach DC ${Date.now().toString(36)}` })).id
  const operator = await user({ siteId, roles: ['operator'] })
  await classQualification(operator.id, 1)
  await classQualification(operator.id, 5)
  people.operator = operator
  people.technician = await user({ siteId, roles: ['technician'] })
  people.admin = await user({ siteId, roles: ['admin'] })
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

const signedIn = async (who: { email: string, password: string }, path: string): Promise<Page> => (await signInAt(browser, who, path, PHONE)).page

describe('pre-shift check in the browser, at phone width', () => {
  it('an operator scans a truck, passes every group, fails one critical item with a note and sees the truck out of service', async () => {
    const t = await fittedTruck(siteId, { fleetNumber: 'OR-07' })
    const code = await tagFor('truck', t.id, siteId)
    const page = await signedIn(people.operator!, `/t/${code}`)
    await page.getByRole('link', { name: 'Pre-shift check' }).click()
    await expect.poll(() => page.getByRole('heading', { name: 'Key off — walk round' }).isVisible()).toBe(true)
    for (const button of await page.getByRole('button', { name: 'All pass' }).all()) await button.click()
    await page.screenshot({ path: 'screenshots/inspection-electric-phone.png', fullPage: true })
    // the horn is silent: a critical item
    await page.getByRole('radiogroup', { name: 'Horn sounds' }).getByRole('radio', { name: 'Fail' }).click()
    await page.getByRole('button', { name: 'Record the check' }).click()
    await expect.poll(() => page.getByText('Say what is wrong.').isVisible()).toBe(true)
    await page.getByLabel('What is wrong?').fill('Horn silent when pressed')
    await page.getByLabel('Hour meter (h)').fill('12')
    await page.getByRole('button', { name: 'Record the check' }).click()
    await expect.poll(() => page.getByRole('heading', { name: 'Recorded: truck out of service' }).isVisible()).toBe(true)
    await expect.poll(() => page.getByText('Out of service after its pre-shift check').isVisible()).toBe(true)
    expect(await page.getByRole('button', { name: 'Return to service' }).count()).toBe(0)
    await page.screenshot({ path: 'screenshots/inspection-held-phone.png', fullPage: true })
    await page.goto(page.url().replace(/\/inspect.*$/, `/t/${code}`))
    await expect.poll(() => page.getByText('Out of service after inspection').first().isVisible()).toBe(true)
    expect(await page.getByRole('link', { name: 'Return to service' }).count()).toBe(0)
    await page.context().close()

    const tech = await signedIn(people.technician!, `/t/${code}`)
    await tech.getByRole('link', { name: 'Return to service' }).click()
    await tech.getByLabel('What was done to put it right').fill('Replaced the horn fuse and tested it')
    await tech.getByRole('button', { name: 'Return to service' }).click()
    await expect.poll(() => tech.getByText('Out of service after its pre-shift check').count()).toBe(0)
    await tech.context().close()
  })

  it('an admin sets the class policy and the shift start times on the site settings', async () => {
    const page = await signedIn(people.admin!, '/site')
    await page.getByLabel('Operator not authorised for the truck\'s class, or evaluation lapsed').selectOption('block')
    await page.getByLabel('Shifts begin at (site time, HH:MM, comma between)').fill('05:30, 13:30, 21:30')
    await page.getByRole('button', { name: 'Save settings' }).click()
    await expect.poll(() => page.getByText('Site settings saved.').isVisible()).toBe(true)
    const [row] = await useTestDb().select({ settings: tables.sites.settings }).from(tables.sites).where(eq(tables.sites.id, siteId))
    expect(row!.settings).toMatchObject({ truckAuthorisationPolicy: 'block', shiftStarts: ['05:30', '13:30', '21:30'] })
    await useTestDb().update(tables.sites).set({ settings: { ...(row!.settings as object), truckAuthorisationPolicy: 'warn' } }).where(eq(tables.sites.id, siteId))
    await page.context().close()
  })

  it('the LP-gas checklist carries the cylinder items', async () => {
    const t = await lpTruck(siteId, { fleetNumber: 'OR-21' })
    const page = await signedIn(people.operator!, `/inspect?truck=${t.id}`)
    await expect.poll(() => page.getByText('Relief valve pointing up, in the vapour space').isVisible()).toBe(true)
    for (const button of await page.getByRole('button', { name: 'All pass' }).all()) await button.click()
    await page.screenshot({ path: 'screenshots/inspection-lp-phone.png', fullPage: true })
    await page.context().close()
  })
})

import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import type { Browser } from 'playwright-core'
import { builtServer } from '../support/http'
import { closeTestDb, site, user } from '../support/db'
import { DESKTOP, PHONE, launchChromium, signInAt } from '../support/chromium'
import { AID_DISCLAIMER } from '../../shared/utils/disclaimer'
import { defaultSchedules, type ScheduleDefinition } from '../../shared/utils/due-schedules'

await setup(builtServer)

let browser: Browser
let siteId: string
const people: Record<string, { email: string, password: string }> = {}
const defaultWatering = defaultSchedules().find(s => s.kind === 'battery_watering')!

// An invented site with its default schedules, a facilities lead and an operator.
beforeAll(async () => {
  browser = await launchChromium()
  siteId = (await site({ name: `Quarry Road DC ${Date.now().toString(36)}` })).id
  people.facilities = await user({ siteId, roles: ['facilities_lead'] })
  people.operator = await user({ siteId, roles: ['operator'] })
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

describe('due schedules in the browser', () => {
  it('a facilities lead at desktop width changes the battery watering interval', async () => {
    const { context, page } = await signInAt(browser, people.facilities!, '/schedules', DESKTOP)
    await expect.poll(() => page.getByRole('heading', { name: 'Batteries' }).isVisible()).toBe(true)
    for (const heading of ['Chargers', 'Trucks', 'LP cylinders', 'Areas and logs', 'People']) {
      expect(await page.getByRole('heading', { name: heading, exact: true }).isVisible()).toBe(true)
    }
    expect(await page.getByText(AID_DISCLAIMER).count()).toBe(1)
    const row = page.locator('[data-schedule-kind="battery_watering"]')
    const interval = row.locator('[data-field="interval"]')
    expect(await interval.textContent()).toContain(`every ${defaultWatering.every} charges or ${defaultWatering.withinDays} days`)
    expect(await row.getByText('Common practice; follow the battery maker.').isVisible()).toBe(true)
    expect(await page.locator('[data-schedule-kind="emissions_test"] [data-field="interval"]').textContent()).toContain('yearly')

    await row.getByRole('button', { name: 'Edit Battery watering' }).click()
    const form = page.getByRole('form', { name: 'Edit Battery watering' })
    await form.getByLabel('Every (charges)').fill('0')
    await form.getByRole('button', { name: 'Save schedule' }).click()
    await expect.poll(() => form.getByText('A whole number from 1 to 1000.').isVisible()).toBe(true)
    await form.getByLabel('Every (charges)').fill('8')
    await form.getByLabel('Or within (days)').fill('10')
    await form.getByLabel('Due soon (days before)').fill('2')
    await page.screenshot({ path: '/tmp/schedules-desktop-form.png', fullPage: true })
    await form.getByRole('button', { name: 'Save schedule' }).click()
    await expect.poll(() => row.getByRole('status').textContent()).toContain('Saved')
    expect(await interval.textContent()).toContain('every 8 charges or 10 days')
    expect(await row.textContent()).toContain('2 days before')
    expect(await form.count()).toBe(0)
    await page.screenshot({ path: '/tmp/schedules-desktop.png', fullPage: true })

    const reply = await context.request.get(url(`/api/schedules?siteId=${siteId}`))
    expect(reply.status()).toBe(200)
    const watering = ((await reply.json()) as { items: ScheduleDefinition[] }).items.find(s => s.kind === 'battery_watering')
    expect(watering).toMatchObject({ every: 8, withinDays: 10, dueSoonDays: 2, active: true })

    // the same form at phone width
    await page.setViewportSize(PHONE)
    await page.locator('[data-schedule-kind="emissions_test"]').getByRole('button', { name: 'Edit Emissions test' }).click()
    await expect.poll(() => page.getByRole('form', { name: 'Edit Emissions test' }).getByLabel('Unit').inputValue()).toBe('year')
    await page.getByRole('form', { name: 'Edit Emissions test' }).scrollIntoViewIfNeeded()
    await page.screenshot({ path: '/tmp/schedules-phone-form.png' })
    await page.getByRole('form', { name: 'Edit Emissions test' }).getByRole('button', { name: 'Cancel' }).click()
    await page.setViewportSize(DESKTOP)

    await page.goto(url('/due'))
    await expect.poll(() => page.getByRole('link', { name: 'Edit schedules' }).isVisible()).toBe(true)
    await context.close()
  })

  it('an operator at phone width sees the schedules without Edit buttons', async () => {
    const { context, page } = await signInAt(browser, people.operator!, '/schedules', PHONE)
    await expect.poll(() => page.getByRole('heading', { name: 'Due schedules' }).isVisible()).toBe(true)
    const row = page.locator('[data-schedule-kind="battery_watering"]')
    expect(await row.isVisible()).toBe(true)
    expect(await row.locator('[data-field="interval"]').textContent()).toContain('every 8 charges or 10 days')
    expect(await page.getByRole('button', { name: /^Edit/ }).count()).toBe(0)
    expect(await page.getByText(AID_DISCLAIMER).isVisible()).toBe(true)
    // the schedules and the header (site switcher, password and sign-out buttons) fit the phone's width
    const right = await page.evaluate(() => Math.max(...[...document.querySelectorAll('main *, header *')].map(e => e.getBoundingClientRect().right)))
    expect(right).toBeLessThanOrEqual(PHONE.width)
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width)
    await page.screenshot({ path: '/tmp/schedules-phone.png', fullPage: true })
    await context.close()
  })
})

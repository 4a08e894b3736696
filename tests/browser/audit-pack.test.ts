import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import { mkdirSync } from 'node:fs'
import type { Browser } from 'playwright-core'
import { builtServer } from '../support/http'
import { area, closeTestDb, site, user } from '../support/db'
import { DESKTOP, PHONE, launchChromium, signInAt } from '../support/chromium'

await setup(builtServer)

let browser: Browser
const people: Record<string, { id: string, email: string, password: string }> = {}

// A safety lead makes a site's audit pack from the page: the progress bar runs, then both files are offered.
beforeAll(async () => {
  browser = await launchChromium()
  mkdirSync('screenshots', { recursive: true })
  const siteId = (await site({ name: `Ashgrove DC ${Date.now()}` })).id
  await area({ siteId, kind: 'charging_area', name: 'Charge room East' })
  people.safety = await user({ siteId, roles: ['safety_lead'], name: 'Sol Safety' })
  people.technician = await user({ siteId, roles: ['technician'], name: 'Tam Technician' })
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

describe('audit pack page', () => {
  it.each([['phone', PHONE], ['desktop', DESKTOP]] as const)('a safety lead makes the pack and is offered the PDF and the ZIP (%s)', async (name, viewport) => {
    const { context, page } = await signInAt(browser, people.safety!, '/audit-pack', viewport)
    await page.getByRole('button', { name: 'Make the pack' }).click()
    await page.getByText('The pack is ready.').waitFor({ timeout: 60_000 })
    const pdf = page.getByRole('link', { name: 'Download PDF' })
    expect(await pdf.getAttribute('href')).toMatch(/^\/api\/audit-packs\/[0-9a-f-]+\/pdf$/)
    const res = await page.request.get(url(await pdf.getAttribute('href') as string))
    expect(res.status()).toBe(200)
    expect(res.headers()['content-type']).toContain('application/pdf')
    await expect.poll(() => page.getByRole('link', { name: /Download ZIP/ }).count()).toBe(1)
    await page.screenshot({ path: `screenshots/audit-pack-${name}.png`, fullPage: true })
    await context.close()
  })

  it('a technician is told who may make one, and is offered no button', async () => {
    const { context, page } = await signInAt(browser, people.technician!, '/audit-pack', PHONE)
    await page.getByText('Only the site\'s facilities lead, safety lead or an admin can make an audit pack.').waitFor()
    expect(await page.getByRole('button', { name: 'Make the pack' }).count()).toBe(0)
    await context.close()
  })
})

import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { mkdirSync } from 'node:fs'
import { eq } from 'drizzle-orm'
import type { Browser } from 'playwright-core'
import { builtServer } from '../support/http'
import { closeTestDb, site, tables, user, useTestDb } from '../support/db'
import { PHONE, launchChromium, signInAt } from '../support/chromium'

await setup(builtServer)

// A lead imports batteries from a CSV file on a phone: the dry run says every row is valid, the import runs
// as a job with its progress bar, and the list shows the new batteries.
let browser: Browser
const SLOW = { timeout: 20_000 }

beforeAll(async () => {
  browser = await launchChromium()
  mkdirSync('screenshots', { recursive: true })
}, 120_000)
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

describe('CSV import in the browser', () => {
  it('checks the file, imports it as a job with a progress bar, and lists the batteries', async () => {
    const siteId = (await site({ name: `Harbor Point DC ${Date.now()}` })).id
    const lead = await user({ siteId, roles: ['facilities_lead'], name: 'Femi Facilities' })
    const header = 'serial,chemistry,voltage,cellCount,capacityAh,weightLb,lengthIn,widthIn,heightIn,connector'
    const csv = [header, ...Array.from({ length: 12 }, (_, i) => `IMP-${i},flooded_lead_acid,24,12,510,900,31,13,30,175 A red`)].join('\n')
    const { page, context } = await signInAt(browser, lead, '/batteries', PHONE)
    await page.getByRole('button', { name: 'Import CSV' }).click()
    await page.locator('input[type="file"]').setInputFiles({ name: 'batteries.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) })
    await expect.poll(() => page.getByText('all 12 rows are valid').count(), SLOW).toBe(1)
    await page.getByRole('button', { name: 'Import 12 rows' }).click()
    await expect.poll(() => page.getByRole('status').filter({ hasText: 'Imported.' }).count(), SLOW).toBe(1)
    expect(await page.getByRole('progressbar').getAttribute('aria-valuenow')).toBe('100')
    const rows = await useTestDb().select().from(tables.batteries).where(eq(tables.batteries.siteId, siteId))
    expect(rows.map(r => r.serial).sort()).toEqual(Array.from({ length: 12 }, (_, i) => `IMP-${i}`).sort())
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width)
    await page.screenshot({ path: 'screenshots/battery-import-phone.png', fullPage: true })
    await context.close()
  })
})

import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import { eq } from 'drizzle-orm'
import type { Browser, BrowserContext, Page, Route } from 'playwright-core'
import { builtServer, signIn } from '../support/http'
import { area, battery, closeTestDb, site, tables, user, useTestDb } from '../support/db'
import { launchChromium, signInAt } from '../support/chromium'
import { fittedTruck, pastCharge, putInTruck, qualify, readyBattery, roomCharger, storedBattery, tagFor } from '../support/battery-room'

await setup(builtServer)

let browser: Browser
let siteId: string
let areaId: string
let chargerId: string
const people: Record<string, { id: string, email: string, password: string }> = {}

beforeAll(async () => {
  browser = await launchChromium()
  siteId = (await site({ name: `Millbrook DC aisle ${Date.now()}` })).id
  areaId = (await area({ siteId, name: `Charge room South ${Date.now()}` })).id
  chargerId = (await roomCharger(siteId, areaId)).id
  people.technician = await user({ siteId, roles: ['technician'], name: 'Ines Technician' })
  people.other = await user({ siteId, roles: ['technician'], name: 'Theo Technician' })
  await qualify(people.technician.id)
  await qualify(people.other.id)
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

const signedInContext = (who: { email: string, password: string }, path: string): Promise<{ context: BrowserContext, page: Page }> =>
  signInAt(browser, who, path)

const focusedLabel = (page: Page) => page.evaluate(() => (document.activeElement as HTMLInputElement | null)?.labels?.[0]?.textContent ?? '')

async function swapFixture() {
  const t = await fittedTruck(siteId, { hourMeter: 1200 })
  const out = await battery({ siteId, homeAreaId: areaId })
  await putInTruck(out.id, t.id)
  const fresh = await readyBattery({ siteId, userId: people.technician!.id, chargerId, homeAreaId: areaId })
  return { truck: t, out, fresh, codes: [await tagFor('truck', t.id, siteId), await tagFor('battery', out.id, siteId), await tagFor('battery', fresh.id, siteId)] as const }
}

// Scans the three codes and reads the hour meter, with the connection up (the look-ups need it).
async function fillSwap(page: Page, codes: readonly [string, string, string]) {
  await expect.poll(() => focusedLabel(page)).toContain('Truck')
  await page.keyboard.type(codes[0])
  await page.keyboard.press('Enter')
  await expect.poll(() => page.getByText(`holds ${codes[1]}`).count()).toBeGreaterThan(0)
  await page.keyboard.type(codes[1])
  await page.keyboard.press('Enter')
  await expect.poll(() => focusedLabel(page)).toContain('Battery going in')
  await page.keyboard.type(codes[2])
  await page.keyboard.press('Enter')
  await expect.poll(() => focusedLabel(page)).toContain('Hour meter')
  await page.keyboard.type('1234')
}

describe('records that survive a dropped connection', () => {
  it('a swap and a reading kept offline survive a reload and a closed tab, then are stored exactly once', async () => {
    const swap = await swapFixture()
    const weak = await battery({ siteId, homeAreaId: areaId, voltage: 24, cellCount: 12 })
    await pastCharge({ siteId, userId: people.technician!.id, batteryId: weak.id, chargerId, endedHoursAgo: 1 })
    const weakCode = await tagFor('battery', weak.id, siteId)

    const { context, page } = await signedInContext(people.technician!, '/swap')
    await fillSwap(page, swap.codes)
    const checkPage = await context.newPage()
    await checkPage.goto(url('/check'))
    await checkPage.waitForLoadState('networkidle')
    await expect.poll(() => focusedLabel(checkPage)).toContain('Battery')
    await checkPage.keyboard.type(weakCode)
    await checkPage.keyboard.press('Enter')
    await expect.poll(() => focusedLabel(checkPage)).toContain('Electrolyte temperature')
    await checkPage.keyboard.type('80')
    await checkPage.keyboard.press('Enter')
    for (const entry of ['1280', '1280', '1275', '1280', '1280', '1280', '1280', '1280', '1280', '1280', '1280', '1280']) {
      await checkPage.keyboard.type(entry)
      await checkPage.keyboard.press('Enter')
    }
    await expect.poll(() => checkPage.evaluate(() => (document.activeElement as HTMLElement | null)?.innerText ?? '')).toContain('Save check')

    await context.setOffline(true)
    await page.keyboard.press('Enter')
    await page.locator('[data-outbox-state="kept"]').getByText('Kept on this device, will send').waitFor()
    await page.getByText('1 record kept on this device, will send when the connection is back').waitFor()
    await page.screenshot({ path: 'screenshots/outbox-kept-swap-phone.png', fullPage: true })
    const checkPressed = Date.now()
    await checkPage.keyboard.press('Enter')
    await checkPage.locator('[data-outbox-state="kept"]').getByText('Kept on this device, will send').waitFor()
    const checkKept = Date.now()
    await checkPage.getByText('2 records kept on this device').waitFor()
    await checkPage.screenshot({ path: 'screenshots/outbox-kept-check-phone.png', fullPage: true })
    await checkPage.close()

    // Back online, but the battery-room routes still unreachable: the swap reaches the server once and its
    // answer is lost on the way back, so the device still holds it; the reload shows both records survived.
    let swapForwarded = false
    const blocked = async (r: Route) => {
      if (!swapForwarded && r.request().url().endsWith('/api/battery-room/swaps')) {
        swapForwarded = true
        await r.fetch()
      }
      await r.abort('internetdisconnected')
    }
    await context.route('**/api/battery-room/**', blocked)
    await context.setOffline(false)
    await page.reload()
    await page.getByText('2 records kept on this device, will send when the connection is back').waitFor()
    await page.getByRole('button', { name: 'Open the records' }).click()
    await page.getByText(`Battery ${swap.codes[2]} into truck ${swap.codes[0]}`).waitFor()
    await page.getByText(`Electrolyte check, battery ${weakCode}`).waitFor()
    await page.screenshot({ path: 'screenshots/outbox-banner-kept-phone.png', fullPage: true })
    await expect.poll(() => swapForwarded, { timeout: 45_000 }).toBe(true)
    expect(await useTestDb().select().from(tables.batterySwaps).where(eq(tables.batterySwaps.batteryInId, swap.fresh.id))).toHaveLength(1)

    // The connection comes back properly: everything kept goes, oldest first, and the banner clears.
    const unrouted = Date.now()
    await context.unroute('**/api/battery-room/**', blocked)
    await context.setOffline(true)
    await context.setOffline(false)
    // A device's browser says 'online' when its connection comes back; Chromium's emulated network does not, which
    // left the records to the half-minute retry racing this wait. So the page is told, as a device's browser would.
    await page.evaluate(() => window.dispatchEvent(new Event('online')))
    await page.getByText('Sent: 2 kept records saved').waitFor({ timeout: 20_000 })
    await page.locator('[data-outbox-banner]').waitFor({ state: 'detached', timeout: 20_000 })

    const swaps = await useTestDb().select().from(tables.batterySwaps).where(eq(tables.batterySwaps.batteryInId, swap.fresh.id))
    expect(swaps).toHaveLength(1)
    const checks = await useTestDb().select().from(tables.electrolyteChecks).where(eq(tables.electrolyteChecks.batteryId, weak.id))
    expect(checks).toHaveLength(1)
    expect(await useTestDb().select().from(tables.cellReadings).where(eq(tables.cellReadings.checkId, checks[0]!.id))).toHaveLength(12)
    // the check went late: it carries the time Save was pressed, not the time it arrived
    expect(checks[0]!.at.getTime()).toBeGreaterThanOrEqual(checkPressed - 50)
    expect(checks[0]!.at.getTime()).toBeLessThanOrEqual(checkKept + 50)
    expect(checks[0]!.recordedAt.getTime()).toBeGreaterThan(unrouted)
    expect((await storedBattery(swap.fresh.id)).currentTruckId).toBe(swap.truck.id)
    // nothing left in the device outbox (IndexedDB bayward-outbox/records) but the saved records shown for a moment
    await expect.poll(() => page.evaluate(() => new Promise<string[]>((resolve) => {
      const open = indexedDB.open('bayward-outbox')
      open.onsuccess = () => {
        const req = open.result.transaction('records').objectStore('records').getAll()
        req.onsuccess = () => resolve(req.result.filter((r: { status: string }) => r.status !== 'saved').map((r: { key: string }) => r.key))
      }
    }))).toEqual([])
    await context.close()
  })

  it('a swap kept offline whose battery someone else took meanwhile shows as refused, with the server\'s reason', async () => {
    const swap = await swapFixture()
    const { context, page } = await signedInContext(people.technician!, '/swap')
    await fillSwap(page, swap.codes)
    await context.setOffline(true)
    await page.keyboard.press('Enter')
    await page.locator('[data-outbox-state="kept"]').waitFor()

    const other = await signIn(people.other!)
    const elsewhere = await fittedTruck(siteId, { hourMeter: 10 })
    const taken = await other.post('/api/battery-room/swaps', { truckId: elsewhere.id, batteryOutId: null, batteryInId: swap.fresh.id, hourMeter: 11, idempotencyKey: crypto.randomUUID() })
    expect(taken.status, JSON.stringify(taken.body)).toBe(201)

    await context.setOffline(false)
    await page.evaluate(() => window.dispatchEvent(new Event('online')))
    await page.locator('[data-outbox-state="refused"]').getByText('someone has just taken it').waitFor({ timeout: 20_000 })
    await page.getByRole('alert').getByText('1 record refused when it arrived').waitFor()
    await page.getByText(`Battery ${swap.codes[2]} into truck ${swap.codes[0]}`).first().waitFor()
    await page.screenshot({ path: 'screenshots/outbox-refused-phone.png', fullPage: true })
    expect(await useTestDb().select().from(tables.batterySwaps).where(eq(tables.batterySwaps.batteryInId, swap.fresh.id))).toHaveLength(1)

    await page.getByRole('button', { name: 'Dismiss' }).click()
    await page.locator('[data-outbox-banner]').waitFor({ state: 'detached' })
    await context.close()
  })
})

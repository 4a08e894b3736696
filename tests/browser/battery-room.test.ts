import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import { asc, eq } from 'drizzle-orm'
import type { Browser, Page } from 'playwright-core'
import { builtServer } from '../support/http'
import { area, battery, closeTestDb, site, tables, user, useTestDb } from '../support/db'
import { DESKTOP, PHONE, launchChromium, signInAt } from '../support/chromium'
import { fittedTruck, openCharge, pastCharge, putInTruck, qualify, readyBattery, roomCharger, storedBattery, tagFor } from '../support/battery-room'

await setup(builtServer)

let browser: Browser
let siteId: string
let areaId: string
let chargerId: string
const people: Record<string, { id: string, email: string, password: string }> = {}

beforeAll(async () => {
  browser = await launchChromium()
  siteId = (await site({ name: `Millbrook DC test ${Date.now()}` })).id
  areaId = (await area({ siteId, name: `Charge room North ${Date.now()}` })).id
  chargerId = (await roomCharger(siteId, areaId)).id
  await tagFor('charger', chargerId, siteId)
  people.operator = await user({ siteId, roles: ['operator'], name: 'Dana Operator' })
  people.technician = await user({ siteId, roles: ['technician'], name: 'Rui Technician' })
  await qualify(people.operator.id)
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

const signedIn = async (who: { email: string, password: string }, path: string, viewport = PHONE): Promise<Page> =>
  (await signInAt(browser, who, path, viewport)).page

describe('battery room on the floor', () => {
  it('an operator at phone width changes a battery by typing three codes', async () => {
    const t = await fittedTruck(siteId, { hourMeter: 1200 })
    const out = await battery({ siteId, homeAreaId: areaId })
    await putInTruck(out.id, t.id)
    const fresh = await readyBattery({ siteId, userId: people.technician!.id, chargerId, homeAreaId: areaId })
    const [truckCode, outCode, inCode] = [await tagFor('truck', t.id, siteId), await tagFor('battery', out.id, siteId), await tagFor('battery', fresh.id, siteId)]

    const page = await signedIn(people.operator!, '/swap')
    await expect.poll(() => page.evaluate(() => (document.activeElement as HTMLInputElement | null)?.labels?.[0]?.textContent ?? '')).toContain('Truck')
    await page.keyboard.type(truckCode!.toLowerCase().replace('-', ''))
    await page.keyboard.press('Enter')
    await expect.poll(() => page.getByText(`holds ${outCode}`).count()).toBeGreaterThan(0)
    await page.keyboard.type(outCode!)
    await page.keyboard.press('Enter')
    await page.getByLabel('3 · Battery going in').waitFor()
    await expect.poll(() => page.evaluate(() => (document.activeElement as HTMLInputElement | null)?.labels?.[0]?.textContent ?? '')).toContain('Battery going in')
    // the form names the battery the Bay board would hand out for this truck; one tap puts it in the field
    const suggestion = page.getByTestId('swap-suggestion')
    await expect.poll(() => suggestion.innerText()).toContain(`The Bay board suggests ${fresh.serial}`)
    await suggestion.getByRole('button', { name: `Use ${inCode}` }).click()
    await expect.poll(() => suggestion.count()).toBe(0)
    await expect.poll(() => page.evaluate(() => (document.activeElement as HTMLInputElement | null)?.labels?.[0]?.textContent ?? '')).toContain('Hour meter')
    await page.keyboard.type('1234.5')
    await page.screenshot({ path: 'screenshots/battery-room-swap-phone.png', fullPage: true })
    await page.keyboard.press('Enter')
    await page.getByRole('status').getByText(`Battery ${inCode} is in truck ${t.fleetNumber}`).waitFor()
    expect((await storedBattery(fresh.id)).currentTruckId).toBe(t.id)
    // its tag page says which truck it is in; the identity line does not repeat the heading
    await page.goto(url(`/t/${inCode}`))
    await expect.poll(() => page.getByTestId('asset-state').innerText()).toBe(`In truck ${t.fleetNumber}`)
    const heading = await page.getByRole('heading', { level: 1 }).innerText()
    expect(await page.locator('header p.mt-1').innerText()).not.toContain(heading)
    await page.context().close()
  })

  it('opened from a ready battery\'s tag, the change form holds the battery and waits at the truck field', async () => {
    const fresh = await readyBattery({ siteId, userId: people.technician!.id, chargerId, homeAreaId: areaId })
    const code = await tagFor('battery', fresh.id, siteId)
    const page = await signedIn(people.operator!, `/swap?in=${code}`)
    await expect.poll(() => page.getByLabel('3 · Battery going in').inputValue()).toBe(code)
    await expect.poll(() => page.evaluate(() => (document.activeElement as HTMLInputElement | null)?.labels?.[0]?.textContent ?? '')).toContain('Truck')
    await page.context().close()
  })

  it('a technician enters a 12-cell reading with the keyboard only', async () => {
    const b = await battery({ siteId, homeAreaId: areaId, voltage: 24, cellCount: 12 })
    await pastCharge({ siteId, userId: people.technician!.id, batteryId: b.id, chargerId, endedHoursAgo: 1 })
    const code = await tagFor('battery', b.id, siteId)
    const page = await signedIn(people.technician!, '/check')
    await expect.poll(() => page.evaluate(() => (document.activeElement as HTMLInputElement | null)?.labels?.[0]?.textContent ?? '')).toContain('Battery')
    await page.keyboard.type(code)
    await page.keyboard.press('Enter')
    await expect.poll(() => page.evaluate(() => (document.activeElement as HTMLInputElement | null)?.labels?.[0]?.textContent ?? '')).toContain('Electrolyte temperature')
    await page.keyboard.type('90')
    await page.keyboard.press('Enter')
    // typed as a keypad gives them: no decimal point, a comma, an empty cell taking the one before, one nonsense entry
    const entries = ['1280', '1.275', '1,280', '', '1230', '2.5', '1.280', '1280', '', '1.278', '1282', '1280', '1279']
    for (const entry of entries) {
      if (entry) await page.keyboard.type(entry)
      await page.keyboard.press('Enter')
      if (entry === '2.5') {
        await page.getByRole('alert').filter({ hasText: 'outside 1.000–1.400' }).waitFor()
        await page.keyboard.press('Control+A')
        await page.keyboard.press('Backspace')
      }
    }
    await expect.poll(() => page.evaluate(() => (document.activeElement as HTMLElement | null)?.innerText ?? '')).toContain('Save check')
    await expect.poll(() => page.getByText('low: 5').count()).toBeGreaterThan(0)
    await page.screenshot({ path: 'screenshots/battery-room-check-phone.png', fullPage: true })
    await page.keyboard.press('Enter')
    await page.getByRole('status').getByText('Weak cell: 5').waitFor()
    const [check] = await useTestDb().select().from(tables.electrolyteChecks).where(eq(tables.electrolyteChecks.batteryId, b.id))
    const cells = await useTestDb().select().from(tables.cellReadings).where(eq(tables.cellReadings.checkId, check!.id)).orderBy(asc(tables.cellReadings.cellNumber))
    expect(cells.map(c => c.specificGravity)).toEqual([1.28, 1.275, 1.28, 1.28, 1.23, 1.28, 1.28, 1.28, 1.278, 1.282, 1.28, 1.279])
    expect(cells.every(c => c.temperatureF === 90)).toBe(true)
    // 1.280 at 90 °F corrects to 1.284 to 80 °F (0.004 per 10 °F) [pub, in several battery and engine manuals]
    expect(cells[0]!.correctedSg).toBeCloseTo(1.284, 6)
    expect(check).toMatchObject({ scope: 'every_cell', lowCellCount: 1, afterCharge: true })
    await page.context().close()
  })

  it('a charged lead-acid battery scanned at the charge form gets a line to check it is the one at the charger', async () => {
    const ready = await readyBattery({ siteId, userId: people.technician!.id, chargerId, homeAreaId: areaId })
    const flat = await battery({ siteId, homeAreaId: areaId })
    const [readyCode, flatCode] = [await tagFor('battery', ready.id, siteId), await tagFor('battery', flat.id, siteId)]
    const page = await signedIn(people.technician!, `/charge?battery=${readyCode}`)
    await expect.poll(() => page.getByText(/Bayward has this battery as charged/).innerText()).toContain('Bayward has this battery as charged')
    await page.goto(url(`/charge?battery=${flatCode}`))
    await page.getByLabel('Charger').first().waitFor()
    await expect.poll(() => page.getByText(`${flat.serial} · Needs charge`).count()).toBeGreaterThan(0)
    expect(await page.getByText(/Bayward has this battery as charged/).count()).toBe(0)
    await page.context().close()
  })

  it('the Bay board\'s countdowns hydrate without a mismatch on a device whose clock is minutes off the server\'s', async () => {
    const cooling = await battery({ siteId, homeAreaId: areaId })
    await pastCharge({ siteId, userId: people.technician!.id, batteryId: cooling.id, chargerId, endedHoursAgo: 1 })
    const { context, page } = await signInAt(browser, people.technician!, '/scan', PHONE)
    // the tablet's clock runs seven minutes fast: its countdowns differ from the server's render by seven minutes
    await context.clock.install({ time: Date.now() + 7 * 60_000 })
    const errors: string[] = []
    page.on('console', m => m.type() === 'error' && errors.push(m.text()))
    await page.goto(url('/bay'))
    await page.getByRole('heading', { name: 'Bay board' }).waitFor()
    await page.waitForLoadState('networkidle')
    expect(errors.filter(e => /hydration/i.test(e))).toEqual([])
    // once running, the board counts on the device's own clock
    await expect.poll(() => page.getByText(/Ready in 6 h 5\d min/).count()).toBeGreaterThan(0)
    await context.close()
  })

  it('screenshots of the Bay board and the forms, phone and desktop', async () => {
    const tech = people.technician!.id
    const t = await fittedTruck(siteId, { fleetNumber: `MB-${String(Date.now()).slice(-3)}` })
    await tagFor('truck', t.id, siteId)
    for (let i = 0; i < 4; i++) await tagFor('battery', (await readyBattery({ siteId, userId: tech, chargerId, homeAreaId: areaId, restedHours: 9 + i * 3 })).id, siteId)
    for (let i = 0; i < 2; i++) {
      const b = await battery({ siteId, homeAreaId: areaId })
      await pastCharge({ siteId, userId: tech, batteryId: b.id, chargerId, endedHoursAgo: 1 + i * 3 })
    }
    const charging = await battery({ siteId, homeAreaId: areaId })
    await openCharge({ siteId, userId: tech, batteryId: charging.id, chargerId: (await roomCharger(siteId, areaId)).id, startedHoursAgo: 3 })
    await battery({ siteId, homeAreaId: areaId })
    const held = await battery({ siteId, homeAreaId: areaId })
    await useTestDb().update(tables.batteries).set({ outOfService: true, outOfServiceReason: 'Cracked cell cover' }).where(eq(tables.batteries.id, held.id))
    const code = await tagFor('battery', charging.id, siteId)

    for (const [name, viewport] of [['phone', PHONE], ['desktop', DESKTOP]] as const) {
      const page = await signedIn(people.technician!, '/bay', viewport)
      await page.getByRole('heading', { name: 'Bay board' }).waitFor()
      // the option also names the truck's pre-shift state; the truck is picked by its id
      await page.getByLabel('Battery for truck').selectOption(t.id)
      await page.getByLabel('Suggested battery').waitFor()
      await page.screenshot({ path: `screenshots/battery-room-bay-${name}.png`, fullPage: true })
      await page.goto(url(`/charge?battery=${code}`))
      await page.getByLabel('Amp-hours returned (Ah)').waitFor()
      await page.screenshot({ path: `screenshots/battery-room-charge-${name}.png`, fullPage: true })
      if (name === 'desktop') {
        await page.goto(url('/swap'))
        await page.waitForLoadState('networkidle')
        await page.screenshot({ path: 'screenshots/battery-room-swap-desktop.png', fullPage: true })
        await page.goto(url(`/check?battery=${code}`))
        await page.getByLabel('Cell 1 specific gravity').waitFor()
        await page.getByLabel('Water added (US gal)').fill('0.5')
        await page.screenshot({ path: 'screenshots/battery-room-check-desktop.png', fullPage: true })
        // a wall screen opens the wall view directly: the server draws it in the wall layout, so the page
        // hydrates without a mismatch; leaving the wall view brings the app's navigation back
        const errors: string[] = []
        page.on('console', m => m.type() === 'error' && errors.push(m.text()))
        await page.goto(url('/bay?wall=1'))
        await page.getByRole('heading', { name: 'Bay board' }).waitFor()
        await page.waitForLoadState('networkidle')
        await page.screenshot({ path: 'screenshots/battery-room-bay-wall.png', fullPage: true })
        expect(errors.filter(e => /hydration/i.test(e))).toEqual([])
        expect(await page.getByRole('link', { name: 'Home', exact: true }).count()).toBe(0)
        await page.getByRole('link', { name: 'Leave wall view' }).click()
        await expect.poll(() => page.getByRole('link', { name: 'Home', exact: true }).count()).toBeGreaterThan(0)
      }
      await page.context().close()
    }
  })
})

import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import { eq } from 'drizzle-orm'
import type { Browser, Page, Response } from 'playwright-core'
import { builtServer } from '../support/http'
import { area, battery, closeTestDb, site, tables, user, useTestDb } from '../support/db'
import { PHONE, launchChromium, signInAt } from '../support/chromium'
import { fittedTruck, pastCharge, putInTruck, qualify, readyBattery, roomCharger, tagFor } from '../support/battery-room'

await setup(builtServer)

let browser: Browser
let siteId: string
let areaId: string
let chargerId: string
let technician: { id: string, email: string, password: string }

beforeAll(async () => {
  browser = await launchChromium()
  siteId = (await site({ name: `Fenwick aisle ${Date.now()}` })).id
  areaId = (await area({ siteId, name: `Charge room East ${Date.now()}` })).id
  chargerId = (await roomCharger(siteId, areaId)).id
  technician = await user({ siteId, roles: ['technician'], name: 'Noor Technician' })
  await qualify(technician.id)
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

const focusedLabel = (page: Page) => page.evaluate(() => (document.activeElement as HTMLInputElement | null)?.labels?.[0]?.textContent ?? '')
const nonceOf = (policy: string | null | undefined) => /'nonce-([^']+)'/.exec(policy ?? '')?.[1] ?? null
// the device's own copies (IndexedDB bayward-device/kv), by key
const deviceKeys = (page: Page) => page.evaluate(() => new Promise<string[]>((resolve, reject) => {
  const open = indexedDB.open('bayward-device')
  open.onerror = () => reject(open.error)
  open.onsuccess = () => {
    const req = open.result.transaction('kv').objectStore('kv').getAllKeys()
    req.onsuccess = () => resolve(req.result.map(String))
  }
}))

// A page load with no signal must come from the service worker's shell, with a nonce of its own.
async function expectFreshShell(page: Page, res: Response | null, kept: string | null, seen: Set<string>) {
  expect(res?.fromServiceWorker()).toBe(true)
  expect(res?.headers()['x-bayward-shell']).toBe('offline')
  const nonce = nonceOf(res?.headers()['content-security-policy'])
  expect(nonce).toBeTruthy()
  expect(nonce).not.toBe(kept)
  expect(seen.has(nonce!)).toBe(false)
  seen.add(nonce!)
  // every script the page carries bears this load's nonce, and none was refused
  expect(await page.evaluate(() => [...document.querySelectorAll('script')].filter(s => !s.type.includes('json')).map(s => s.nonce))).toEqual(expect.arrayContaining([nonce]))
  expect(await page.evaluate(() => (window as unknown as { __csp: string[] }).__csp)).toEqual([])
}

describe('an app that opens with no signal', () => {
  it('loaded once, then offline with the tab closed: opens, resolves a tag seen before, keeps a swap and a check, stores each once when back online', async () => {
    const t = await fittedTruck(siteId, { hourMeter: 500 })
    const out = await battery({ siteId, homeAreaId: areaId })
    await putInTruck(out.id, t.id)
    const fresh = await readyBattery({ siteId, userId: technician.id, chargerId, homeAreaId: areaId })
    const weak = await battery({ siteId, homeAreaId: areaId, voltage: 24, cellCount: 12 })
    await pastCharge({ siteId, userId: technician.id, batteryId: weak.id, chargerId, endedHoursAgo: 1 })
    const [truckCode, outCode, inCode, weakCode] = [await tagFor('truck', t.id, siteId), await tagFor('battery', out.id, siteId), await tagFor('battery', fresh.id, siteId), await tagFor('battery', weak.id, siteId)]

    const { context, page } = await signInAt(browser, technician, '/scan', PHONE, 'allow')
    await context.addInitScript(() => {
      (window as unknown as { __csp: string[] }).__csp = []
      document.addEventListener('securitypolicyviolation', e => (window as unknown as { __csp: string[] }).__csp.push(`${e.violatedDirective} ${e.blockedURI}`))
    })
    await expect.poll(() => page.evaluate(() => !!navigator.serviceWorker.controller), { timeout: 30_000 }).toBe(true)
    // online, the technician opens the four tags once: the device keeps them and the floor look-ups of them
    for (const code of [truckCode, outCode, inCode, weakCode]) {
      await page.goto(url(`/t/${code}`))
      await page.getByTestId('asset-state').waitFor()
      await expect.poll(async () => (await deviceKeys(page)).some(k => k.startsWith('seen:floor:') && k.endsWith(`:${code}`))).toBe(true)
    }
    const kept = nonceOf(await page.evaluate(async () => (await (await caches.open('bayward-shell')).match('/offline-shell'))?.headers.get('content-security-policy')))
    expect(kept).toBeTruthy()

    await context.setOffline(true)
    await page.close()
    const nonces = new Set<string>()
    const again = await context.newPage()
    await expectFreshShell(again, await again.goto(url('/scan')), kept, nonces)
    await again.getByRole('heading', { name: 'Scan a tag' }).waitFor()
    await again.getByLabel('Type the code on the label').fill(truckCode)
    await again.getByRole('button', { name: 'Open', exact: true }).click()
    await again.locator('[data-seen-as-of]').getByText('No connection. As of').waitFor()
    await again.screenshot({ path: 'screenshots/offline-tag-phone.png', fullPage: true })
    await again.getByRole('link', { name: 'Change its battery' }).click()
    await expect.poll(() => focusedLabel(again)).toContain('Battery coming out')
    await again.getByText('No connection: as this device last saw it').first().waitFor()
    await again.keyboard.type(outCode)
    await again.keyboard.press('Enter')
    await expect.poll(() => focusedLabel(again)).toContain('Battery going in')
    await again.keyboard.type(inCode)
    await again.keyboard.press('Enter')
    await expect.poll(() => focusedLabel(again)).toContain('Hour meter')
    await again.keyboard.type('512')
    await again.keyboard.press('Enter')
    await again.locator('[data-outbox-state="kept"]').waitFor()
    await again.screenshot({ path: 'screenshots/offline-swap-kept-phone.png', fullPage: true })

    await expectFreshShell(again, await again.goto(url(`/check?battery=${weakCode}`)), kept, nonces)
    await expect.poll(() => focusedLabel(again)).toContain('Electrolyte temperature')
    await again.keyboard.type('80')
    await again.keyboard.press('Enter')
    for (let i = 0; i < 12; i++) {
      await again.keyboard.type(i === 4 ? '1230' : '1280')
      await again.keyboard.press('Enter')
    }
    await expect.poll(() => again.evaluate(() => (document.activeElement as HTMLElement | null)?.innerText ?? '')).toContain('Save check')
    await again.keyboard.press('Enter')
    await again.locator('[data-outbox-state="kept"]').waitFor()
    await again.getByText('2 records kept on this device').waitFor()
    // only the fixture's swap that put the outgoing battery in the truck is stored so far
    const swapsOf = async () => (await useTestDb().select().from(tables.batterySwaps).where(eq(tables.batterySwaps.truckId, t.id))).filter(s => s.batteryInId !== out.id)
    expect(await swapsOf()).toHaveLength(0)

    await context.setOffline(false)
    // A device's browser says 'online' when its connection comes back; Chromium's emulated offline network
    // does not (navigator.onLine stays true throughout), which left the records to the half-minute retry
    // and this wait racing it. So the page is told, as a device's browser would tell it.
    await again.evaluate(() => window.dispatchEvent(new Event('online')))
    await again.locator('[data-outbox-banner]').getByText(/Sent: 2 kept records saved/).waitFor({ timeout: 30_000 })
    const swaps = await swapsOf()
    expect(swaps.map(s => [s.batteryOutId, s.batteryInId])).toEqual([[out.id, fresh.id]])
    const checks = await useTestDb().select().from(tables.electrolyteChecks).where(eq(tables.electrolyteChecks.batteryId, weak.id))
    expect(checks).toHaveLength(1)
    expect(await useTestDb().select().from(tables.cellReadings).where(eq(tables.cellReadings.checkId, checks[0]!.id))).toHaveLength(12)
    await context.close()
  })
  it('in Spanish: the words are part of the app the device keeps, so the page opened with no signal is still in Spanish', async () => {
    const ines = await user({ siteId, roles: ['technician'], name: 'Inés Técnica' })
    await qualify(ines.id)
    await useTestDb().update(tables.users).set({ language: 'es' }).where(eq(tables.users.id, ines.id))
    const t = await fittedTruck(siteId, { hourMeter: 700 })
    const out = await battery({ siteId, homeAreaId: areaId })
    await putInTruck(out.id, t.id)
    const truckCode = await tagFor('truck', t.id, siteId)

    const { context, page } = await signInAt(browser, ines, '/scan', PHONE, 'allow')
    await page.getByRole('heading', { name: 'Escanear una etiqueta' }).waitFor()
    await expect.poll(() => page.evaluate(() => !!navigator.serviceWorker.controller), { timeout: 30_000 }).toBe(true)
    const i18nRequests: string[] = []
    context.on('request', r => (new URL(r.url()).pathname.startsWith('/_i18n/') ? i18nRequests.push(r.url()) : undefined))
    await page.goto(url(`/t/${truckCode}`))
    await page.getByTestId('asset-state').waitFor()
    await expect.poll(async () => (await deviceKeys(page)).some(k => k.startsWith('seen:floor:') && k.endsWith(`:${truckCode}`))).toBe(true)

    await context.setOffline(true)
    await page.close()
    const again = await context.newPage()
    const res = await again.goto(url('/scan'))
    expect(res?.headers()['x-bayward-shell']).toBe('offline')
    await again.getByRole('heading', { name: 'Escanear una etiqueta' }).waitFor()
    expect(await again.getAttribute('html', 'lang')).toBe('es')
    await again.goto(url(`/t/${truckCode}`))
    await again.locator('[data-seen-as-of]').getByText('Sin conexión. Así estaba').waitFor()
    await again.getByRole('link', { name: 'Cambiar su batería' }).click()
    await expect.poll(() => focusedLabel(again)).toContain('Batería que sale')
    await again.getByText('Sin conexión: como lo vio este equipo').first().waitFor()
    await again.getByText('Montacargas en su lugar, freno puesto').waitFor()
    expect(i18nRequests).toEqual([])
    await context.close()
  })
})

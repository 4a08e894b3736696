import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import { mkdirSync } from 'node:fs'
import { eq } from 'drizzle-orm'
import type { Browser, Page } from 'playwright-core'
import { builtServer } from '../support/http'
import { area, battery, charger, closeTestDb, site, tables, truck, user, useTestDb } from '../support/db'
import { DESKTOP, PHONE, launchChromium, signInAt } from '../support/chromium'
import { CHARGING_KEYS, daysFrom, endedCharges, todayIn } from '../support/due'

process.env.BAYWARD_MAIL_TICK_SECONDS = '0'
await setup(builtServer)

let browser: Browser
let siteId: string
let areaId: string
let fleetNumber: string
const people: Record<string, { id: string, email: string, password: string }> = {}
const today = todayIn()

// A small charging area with a day's log waiting for sign-off, and an LP truck whose yearly
// emissions test is overdue (tested 13 months ago).
beforeAll(async () => {
  browser = await launchChromium()
  mkdirSync('screenshots', { recursive: true })
  siteId = (await site({ name: `Millbrook DC ${Date.now()}` })).id
  areaId = (await area({ siteId, kind: 'charging_area', name: `North charge room ${Date.now()}`, floorAreaFt2: 900, roomVolumeFt3: 14400, installedExhaustCfm: 950 })).id
  people.operator = await user({ siteId, roles: ['operator'], name: 'Dana Operator' })
  people.technician = await user({ siteId, roles: ['technician'], name: 'Rui Technician' })
  people.facilities = await user({ siteId, roles: ['facilities_lead'], name: 'Femi Facilities' })
  people.safety = await user({ siteId, roles: ['safety_lead'], name: 'Sam Safety' })
  people.admin = await user({ siteId, roles: ['admin'], name: 'Ada Admin' })
  const db = useTestDb()
  for (let i = 1; i <= 6; i++) {
    const c = await charger({ siteId, areaId, name: `C-${i}`, outputVoltage: 36, maxCapacityAh: 900, chargerType: i <= 2 ? 'iui' : 'iu' })
    const b = await battery({ siteId, homeAreaId: areaId, serial: `B36-${100 + i}`, capacityAh: 750 + 25 * i })
    await db.update(tables.batteries).set({ createdAt: new Date(Date.now() - 20 * 86_400_000) }).where(eq(tables.batteries.id, b.id))
    await endedCharges(siteId, b.id, c.id, people.technician.id, i % 2 ? [60, 48, 36, 24, 12] : [30])
  }
  const t = await truck({ siteId, power: 'lp_gas', truckClass: 5, systemVoltage: null, minBatteryWeightLb: null, maxBatteryWeightLb: null, allowedChemistries: [], fleetNumber: `LP-${Date.now() % 10000}` })
  fleetNumber = t.fleetNumber
  const testedOn = daysFrom(today, -395)
  await db.insert(tables.emissionsTests).values({
    siteId, userId: people.facilities.id, truckId: t.id, testedOn, testerName: 'Ines Varga', coIdlePct: 0.4, coHighIdlePct: 0.3,
    passed: true, nextDueOn: daysFrom(testedOn, 365),
  })
  // yesterday's log, filled in by the technician, one failed item
  const [template] = await db.insert(tables.checklistTemplates).values({
    siteId, areaKind: 'charging_area', cadence: 'daily', title: 'Charging area — daily check',
    items: CHARGING_KEYS.map(key => ({ key, label: key.replace(/_/g, ' ').replace(/^./, c => c.toUpperCase()) })),
  }).returning()
  const [log] = await db.insert(tables.areaLogs).values({ siteId, areaId, templateId: template!.id, cadence: 'daily', periodStart: daysFrom(today, -1) }).returning()
  await db.insert(tables.areaLogEntries).values(CHARGING_KEYS.map(itemKey => ({
    siteId, userId: people.technician!.id, logId: log!.id, itemKey,
    result: itemKey === 'floor_clean_dry' ? 'fail' as const : 'pass' as const, note: itemKey === 'floor_clean_dry' ? 'Water by C-3; mopped.' : '',
  })))
}, 120_000)
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

const signedIn = async (who: { email: string, password: string }, path: string, viewport = PHONE): Promise<Page> =>
  (await signInAt(browser, who, path, viewport)).page

const shot = (page: Page, name: string, viewport: typeof PHONE) =>
  page.screenshot({ path: `screenshots/due-${name}-${viewport === PHONE ? 'phone' : 'desktop'}.png`, fullPage: viewport === DESKTOP })

describe('due list, area logs and the ventilation check in the browser', () => {
  it('the facilities lead\'s home opens on the overdue emissions test, one tap from its form', async () => {
    const page = await signedIn(people.facilities!, '/')
    const now = page.getByTestId('due-now')
    const card = now.locator('[data-due-kind="emissions_test"]').filter({ hasText: fleetNumber })
    await expect.poll(() => card.count()).toBe(1)
    await expect.poll(() => card.textContent()).toContain('Overdue')
    const firstKind = await now.locator('[data-due-kind]').first().getAttribute('data-due-kind')
    expect(firstKind).toBeTruthy()
    await shot(page, 'home-facilities', PHONE)
    await card.click()
    await page.waitForURL(/\/emissions\?truck=/)
    await page.context().close()
  })

  it('the safety lead reviews yesterday\'s log and signs it; the log is locked after', async () => {
    const date = daysFrom(today, -1)
    const page = await signedIn(people.safety!, `/logs?area=${areaId}&date=${date}&review=1`, DESKTOP)
    const day = page.locator(`[data-log-date="${date}"]`)
    await expect.poll(() => day.textContent()).toContain('Awaiting sign-off')
    await expect.poll(() => day.textContent()).toContain('Water by C-3; mopped.')
    await shot(page, 'area-log-review', DESKTOP)
    await day.getByRole('button', { name: 'Review done — sign this day' }).click()
    await expect.poll(() => page.locator(`[data-log-date="${date}"]`).textContent()).toContain('Signed by Sam Safety')
    const [log] = await useTestDb().select().from(tables.areaLogs).where(eq(tables.areaLogs.areaId, areaId))
    expect(log!.signedBy).toBe(people.safety!.id)
    await shot(page, 'area-log-signed', DESKTOP)
    await page.context().close()
  })

  it('a technician who opens the due page sees their own roles\' list, with no "every role" to pick', async () => {
    const page = await signedIn(people.technician!, '/due')
    await expect.poll(() => page.locator('[data-due-group]').count()).toBeGreaterThan(0)
    expect(await page.locator('.card.text-z535-danger').count()).toBe(0)
    const roles = page.locator('form select').first()
    expect(await roles.inputValue()).toBe('')
    expect(await roles.locator('option').allTextContents()).toEqual(['My roles', 'Technician'])
    await page.context().close()
  })

  it('screenshots: each role\'s home, the technician\'s checklist, the due list and the ventilation check', async () => {
    for (const viewport of [PHONE, DESKTOP]) {
      for (const role of ['operator', 'technician', 'facilities', 'safety', 'admin']) {
        const page = await signedIn(people[role]!, '/', viewport)
        await shot(page, `home-${role}`, viewport)
        if (role === 'technician') {
          await page.goto(url(`/logs?area=${areaId}&date=${today}`))
          await page.waitForLoadState('networkidle')
          await page.locator(`[data-item="eyewash_flushed_reachable"] label`).filter({ hasText: 'Pass' }).click()
          await page.locator(`[data-item="ventilation_running"] label`).filter({ hasText: 'Fail' }).click()
          await shot(page, 'area-log-form', viewport)
        }
        if (role === 'safety') {
          await page.goto(url(`/ventilation?area=${areaId}`))
          await page.waitForLoadState('networkidle')
          await expect.poll(() => page.getByLabel('Verdict').textContent()).toContain('Installed exhaust')
          if (viewport === PHONE) {
            // a line a charger, its hydrogen in sight, nothing past the right edge
            const lines = page.getByRole('list', { name: 'Chargers in this area' }).getByRole('listitem')
            expect(await lines.count()).toBeGreaterThan(0)
            expect(await lines.first().textContent()).toMatch(/H₂ [\d.]+ ft³\/min/)
            expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width)
          }
          await shot(page, 'ventilation', viewport)
          await page.goto(url('/due'))
          await page.waitForLoadState('networkidle')
          await shot(page, 'due-list', viewport)
          await page.goto(url(`/logs/report?area=${areaId}&from=${daysFrom(today, -1)}&to=${today}`))
          await page.waitForLoadState('networkidle')
          await shot(page, 'audit-report', viewport)
        }
        await page.context().close()
      }
    }
  }, 180_000)
})

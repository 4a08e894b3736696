import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { mkdirSync } from 'node:fs'
import { eq } from 'drizzle-orm'
import type { Browser } from 'playwright-core'
import { builtServer, signIn } from '../support/http'
import { battery, charger, closeTestDb, refreshReadModels, site, tables, user, useTestDb } from '../support/db'
import { fittedTruck, tagFor } from '../support/battery-room'
import { DESKTOP, PHONE, launchChromium, signInAt } from '../support/chromium'
import { endedCharges, oldBattery } from '../support/due'

await setup(builtServer)

// The lead's due list as groups by kind (phone and desktop), a lead's own schedules as groups of their own, and correcting an electrolyte check from a
// battery's history: the original struck through beside its correction, with why.
let browser: Browser
// the machine that runs these may be busy: wait for the page as long as a person would
const SLOW = { timeout: 15_000 }
let siteId: string
let batteryId: string
let lead: { email: string, password: string, id: string }

beforeAll(async () => {
  browser = await launchChromium()
  mkdirSync('screenshots', { recursive: true })
  siteId = (await site({ name: `Harbor Point DC ${Date.now()}` })).id
  lead = await user({ siteId, roles: ['facilities_lead', 'technician'], name: 'Femi Facilities' })
  const ch = await charger({ siteId })
  for (let i = 0; i < 6; i++) {
    const b = await oldBattery(siteId, 20 + i)
    await endedCharges(siteId, b.id, ch.id, lead.id, i % 2 ? [300, 280, 260, 240, 220, 200] : [40, 30])
    batteryId = b.id
  }
  await useTestDb().insert(tables.electrolyteChecks).values({ siteId, userId: lead.id, batteryId, level: 'ok', waterAddedGal: 0.5, at: new Date(Date.now() - 3_600_000) })
}, 120_000)
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

describe('grouped due list and corrections in the browser', () => {
  for (const viewport of [PHONE, DESKTOP]) {
    it(`the due list shows kinds with counts, worst first, and opens a group (${viewport.width} px)`, async () => {
      const { page, context } = await signInAt(browser, lead, '/due', viewport)
      const groups = page.getByTestId('due-groups')
      await expect.poll(() => groups.locator('[data-due-group]').count(), SLOW).toBeGreaterThan(1)
      const first = groups.locator('[data-due-group]').first()
      expect(await first.textContent()).toMatch(/Overdue/)
      expect(await first.textContent()).toMatch(/\d+ overdue/)
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(viewport.width)
      await first.getByRole('button').first().click()
      await expect.poll(() => first.getByRole('button').first().getAttribute('aria-expanded'), SLOW).toBe('true')
      const rows = viewport === PHONE ? first.locator('[data-due-kind]') : first.locator('table tbody tr')
      await expect.poll(() => rows.count(), SLOW).toBeGreaterThan(0)
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(viewport.width)
      await page.screenshot({ path: `screenshots/due-groups-${viewport === PHONE ? 'phone' : 'desktop'}.png`, fullPage: true })
      await context.close()
    })
  }

  it('each schedule a lead added is its own group under its title, and opens to its own rows (390 px)', async () => {
    const api = await signIn(lead)
    const ids: string[] = []
    for (const title of ['Battery cable and plug inspection', 'Spill kit restock check']) {
      const res = await api.post('/api/schedules/custom', { siteId, title, subjectKind: title.startsWith('Battery') ? 'battery' : 'site', every: 6, unit: 'month', dueSoonDays: 7, responsibleRole: 'facilities_lead', source: 'Common practice' })
      expect(res.status, JSON.stringify(res.body)).toBe(201)
      ids.push(res.body.item.id)
    }
    const { page, context } = await signInAt(browser, lead, '/due', PHONE)
    const cables = page.locator(`[data-due-group="custom:${ids[0]}"]`)
    await expect.poll(() => cables.count(), SLOW).toBe(1)
    expect(await cables.textContent()).toMatch(/Battery cable and plug inspection.*6 upcoming/)
    expect(await page.locator(`[data-due-group="custom:${ids[1]}"]`).textContent()).toMatch(/Spill kit restock check.*1 upcoming/)
    await cables.getByRole('button').first().click()
    const rows = cables.locator('[data-due-kind]:visible')
    await expect.poll(() => rows.count(), SLOW).toBe(6)
    for (const text of await rows.allTextContents()) expect(text).toMatch(/Battery cable and plug inspection/)
    // the Task filter offers each by its title; picking one leaves its group alone on the page
    const task = page.getByTestId('due-filter-kind')
    expect(await task.locator('optgroup option').allTextContents()).toEqual(['Every schedule a lead added', 'Battery cable and plug inspection', 'Spill kit restock check'])
    await task.selectOption(`custom:${ids[1]}`)
    await expect.poll(() => page.locator('[data-due-group]').evaluateAll(els => els.map(e => e.getAttribute('data-due-group'))), SLOW).toEqual([`custom:${ids[1]}`])
    expect(await task.inputValue()).toBe(`custom:${ids[1]}`)
    // the one group left opens by itself
    const spill = page.locator(`[data-due-group="custom:${ids[1]}"]`)
    await expect.poll(() => spill.locator('[data-due-kind]:visible').count(), SLOW).toBe(1)
    expect(await page.getByRole('link', { name: 'Export CSV' }).getAttribute('href')).toContain(`schedule=${ids[1]}`)
    // the filter is in the address: the page opened again (back from a form, a link sent on) shows the same list
    await expect.poll(() => new URL(page.url()).searchParams.get('schedule'), SLOW).toBe(ids[1])
    await page.reload()
    await expect.poll(() => page.getByTestId('due-filter-kind').inputValue(), SLOW).toBe(`custom:${ids[1]}`)
    await expect.poll(() => page.locator('[data-due-group]').evaluateAll(els => els.map(e => e.getAttribute('data-due-group'))), SLOW).toEqual([`custom:${ids[1]}`])
    await context.close()
  })

  it('from the battery\'s tag, its whole history offers Correct this; the original is struck through beside the correction', async () => {
    const code = await tagFor('battery', batteryId, siteId)
    const { page, context } = await signInAt(browser, lead, `/t/${code}`, PHONE)
    // the tag page lists the last events and links to all of them, where a record is corrected
    await page.getByRole('link', { name: 'All events, and correcting a record' }).click(SLOW)
    await expect.poll(() => new URL(page.url()).pathname + new URL(page.url()).hash, SLOW).toBe(`/batteries/${batteryId}#history`)
    const row = page.locator('li').filter({ hasText: 'Electrolyte level check' }).first()
    await row.getByRole('button', { name: 'Correct this' }).click()
    const form = page.getByRole('form', { name: /Correct this electrolyte check/ })
    expect(await form.textContent()).toMatch(/A correction changes the record, not the floor/)
    expect(await form.textContent()).toMatch(/water only after charging/)
    await form.locator('input[name="waterAddedGal"]').fill('1.5')
    await form.locator('textarea[name="reason"]').fill('Read the jug wrong.')
    await form.getByRole('button', { name: 'Save correction' }).click()
    await expect.poll(() => page.getByText('Why corrected: Read the jug wrong.').count(), SLOW).toBe(1)
    await expect.poll(() => page.locator('.line-through').filter({ hasText: 'Electrolyte level check' }).count(), SLOW).toBe(1)
    const rows = await useTestDb().select().from(tables.electrolyteChecks).where(eq(tables.electrolyteChecks.batteryId, batteryId))
    expect(rows).toHaveLength(2)
    expect(rows.find(r => r.correctsId)?.waterAddedGal).toBe(1.5)
    await page.screenshot({ path: 'screenshots/battery-history-correction-phone.png', fullPage: true })
    await context.close()
  })

  it('a battery change corrected on the truck\'s page to the battery typed by its serial moves both batteries', async () => {
    const truck = await fittedTruck(siteId)
    const wrong = await battery({ siteId })
    const right = await battery({ siteId })
    await useTestDb().insert(tables.batterySwaps).values({ siteId, userId: lead.id, truckId: truck.id, batteryInId: wrong.id, hourMeter: 12, at: new Date(Date.now() - 600_000) })
    await refreshReadModels(siteId, [{ kind: 'battery', id: wrong.id }, { kind: 'truck', id: truck.id }])
    const { page, context } = await signInAt(browser, lead, `/trucks/${truck.id}`, DESKTOP)
    const row = page.locator('li').filter({ hasText: `Battery ${wrong.serial} fitted` }).first()
    await row.getByRole('button', { name: 'Correct this' }).click()
    const form = page.getByRole('form', { name: /Correct this battery change/ })
    expect(await form.locator('input[name="batteryInId"]').inputValue()).toBe(wrong.serial)
    await form.locator('input[name="batteryInId"]').fill(right.serial)
    await form.locator('textarea[name="reason"]').fill('Scanned the battery beside it.')
    await form.getByRole('button', { name: 'Save correction' }).click()
    await expect.poll(() => page.getByText('Why corrected: Scanned the battery beside it.').count(), SLOW).toBe(1)
    const placeOf = async (id: string) => (await useTestDb().select().from(tables.batteryStatus).where(eq(tables.batteryStatus.batteryId, id)))[0]?.truckId ?? null
    expect(await placeOf(right.id)).toBe(truck.id)
    expect(await placeOf(wrong.id)).toBeNull()
    await page.screenshot({ path: 'screenshots/truck-history-correction-desktop.png', fullPage: true })
    await context.close()
  })

  it('on a metric site in Spanish, a charge is corrected in °C and stored in °F, with the cautions in Spanish', async () => {
    const metric = (await site({ name: `Fenwick Test ${Date.now()}`, unitSystem: 'metric' })).id
    const tech = await user({ siteId: metric, roles: ['technician'], name: 'Tomás Técnico' })
    await useTestDb().update(tables.users).set({ language: 'es' }).where(eq(tables.users.id, tech.id))
    const b = await battery({ siteId: metric })
    await endedCharges(metric, b.id, (await charger({ siteId: metric })).id, tech.id, [2])
    const { page, context } = await signInAt(browser, tech, `/batteries/${b.id}`, PHONE)
    const row = page.locator('li').filter({ has: page.getByRole('button', { name: /^(Correct this|Corregir)/ }) }).first()
    await row.getByRole('button', { name: /^(Correct this|Corregir)/ }).click()
    const form = page.getByRole('form', { name: /Corregir: carga/ })
    expect(await form.textContent()).toMatch(/Una corrección cambia el registro, no el piso/)
    const temp = form.locator('input[name="endTempF"]')
    // stored 95 °F = 35 °C (°C = (°F − 32) × 5/9)
    expect(await temp.inputValue()).toBe('35')
    expect(await form.textContent()).toMatch(/Temperatura de la batería al final \(°C\)/)
    await temp.fill('40')
    await form.locator('textarea[name="reason"]').fill('Leí mal el termómetro.')
    await form.getByRole('button', { name: 'Guardar corrección' }).click()
    await expect.poll(async () => (await useTestDb().select().from(tables.chargeSessions).where(eq(tables.chargeSessions.batteryId, b.id))).length, SLOW).toBe(2)
    const rows = await useTestDb().select().from(tables.chargeSessions).where(eq(tables.chargeSessions.batteryId, b.id))
    // 40 °C = 104 °F
    expect(rows.find(r => r.correctsId)?.endTempF).toBeCloseTo(104, 6)
    await page.screenshot({ path: 'screenshots/battery-history-correction-metric-es-phone.png', fullPage: true })
    await context.close()
  })
})

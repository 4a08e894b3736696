import { mkdirSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import type { Browser } from 'playwright-core'
import { eq } from 'drizzle-orm'
import { unit } from 'mathjs'
import { builtServer } from '../support/http'
import { closeTestDb, site, tables, user, useTestDb } from '../support/db'
import { PHONE, launchChromium, signInAt } from '../support/chromium'
import { freshCylinder, fuelStation, lpTransferQualification } from '../support/fuel'
import { PREFILL_INSPECTION_ITEMS } from '../../shared/utils/lp-gas'
import es from '../../i18n/locales/es.json'

await setup(builtServer)

let browser: Browser
let serial: string
let secondSerial: string
let technician: { email: string, password: string }

// A Spanish-speaking technician at a metric site refills by weight in kg: the scale readings are typed in kg and
// stored in pounds; the server's overfill refusal is read in Spanish with its weights in kg.
beforeAll(async () => {
  mkdirSync('screenshots', { recursive: true })
  browser = await launchChromium()
  const siteId = (await site({ unitSystem: 'metric' })).id
  const station = await fuelStation(siteId)
  serial = (await freshCylinder(siteId, { areaId: station.id, status: 'empty' })).serial
  secondSerial = (await freshCylinder(siteId, { areaId: station.id, status: 'empty' })).serial
  const u = await user({ siteId, roles: ['technician'] })
  await useTestDb().update(tables.users).set({ language: 'es' }).where(eq(tables.users.id, u.id))
  await lpTransferQualification(u.id)
  technician = u
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

describe('refill in Spanish at a metric site', () => {
  it('takes the scale in kg and reads the overfill refusal in Spanish with kg', async () => {
    const { page, context } = await signInAt(browser, technician, `/refill?code=${serial}`, PHONE)
    await expect.poll(() => page.getByText('Inspección antes del llenado').first().isVisible()).toBe(true)
    for (const item of PREFILL_INSPECTION_ITEMS) {
      await page.getByRole('radiogroup', { name: es.refill.item[item.key] }).getByRole('radio', { name: 'Pasa' }).click()
    }
    // fixture: 79.5 lb water capacity, 30 lb tare; 29.5 kg on the scale after is 65.04 lb gross, 35.04 lb of
    // propane, over the 33.39 lb limit (79.5 × 42 %, WAC 296-307-41037 Table U-4) by 1.65 lb = 0.75 kg (mathjs)
    const overKg = unit(29.5, 'kg').toNumber('lbm') - 30 - 79.5 * 0.42
    expect(unit(overKg, 'lbm').toNumber('kg')).toBeCloseTo(0.747, 3)
    await page.getByLabel('Peso antes de llenar (kg)').fill('14.1')
    await page.getByLabel('Peso después de llenar (kg)').fill('29.5')
    await expect.poll(() => page.getByText('Sobrellenado por 0.75 kg.', { exact: false }).first().isVisible()).toBe(true)
    await page.screenshot({ path: 'screenshots/form-refill-metric-es-weights-phone.png', fullPage: true })
    await page.getByRole('button', { name: 'Registrar el rellenado' }).click()
    await expect.poll(() => page.getByRole('heading', { name: 'No llene este cilindro' }).isVisible()).toBe(true)
    const reason = await page.locator('[data-code="fill_overfilled"]').innerText()
    expect(reason).toContain('Sobrellenado por 0.75 kg: el límite es 15.1 kg (capacidad de agua 36.1 kg × 42 %)')
    await page.screenshot({ path: 'screenshots/form-refill-metric-es-refused-phone.png', fullPage: true })
    await context.close()
  })

  it('a refill within the limit is confirmed in Spanish at the bottom of the screen', async () => {
    const { page, context } = await signInAt(browser, technician, `/refill?code=${secondSerial}`, PHONE)
    await expect.poll(() => page.getByText('Inspección antes del llenado').first().isVisible()).toBe(true)
    for (const item of PREFILL_INSPECTION_ITEMS) {
      await page.getByRole('radiogroup', { name: es.refill.item[item.key] }).getByRole('radio', { name: 'Pasa' }).click()
    }
    // 27.0 kg gross is 59.52 lb (mathjs), 29.52 lb of propane over the 30 lb tare: under the 33.39 lb limit
    expect(unit(27, 'kg').toNumber('lbm') - 30).toBeLessThan(79.5 * 0.42)
    await page.getByLabel('Peso antes de llenar (kg)').fill('14.1')
    await page.getByLabel('Peso después de llenar (kg)').fill('27.0')
    await page.getByRole('button', { name: 'Registrar el rellenado' }).click()
    await expect.poll(() => page.getByText(es.toast.refill_recorded).isVisible()).toBe(true)
    await context.close()
  })
})

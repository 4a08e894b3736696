import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import type { Browser } from 'playwright-core'
import { eq } from 'drizzle-orm'
import { builtServer } from '../support/http'
import { area, battery, closeTestDb, site, tables, user, useTestDb } from '../support/db'
import { DESKTOP, PHONE, launchChromium, signInAt, untilHydrated } from '../support/chromium'

await setup(builtServer)

let browser: Browser
let lead: { email: string, password: string }
let admin: { email: string, password: string }
let technician: { email: string, password: string }
let areaId: string
let siteId: string

// A safety lead who reads Spanish: the area log's day and the due schedules are in Spanish, dates as es-US writes them.
beforeAll(async () => {
  browser = await launchChromium()
  siteId = (await site()).id
  areaId = (await area({ siteId, kind: 'charging_area' })).id
  const u = await user({ siteId, roles: ['safety_lead'] })
  await useTestDb().update(tables.users).set({ language: 'es' }).where(eq(tables.users.id, u.id))
  lead = u
  const a = await user({ siteId, roles: ['admin'] })
  await useTestDb().update(tables.users).set({ language: 'es' }).where(eq(tables.users.id, a.id))
  admin = a
  const tech = await user({ siteId, roles: ['technician'] })
  await useTestDb().update(tables.users).set({ language: 'es' }).where(eq(tables.users.id, tech.id))
  technician = tech
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

describe('lead pages in Spanish', () => {
  it('the area-log day and the schedules page speak Spanish', async () => {
    const day = '2026-03-04'
    const { page, context } = await signInAt(browser, lead, `/logs?area=${areaId}&date=${day}`, DESKTOP)
    await page.getByRole('heading', { level: 1, name: 'Bitácoras del área' }).waitFor()
    const card = page.locator(`[data-log-date="${day}"]`)
    await expect.poll(() => card.getByText('Sin empezar').isVisible()).toBe(true)
    // the day's heading as es-US writes it (miércoles, 4 de mar de 2026), not the English weekday
    expect(await card.getByRole('heading').textContent()).toMatch(/miércoles/)
    // the default checklist's title and the area's cautions (eyewash, PPE) in Spanish too
    expect(await card.textContent()).toContain('Área de carga — revisión diaria')
    expect(await page.getByText('Lavaojos a la mano antes de tocar una batería').count()).toBe(1)
    expect(await page.getByText('Eyewash within reach').count()).toBe(0)
    expect(await page.getByRole('link', { name: 'Informe para auditoría' }).count()).toBe(1)

    await page.goto(page.url().replace(/\/logs.*$/, '/schedules'))
    await page.getByRole('heading', { level: 1, name: 'Programas de vencimiento' }).waitFor()
    expect(await page.getByRole('button', { name: 'Agregar un programa' }).count()).toBe(1)
    expect(await page.locator('#schedules-battery').textContent()).toContain('Baterías')
    expect(await page.getByText('Vence pronto').first().isVisible()).toBe(true)
    expect(await page.getByText('Due schedules').count()).toBe(0)
    // where a built-in interval comes from, in Spanish; the citation as written
    expect(await page.getByText('ANSI/ISEA Z358.1-2014: lavaojos fijo activado cada semana').count()).toBeGreaterThan(0)
    expect(await page.getByText('plumbed eyewash activated weekly').count()).toBe(0)
    await context.close()
  })

  it('the checklist editor names the default checklist and its items as each reader sees them; a reworded item loses the note', async () => {
    const { page, context } = await signInAt(browser, lead, '/logs/templates', DESKTOP)
    await page.getByRole('heading', { level: 1 }).waitFor()
    const daily = page.locator('details').filter({ hasText: 'Área de carga — revisión diaria' })
    await daily.locator('summary').click()
    const first = daily.getByRole('textbox', { name: 'Punto 1', exact: true })
    // the stored wording stays in the box (it is what is saved); the reader's words sit under it
    expect(await first.inputValue()).toBe('Eyewash flushed and reachable')
    await expect.poll(() => daily.getByText('En su idioma: Lavaojos probado y a la mano').count()).toBe(1)
    await first.fill('Estación de lavaojos revisada')
    expect(await daily.getByText('En su idioma: Lavaojos probado y a la mano').count()).toBe(0)
    await context.close()
  })

  it('the password form says its field checks and a wrong current password in Spanish', async () => {
    const { page, context } = await signInAt(browser, lead, '/account', DESKTOP)
    await page.getByRole('heading', { name: 'Cambiar su contraseña' }).waitFor()
    // the page says whose account it is, in the reader's language
    expect(await page.getByRole('heading', { level: 1, name: 'Su cuenta' }).count()).toBe(1)
    expect(await page.title()).toBe('Su cuenta · Bayward')
    await page.locator('input[name="newPassword"]').fill('short')
    await page.getByRole('button', { name: 'Cambiar contraseña' }).click()
    await expect.poll(() => page.getByText('Llene este dato.').count()).toBe(1)
    // the field's message in place of its hint
    expect(await page.getByRole('alert').filter({ hasText: 'Al menos 10 caracteres.' }).count()).toBe(1)
    expect(await page.getByText('At least 10 characters.').count()).toBe(0)
    expect(await page.getByText('Enter your current password.').count()).toBe(0)

    await page.locator('input[name="currentPassword"]').fill('not the password at all')
    await page.locator('input[name="newPassword"]').fill('a new long password')
    await page.locator('input[name="repeat"]').fill('a new long password')
    await page.getByRole('button', { name: 'Cambiar contraseña' }).click()
    await expect.poll(() => page.getByText('Esa no es su contraseña actual.').count()).toBe(1)
    expect(await page.getByText('That is not your current password.').count()).toBe(0)
    await context.close()
  })

  it('the site settings show the server\'s refusal of a setting at its field, in Spanish, its number as es-US writes it', async () => {
    const { page, context } = await signInAt(browser, admin, '/site', DESKTOP)
    await page.getByRole('heading', { level: 1, name: 'Ajustes del sitio' }).waitFor()
    await untilHydrated(page, 'form input')
    // the form sends settings as they are; the server checks them (cool-down at most 24 × 60 = 1440 minutes,
    // shared/utils/site-settings.ts) and answers settings.coolDownMinutes with its limit
    const coolDown = page.getByLabel('Enfriamiento después de la carga (minutos)')
    await coolDown.fill('5000')
    await page.getByRole('button', { name: 'Guardar ajustes' }).click()
    const field = page.locator('label').filter({ has: coolDown })
    await expect.poll(() => field.getByRole('alert').textContent()).toBe('No más de 1,440.')
    expect(await page.getByText('Revise los campos marcados.').count()).toBe(1)
    expect(await page.getByText('1440').count()).toBe(0)
    await context.close()
  })

  it('a page refused to a technician says why in Spanish as the server renders it, and the browser takes it over unchanged', async () => {
    const { page, context } = await signInAt(browser, technician, '/account', PHONE)
    // the leads' overrides page, rendered on the server for a technician: the refusal's coded words
    const html = await (await page.request.get(url('/bay/overrides'))).text()
    const main = html.slice(html.indexOf('<main'), html.indexOf('</main>'))
    expect(main).toContain('necesita uno de estos puestos')
    expect(main).not.toContain('[object Promise]')
    const problems: string[] = []
    page.on('console', m => (m.type() === 'error' || m.type() === 'warning') && problems.push(m.text()))
    await page.goto(url('/bay/overrides'))
    await page.waitForLoadState('networkidle')
    expect(await page.getByText(/necesita uno de estos puestos/).count()).toBe(1)
    expect(problems.filter(p => /hydrat/i.test(p))).toEqual([])
    await context.close()
  })

  it('the outgoing mail page: an alert the mail server refused, with its words, sent again from the page', async () => {
    const m = tables.mailMessages
    const [failed] = await useTestDb().insert(m).values({
      siteId, toAddress: 'lider.seguridad@example.test', subject: '[Bayward] Punto de la lista que no pasó', body: 'Hola.', kind: 'alert:checklist_failed',
      status: 'failed', attempts: 3, lastError: 'connect ECONNREFUSED 127.0.0.1:2599', nextAttemptAt: new Date(Date.now() + 3_600_000),
    }).returning()
    // the admin's home says so and leads there
    const { page, context } = await signInAt(browser, admin, '/', PHONE)
    await expect.poll(() => page.getByText('1 correo de este sitio no se entregó.').isVisible()).toBe(true)
    await untilHydrated(page, '[data-home-mail] a')
    await page.getByRole('link', { name: 'Ver el correo saliente' }).click()
    await page.waitForURL(/\/mail\?status=failed$/)
    await page.getByRole('heading', { level: 1, name: 'Correo saliente' }).waitFor()
    await untilHydrated(page, 'main button')
    const row = page.locator(`[data-mail="${failed!.id}"]`)
    expect(await row.innerText()).toContain('El servidor de correo dijo: connect ECONNREFUSED 127.0.0.1:2599')
    expect(await row.getByText('No entregado', { exact: true }).count()).toBe(1)
    expect(await row.getByText('Para lider.seguridad@example.test · Punto de la lista que no pasó').count()).toBe(1)
    expect(await row.getByText(/No se entregó tras 3 intentos; se vuelve a intentar: /).count()).toBe(1)
    await page.screenshot({ path: 'screenshots/mail-es-failed-phone.png', fullPage: true })
    await page.getByRole('button', { name: 'Enviar ahora el correo en espera' }).click()
    await expect.poll(() => page.getByText(/^Se intentaron \d+\. Enviados: \d+; no entregados: 0\.$/).isVisible()).toBe(true)
    // shown as not delivered it leaves this filter; under all it reads sent
    await expect.poll(() => row.count()).toBe(0)
    await page.getByRole('link', { name: /^Todos \(/ }).click()
    await expect.poll(() => row.getByText('Enviado', { exact: true }).count()).toBe(1)
    const [stored] = await useTestDb().select().from(m).where(eq(m.id, failed!.id))
    expect(stored).toMatchObject({ status: 'sent', attempts: 4 })
    await context.close()
  })

  it('the new and edit pages of an asset are headed in Spanish', async () => {
    const b = await battery({ siteId })
    const { page, context } = await signInAt(browser, admin, '/batteries/new', DESKTOP)
    await page.getByRole('heading', { level: 1, name: 'Agregar batería' }).waitFor()
    expect(await page.title()).toBe('Agregar batería · Bayward')
    await page.goto(url(`/batteries/${b.id}/edit`))
    await page.getByRole('heading', { level: 1, name: `Editar batería ${b.serial}` }).waitFor()
    await context.close()
  })
})

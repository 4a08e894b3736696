import { readdirSync, readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import type { Browser } from 'playwright-core'
import { eq } from 'drizzle-orm'
import { builtServer } from '../support/http'
import { area, battery, closeTestDb, site, tables, user, useTestDb } from '../support/db'
import { PHONE, launchChromium, signInAt } from '../support/chromium'
import es from '../../i18n/locales/es.json'

await setup(builtServer)

let browser: Browser
beforeAll(async () => {
  browser = await launchChromium()
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

// English is in the app; Spanish is fetched the first time a reader picks it, from the app's own chunks
// (never from the language module's /_i18n/ route), and the page redraws in Spanish at once.
describe('picking a language', () => {
  it('an English reader never fetches the Spanish words until picking Spanish, then reads Spanish at once', async () => {
    const dir = `${builtServer.nuxtConfig.nitro.output.dir}/public/_nuxt`
    const spanishChunk = readdirSync(dir).find(f => f.endsWith('.js') && readFileSync(`${dir}/${f}`, 'utf8').includes('Escanear una etiqueta'))!
    const who = await user({ siteId: (await site()).id, roles: ['technician'] })
    const { context, page } = await signInAt(browser, who, '/account', PHONE)
    const fetched: string[] = []
    context.on('request', r => fetched.push(new URL(r.url()).pathname))
    await page.goto(url('/scan'))
    await page.getByRole('heading', { name: 'Scan a tag' }).waitFor()
    await page.goto(url('/account'))
    await page.locator('[data-language]').waitFor()
    await page.waitForLoadState('networkidle')
    expect(fetched.filter(p => p.endsWith(spanishChunk))).toEqual([])

    await page.locator('[data-language]').selectOption('es')
    await page.getByText('Idioma guardado.').waitFor()
    expect(await page.getByText('Las pantallas y los correos usan este idioma.').count()).toBe(1)
    expect(fetched.filter(p => p.endsWith(spanishChunk))).toHaveLength(1)
    expect(fetched.filter(p => p.startsWith('/_i18n/'))).toEqual([])
    await context.close()
  })
})

// A lead whose language is Spanish reads the menu, the Bay board and the due list in Spanish.
describe('a Spanish reader', () => {
  it('reads the menu, the Bay board and the due list in Spanish', async () => {
    const siteId = (await site()).id
    const areaId = (await area({ siteId, name: `Cuarto Norte ${Date.now()}` })).id
    await battery({ siteId, homeAreaId: areaId })
    const who = await user({ siteId, roles: ['facilities_lead'] })
    await useTestDb().update(tables.users).set({ language: 'es' }).where(eq(tables.users.id, who.id))
    const { context, page } = await signInAt(browser, who, '/bay', PHONE)

    await page.getByRole('heading', { name: es.nav.bay }).waitFor()
    // each battery group is headed by its state in Spanish (Lista, Necesita carga …)
    const groups = page.locator('main section[aria-label]:visible')
    await groups.first().waitFor()
    const states: string[] = Object.values(es.asset_state)
    for (const name of await groups.evaluateAll(els => els.map(e => e.getAttribute('aria-label') ?? ''))) expect(states).toContain(name)
    await page.getByLabel(es.bay.area).waitFor()
    expect(await page.getByText('actualizado').count()).toBe(1)
    expect(await page.getByRole('link', { name: es.bay.wall_view }).count()).toBe(1)

    await page.getByRole('button', { name: es.app.open_menu }).click()
    const menu = page.getByRole('dialog', { name: es.app.menu })
    await menu.getByRole('link', { name: es.nav.due }).waitFor()
    expect(await menu.getByText(es.nav_group.battery).count()).toBe(1)
    expect(await menu.getByRole('button', { name: es.app.close_menu }).count()).toBe(1)
    await menu.getByRole('link', { name: es.nav.due }).click()

    await page.getByRole('heading', { name: es.nav.due }).waitFor()
    await page.getByRole('link', { name: es.due.page.export_csv }).waitFor()
    expect(await page.getByRole('button', { name: es.app.sign_out }).count()).toBe(1)
    await context.close()
  })
})

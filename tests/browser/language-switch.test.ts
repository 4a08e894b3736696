import { readdirSync, readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import type { Browser } from 'playwright-core'
import { builtServer } from '../support/http'
import { closeTestDb, site, user } from '../support/db'
import { PHONE, launchChromium, signInAt } from '../support/chromium'

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

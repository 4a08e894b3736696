import { readdirSync, readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import { builtServer, signIn } from '../support/http'
import { closeTestDb, site, user } from '../support/db'

await setup(builtServer)

// A person's language: their own setting (users.language), else the browser's Accept-Language. The server
// renders the page in it, so the words are there before any script runs.
describe('languages', () => {
  let siteId: string
  beforeAll(async () => {
    siteId = (await site()).id
  })
  afterAll(closeTestDb)

  const page = async (cookie: string | null, acceptLanguage?: string) => {
    const res = await fetch(url('/scan'), { headers: { ...(cookie ? { cookie } : {}), ...(acceptLanguage ? { 'accept-language': acceptLanguage } : {}) } })
    const html = await res.text()
    return { lang: /<html[^>]*\slang="([^"]+)"/.exec(html)?.[1], html }
  }

  it('with no setting the page follows the browser; a chosen language wins over it; null follows the browser again', async () => {
    const who = await user({ siteId, roles: ['technician'] })
    const c = await signIn(who)
    expect((await c.get('/api/me')).body.user.language).toBeNull()

    const english = await page(c.cookie, 'en-US,en;q=0.9')
    expect(english.lang).toBe('en')
    expect(english.html).toContain('Scan a tag')
    const browserSpanish = await page(c.cookie, 'es-US,es;q=0.9,en;q=0.5')
    expect(browserSpanish.lang).toBe('es')
    expect(browserSpanish.html).toContain('Escanear una etiqueta')

    const chosen = await c.put('/api/me/language', { language: 'es' })
    expect(chosen.status).toBe(200)
    expect((await c.get('/api/me')).body.user.language).toBe('es')
    const spanish = await page(c.cookie, 'en-US,en;q=0.9')
    expect(spanish.lang).toBe('es')
    expect(spanish.html).toContain('Escanear una etiqueta')
    expect(spanish.html).not.toContain('Scan a tag')

    expect((await c.put('/api/me/language', { language: null })).status).toBe(200)
    expect((await page(c.cookie, 'en-US')).html).toContain('Scan a tag')
  })

  it('renders the site settings page (temperatures in the site\'s units) in the person\'s language', async () => {
    const metric = (await site({ unitSystem: 'metric' })).id
    const who = await user({ siteId: metric, roles: ['admin'] })
    const c = await signIn(who)
    await c.put('/api/me/language', { language: 'es' })
    const res = await fetch(url('/site'), { headers: { cookie: c.cookie! } })
    expect(res.status).toBe(200)
    const html = await res.text()
    expect(/<html[^>]*\slang="([^"]+)"/.exec(html)?.[1]).toBe('es')
    expect(html).toContain('Temperatura de referencia de la gravedad específica (°C)')
    expect(html).not.toContain('Specific-gravity reference temperature')
  })

  it('refuses a language Bayward is not written in with a 400 and keeps the setting', async () => {
    const who = await user({ siteId, roles: ['operator'] })
    const c = await signIn(who)
    await c.put('/api/me/language', { language: 'es' })
    for (const bad of [{ language: 'fr' }, { language: 'ES' }, { language: 3 }, {}, { language: 'es', extra: 1 }]) {
      const res = await c.put('/api/me/language', bad)
      expect(res.status).toBe(400)
      expect(res.body.data.fields).toBeTruthy()
    }
    expect((await c.get('/api/me')).body.user.language).toBe('es')
  })

  it('keeps the Spanish words in a chunk of their own that an English page does not name', async () => {
    const dir = `${builtServer.nuxtConfig.nitro.output.dir}/public/_nuxt`
    const spanish = readdirSync(dir).filter(f => f.endsWith('.js') && readFileSync(`${dir}/${f}`, 'utf8').includes('Escanear una etiqueta'))
    expect(spanish).toHaveLength(1)
    expect(readFileSync(`${dir}/${spanish[0]}`, 'utf8')).not.toContain('Scan a tag')
    const who = await user({ siteId, roles: ['operator'] })
    const english = await page((await signIn(who)).cookie, 'en-US')
    expect(english.html).toContain('Scan a tag')
    expect(english.html).not.toContain(spanish[0])
  })
})

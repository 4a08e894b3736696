import { readdirSync, readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import { builtServer, signIn } from '../support/http'
import { area, closeTestDb, site, user } from '../support/db'
import { fittedTruck, qualify } from '../support/battery-room'
import { answers, classQualification, inspect } from '../support/inspection'

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
    // where each default comes from, in Spanish; cited rules stay as written
    expect(html).toContain('Valor por defecto de: decisión del sitio')
    expect(html).toContain('Valor por defecto de: su recibo de luz')
    expect(html).toContain('Valor por defecto de: 49 CFR 180.209')
    for (const english of ['site choice', 'your utility bill', 'common practice', 'follow the battery maker']) expect(html).not.toContain(english)
    // the server render already shows the metric site's units chosen and its temperatures in °C (80 °F, 115 °F)
    expect(html).toMatch(/<option value="metric" selected>/)
    expect(html).not.toMatch(/<option value="us" selected>/)
    expect(html).toContain('value="26.7"')
    expect(html).toContain('value="46.1"')
  })

  it('a truck held by a failed pre-shift check: the due page, the inspect page and the area log\'s follow-up say it in Spanish', async () => {
    const held = (await site()).id
    await area({ siteId: held })
    const op = await user({ siteId: held, roles: ['operator'] })
    await qualify(op.id)
    await classQualification(op.id, 1)
    await classQualification(op.id, 5)
    const lead = await user({ siteId: held, roles: ['technician', 'safety_lead'] })
    const truck = await fittedTruck(held)
    const failed = await inspect(await signIn(op), truck.id, { answers: answers('electric', { service_brake: 'Pedal goes to the floor' }) })
    expect(failed.status, JSON.stringify(failed.body)).toBe(201)
    const c = await signIn(lead)
    await c.put('/api/me/language', { language: 'es' })
    // the page as read: its payload (the server's stored English, kept as the fallback) left out
    const open = async (path: string) => (await (await fetch(url(path), { headers: { cookie: c.cookie! } })).text()).replace(/<script[\s\S]*?<\/script>/g, '')

    const due = await open('/due')
    expect(due).toContain('Inspecciones antes del turno')
    expect(due).toContain('No pasó su inspección antes del turno')
    expect(due).toContain('El freno de servicio detiene el montacargas sin jalones')
    expect(due).not.toContain('Failed its pre-shift check')
    const inspectPage = await open(`/inspect?truck=${truck.id}`)
    expect(inspectPage).toContain('No pasó su inspección antes del turno')
    expect(inspectPage).not.toContain('Failed its pre-shift check')

    const followUps = await c.get(`/api/follow-ups?siteId=${held}`)
    expect(followUps.body.items[0].titleWords).toMatchObject({ code: 'preshift', params: { truck: truck.fleetNumber } })
    const logs = await open('/logs')
    expect(logs).toContain(`Montacargas ${truck.fleetNumber}: El freno de servicio detiene el montacargas sin jalones — falló la inspección antes del turno el`)
    expect(logs).not.toContain('failed pre-shift check on')
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

  it('keeps the lead pages\' English and the schema library off the Scan page (the floor\'s first page)', async () => {
    const dir = `${builtServer.nuxtConfig.nitro.output.dir}/public/_nuxt`
    const scan = await page((await signIn(await user({ siteId, roles: ['operator'] }))).cookie, 'en-US')
    const named = [...scan.html.matchAll(/\/_nuxt\/([\w-]+\.js)/g)].map(m => m[1]!)
    expect(named.length).toBeGreaterThan(3)
    const text = named.map(f => readFileSync(`${dir}/${f}`, 'utf8')).join('\n')
    expect(text).not.toContain('ZodError')
    // a report's title, from i18n/lead/en.json, is in no chunk the Scan page names
    const lead = readdirSync(dir).filter(f => f.endsWith('.js') && readFileSync(`${dir}/${f}`, 'utf8').includes('Energy and cost'))
    expect(lead.length).toBeGreaterThan(0)
    for (const f of lead) expect(named).not.toContain(f)
  })
})

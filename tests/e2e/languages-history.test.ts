import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import { builtServer, signIn, type Client } from '../support/http'
import { area, battery, closeTestDb, site, user } from '../support/db'
import { hoursAgo, roomCharger, tagFor } from '../support/battery-room'

await setup(builtServer)

// A metric site read in Spanish: the battery's history lines travel as codes with values in stored units
// (°F, gal) and the page says them in the reader's words and the site's units; the server's refusals come as
// codes too; the due list's filters name the roles in the reader's words.
describe('history, refusals and filters in the reader\'s language and units', () => {
  let siteId: string
  let areaId: string
  let tech: Client
  let lead: Client

  beforeAll(async () => {
    siteId = (await site({ unitSystem: 'metric' })).id
    areaId = (await area({ siteId })).id
    tech = await signIn(await user({ siteId, roles: ['technician'] }))
    lead = await signIn(await user({ siteId, roles: ['safety_lead'] }))
    for (const c of [tech, lead]) expect((await c.put('/api/me/language', { language: 'es' })).status).toBe(200)
  })
  afterAll(closeTestDb)

  /** the page as the reader sees it: its HTML without the scripts (the payload keeps the English fallback) */
  const html = async (c: Client, path: string) => {
    const res = await fetch(url(path), { headers: { cookie: c.cookie! } })
    expect(res.status, path).toBe(200)
    return (await res.text()).replace(/<script[\s\S]*?<\/script>/g, '')
  }

  it('sends a charge\'s end as codes in °F, and the battery page shows it in Spanish in °C', async () => {
    const b = await battery({ siteId, homeAreaId: areaId })
    const ch = await roomCharger(siteId, areaId)
    const on = await tech.post('/api/battery-room/charges', { batteryId: b.id, chargerId: ch.id, idempotencyKey: randomUUID(), at: hoursAgo(5).toISOString() })
    expect(on.status, JSON.stringify(on.body)).toBe(201)
    const off = await tech.post(`/api/battery-room/charges/${on.body.item.id}/end`, { ampHoursReturned: 412.5, endTempF: 95, equalize: false, outcome: 'complete', endedAt: hoursAgo(1).toISOString() })
    expect(off.status, JSON.stringify(off.body)).toBe(200)

    const history = await tech.get(`/api/history/battery/${b.id}`)
    const end = history.body.items.find((h: { titleWords?: { code: string } }) => h.titleWords?.code === 'off_charger')
    expect(end.detailWords).toEqual(expect.arrayContaining([{ code: 'end_temp', params: { end_f: 95 } }, { code: 'amp_hours', params: { ah: 412.5 } }]))
    // the English words stay beside the codes (the CSV, and any reader whose language lacks a code)
    expect(end.title).toMatch(/^Off charger /)
    expect(end.detail).toContain('95 °F')

    const page = await html(tech, `/batteries/${b.id}`)
    expect(page).toContain('Historial')
    expect(page).toContain('Quitada del cargador')
    expect(page).toContain('temperatura final 35 °C')
    expect(page).toContain('A cargar en ')
    expect(page).not.toMatch(/95 °F|Off charger|Charge on /)

    const tag = await html(tech, `/t/${await tagFor('battery', b.id, siteId)}`)
    expect(tag).toContain('Quitada del cargador')
  })

  it('refuses a retry key of someone else\'s record and an unknown look-up with codes that have Spanish words', async () => {
    const b = await battery({ siteId, homeAreaId: areaId })
    const ch = await roomCharger(siteId, areaId)
    const body = { batteryId: b.id, chargerId: ch.id, idempotencyKey: randomUUID() }
    expect((await tech.post('/api/battery-room/charges', body)).status).toBe(201)
    const other = await signIn(await user({ siteId, roles: ['technician'] }))
    const reused = await other.post('/api/battery-room/charges', body)
    expect(reused.status).toBe(409)
    expect(reused.body.data.code).toBe('retry_key_taken')
    const lookup = await tech.get(`/api/tags/${encodeURIComponent('B-99999999')}`)
    expect(lookup.status).toBe(404)
    expect(lookup.body.data.code).toBe('tag_not_found')
    const forbidden = await tech.post('/api/mail/digest', { siteId })
    expect(forbidden.status).toBe(403)
    expect(forbidden.body.data).toMatchObject({ code: 'role_needed', params: { roles: ['admin'] } })
    const missing = await (await fetch(url('/t/B-99999999'), { headers: { cookie: tech.cookie! } })).text()
    expect(missing).toContain('No hay etiqueta con ese código')
  })

  it('names the roles, states and sorts of the due list\'s filters in Spanish', async () => {
    const page = await html(lead, '/due')
    for (const words of ['Todos los puestos', 'Líder de seguridad', 'Técnico', 'Lo más urgente primero', 'Puesto']) expect(page).toContain(words)
    expect(page).not.toMatch(/Every role|Safety lead|Most urgent first/)
  })
})

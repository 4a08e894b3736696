import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import { eq } from 'drizzle-orm'
import { unit } from 'mathjs'
import { builtServer, type Client } from '../support/http'
import { closeTestDb, site, tables, useTestDb, user } from '../support/db'
import { mailTo } from '../support/due'
import { freshCylinder, fuelPerson, fuelStation, lpTruck, passingInspection } from '../support/fuel'

await setup(builtServer)

// The LP-gas floor forms for a Spanish-speaking technician at a metric site: the pages render in Spanish on
// the server, and refusals carry a code with the values in stored pounds (the screen shows them in kg).
describe('LP-gas forms in Spanish, at a metric site', () => {
  let siteId: string
  let areaId: string
  let tech: Client
  beforeAll(async () => {
    siteId = (await site({ unitSystem: 'metric' })).id
    areaId = (await fuelStation(siteId)).id
    tech = (await fuelPerson(siteId, ['technician'])).client
    expect((await tech.put('/api/me/language', { language: 'es' })).status).toBe(200)
  })
  afterAll(closeTestDb)

  const html = async (path: string) => {
    const res = await fetch(url(path), { headers: { cookie: tech.cookie! } })
    expect(res.status, path).toBe(200)
    return res.text()
  }

  it.each([
    ['/refill', 'Rellenar un cilindro'],
    ['/exchange', 'Cambiar el cilindro de un montacargas'],
    ['/requalify', 'Registrar una recalificación'],
    ['/cage', 'Jaula de cilindros'],
    ['/co', 'Lecturas de CO en interiores'],
    ['/emissions', 'Pruebas de emisiones'],
    ['/inspect', 'Inspección antes del turno'],
  ])('%s renders in Spanish', async (path, title) => {
    const page = await html(path)
    expect(/<html[^>]*\slang="([^"]+)"/.exec(page)?.[1]).toBe('es')
    expect(page).toContain(title)
  })

  it('the cage shows the propane stored in kg', async () => {
    await freshCylinder(siteId, { areaId, status: 'full' })
    const page = await html('/cage')
    expect(page).toContain('Propano guardado')
    expect(page).toMatch(/data-testid="stored-propane"[^>]*>[\d.,]+ kg</)
  })

  it('the cylinder\'s history says a refill in Spanish, with the weights in kg', async () => {
    const c = await freshCylinder(siteId, { areaId })
    const res = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), grossBeforeLb: 31, grossAfterLb: 60 })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const shown = (await html(`/cylinders/${c.id}`)).replace(/<script[\s\S]*?<\/script>/g, '')
    // 29 lb added is 13.15 kg (mathjs below); the 33.39 lb limit is 15.15 kg
    expect(unit(29, 'lbm').toNumber('kg')).toBeCloseTo(13.154, 3)
    expect(shown).toMatch(/Rellenado: se agregaron 13\.\d+ kg/)
    expect(shown).toMatch(/límite 15\.\d+ kg/)
    expect(shown).not.toMatch(/Refilled|\d lb/)
  })

  it('an overfill refusal sends its code and the weights in stored pounds', async () => {
    const c = await freshCylinder(siteId, { areaId })
    // fixture: 79.5 lb water capacity, 30 lb tare; 65 − 30 = 35 lb in it, over the 33.39 lb limit (79.5 × 42 %)
    const res = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), grossBeforeLb: 31, grossAfterLb: 65 })
    expect(res.status).toBe(422)
    const [reason] = res.body.data.reasons
    expect(reason.code).toBe('fill_overfilled')
    expect(reason.params.over_lb).toBeCloseTo(35 - 33.39, 9)
    expect(reason.params.limit_lb).toBeCloseTo(33.39, 9)
    expect(reason.params.capacity_lb).toBe(79.5)
    // what the metric screen shows: 1.61 lb = 0.73 kg (mathjs lbm → kg)
    expect(unit(reason.params.over_lb, 'lbm').toNumber('kg')).toBeCloseTo(0.7303, 3)
  })

  it('a failed pre-fill inspection names the failed items by key; a cylinder change onto an empty cylinder is coded', async () => {
    const c = await freshCylinder(siteId, { areaId })
    const res = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: { ...passingInspection(), dents: 'fail' }, grossBeforeLb: null, grossAfterLb: null })
    expect(res.status).toBe(422)
    expect(res.body.data.reasons[0]).toMatchObject({ code: 'fill_inspection_failed', params: { items: ['dents'] } })
    const t = await lpTruck(siteId)
    const empty = await freshCylinder(siteId, { areaId, status: 'empty' })
    const change = await tech.post(`/api/trucks/${t.id}/cylinder-exchanges`, { cylinderOnId: empty.id, cylinderOffId: null })
    expect(change.status).toBe(409)
    expect(change.body.data.reasons[0]).toMatchObject({ code: 'mount_empty' })
  })

  it('the cylinder look-up answers the reasons it may not be filled as codes', async () => {
    const c = await freshCylinder(siteId, { areaId, status: 'condemned' })
    const res = await tech.get(`/api/fuel/cylinders/lookup?siteId=${siteId}&code=${encodeURIComponent(c.serial)}`)
    expect(res.status).toBe(200)
    expect(res.body.fillBlocks.map((r: { code: string }) => r.code)).toContain('fill_condemned')
  })

  it('the refused-fill alert reaches each lead in their own language, with the weights in kg', async () => {
    const spanish = await user({ siteId, roles: ['safety_lead'] })
    await useTestDb().update(tables.users).set({ language: 'es' }).where(eq(tables.users.id, spanish.id))
    const english = await user({ siteId, roles: ['facilities_lead'] })
    const c = await freshCylinder(siteId, { areaId })
    const res = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), grossBeforeLb: 31, grossAfterLb: 65 })
    expect(res.status).toBe(422)
    const [es] = await mailTo(spanish.email)
    expect(es!.subject).toContain('rechazado en la estación de combustible')
    expect(es!.body).toMatch(/^Hola, /)
    expect(es!.body).toContain('Sobrellenado por 0.73 kg: el límite es 15.1 kg')
    const [en] = await mailTo(english.email)
    expect(en!.subject).toContain('refused at the fuel station')
    expect(en!.body).toMatch(/^Hello /)
    // 33.39 lb = 15.15 kg (mathjs lbm → kg), shown to one decimal
    expect(unit(33.39, 'lbm').toNumber('kg')).toBeCloseTo(15.145, 3)
    expect(en!.body).toContain('Overfilled by 0.73 kg: the limit is 15.1 kg')
  })
})

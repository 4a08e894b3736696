import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { and, eq } from 'drizzle-orm'
import { builtServer, client, type Client } from '../support/http'
import { closeTestDb, site, tables, useTestDb } from '../support/db'
import { chargingArea, charger, person } from '../support/due'
import { VENTILATION_SCOPE_CAUTION } from '../../shared/utils/ventilation'
import { AID_DISCLAIMER } from '../../shared/utils/disclaimer'

process.env.BAYWARD_MAIL_TICK_SECONDS = '0'
await setup(builtServer)

describe('the due, schedule, incident, ventilation and mail routes', () => {
  let siteId: string
  let areaId: string
  const who: Record<string, Client> = {}
  let outsider: Client

  beforeAll(async () => {
    siteId = (await site()).id
    areaId = (await chargingArea(siteId, { floorAreaFt2: 400, roomVolumeFt3: 6000, installedExhaustCfm: 120 })).id
    for (const role of ['operator', 'technician', 'facilities_lead', 'safety_lead', 'admin'] as const) who[role] = (await person(siteId, [role])).client
    outsider = (await person((await site()).id, ['admin', 'safety_lead', 'facilities_lead'])).client
    // 10 chargers × 24 cells × 20 A gassing current: the worked example in trade-facts.md [calc]
    for (let i = 0; i < 10; i++) await charger({ siteId, areaId, outputVoltage: 48, gassingCurrentA: 20 })
  })
  afterAll(closeTestDb)

  const statuses = async (call: (c: Client) => Promise<{ status: number }>) => {
    const out: Record<string, number> = {}
    for (const [role, c] of Object.entries(who)) out[role] = (await call(c)).status
    out.outsider = (await call(outsider)).status
    out.anonymous = (await call(client())).status
    return out
  }

  it('every role\'s list (role=all) is for leads; the rest see their own roles\' lists', async () => {
    expect(await statuses(c => c.get(`/api/due/export?siteId=${siteId}&role=all`))).toEqual({ operator: 403, technician: 403, facilities_lead: 200, safety_lead: 200, admin: 200, outsider: 404, anonymous: 401 })
    expect((await who.operator!.get(`/api/due?siteId=${siteId}&role=technician`)).status).toBe(403)
    expect((await who.operator!.get(`/api/due?siteId=${siteId}&role=operator`)).status).toBe(200)
  })

  it('schedules: a lead\'s change is kept, audited and checked', async () => {
    expect((await who.facilities_lead!.put('/api/schedules/eyewash_activation', { siteId, dueSoonDays: 2 })).status).toBe(200)
    expect((await who.admin!.put('/api/schedules/eyewash_activation', { siteId, every: 0 })).status).toBe(400)
    expect((await who.admin!.put('/api/schedules/not_a_kind', { siteId, every: 1 })).status).toBe(404)
    const items = (await who.operator!.get(`/api/schedules?siteId=${siteId}`)).body.items
    expect(items.find((s: { kind: string }) => s.kind === 'eyewash_activation')).toMatchObject({ dueSoonDays: 2, every: 1, everyUnit: 'week' })
    const [audit] = await useTestDb().select().from(tables.auditLog).where(and(eq(tables.auditLog.entity, 'schedule'), eq(tables.auditLog.siteId, siteId)))
    expect(audit?.action).toBe('update')
  })

  it('incidents: a report reaches the leads\' list; bad tag codes are a bad field', async () => {
    const body = { siteId, kind: 'near_miss', areaId, description: 'Truck reversed close to a charger cable.' }
    expect((await who.operator!.post('/api/incidents', body)).status).toBe(201)
    expect((await who.safety_lead!.get(`/api/incidents?siteId=${siteId}`)).body.items.length).toBeGreaterThan(0)
    const bad = await who.operator!.post('/api/incidents', { ...body, assetCode: 'B-99999' })
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields.assetCode).toBeTruthy()
    const short = await who.operator!.post('/api/incidents', { ...body, description: 'short' })
    expect(short.body.data.fields.description).toBeTruthy()
    const otherSitePhoto = await who.operator!.post('/api/incidents', { ...body, photoUploadIds: ['00000000-0000-4000-8000-000000000000'] })
    expect(otherSitePhoto.status).toBe(400)
  })

  it('ventilation: the worked example gives 1.289 cfm H2 and 128.9 cfm at 1 %, with the caution and the disclaimer', async () => {
    const res = await who.safety_lead!.get(`/api/ventilation?siteId=${siteId}&areaId=${areaId}`)
    expect(res.body.chargers).toHaveLength(10)
    // 24 cells (48 V at 2 V per cell, common practice) × 20 A × 10 chargers [calc]
    expect(Number(res.body.h2Cfm.toPrecision(4))).toBe(1.289)
    expect(Number(res.body.requiredExhaustCfm.toPrecision(4))).toBe(128.9)
    expect(res.body.prescriptiveCfm).toBe(400)
    expect(res.body.assessment).toMatchObject({ meetsOneMethod: false, meetsAllMethods: false })
    expect(res.body.caution).toBe(VENTILATION_SCOPE_CAUTION)
    expect(res.body.disclaimer).toBe(AID_DISCLAIMER)
    expect((await who.safety_lead!.get(`/api/ventilation?siteId=${siteId}&areaId=${areaId}&designPercent=4`)).status).toBe(400)
    const fuel = await who.safety_lead!.get(`/api/ventilation?siteId=${siteId}&areaId=${(await chargingArea(siteId, { kind: 'fuel_station' })).id}`)
    expect(fuel.status).toBe(400)
  })

  it('mail: retry needs the site', async () => {
    expect((await who.admin!.post('/api/mail/retry', {})).status).toBe(400)
  })
})

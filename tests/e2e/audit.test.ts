import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { and, asc, count, eq } from 'drizzle-orm'
import { builtServer, signIn, type Client } from '../support/http'
import {
  area, areaInput, battery, batteryInput, charger, chargerInput, closeTestDb, cylinder, cylinderInput,
  site, tables, truck, truckInput, user, useTestDb,
} from '../support/db'

await setup(builtServer)

async function auditRows(entity: string, entityId: string) {
  return useTestDb().select().from(tables.auditLog)
    .where(and(eq(tables.auditLog.entity, entity), eq(tables.auditLog.entityId, entityId))).orderBy(asc(tables.auditLog.id))
}

async function auditCountAt(siteId: string) {
  const [row] = await useTestDb().select({ n: count() }).from(tables.auditLog).where(eq(tables.auditLog.siteId, siteId))
  return Number(row!.n)
}

async function holds(assetId: string) {
  return useTestDb().select().from(tables.assetHolds).where(eq(tables.assetHolds.assetId, assetId)).orderBy(asc(tables.assetHolds.at), asc(tables.assetHolds.id))
}

describe('every change leaves a record', () => {
  let siteId: string
  let chargingAreaId: string
  let leadUser: Awaited<ReturnType<typeof user>>
  let techUser: Awaited<ReturnType<typeof user>>
  let lead: Client
  let tech: Client
  let operator: Client

  beforeAll(async () => {
    siteId = (await site()).id
    chargingAreaId = (await area({ siteId })).id
    leadUser = await user({ siteId, roles: ['facilities_lead'] })
    techUser = await user({ siteId, roles: ['technician'] })
    lead = await signIn(leadUser)
    tech = await signIn(techUser)
    operator = await signIn(await user({ siteId, roles: ['operator'] }))
  })
  afterAll(closeTestDb)

  it.each([
    ['batteries', 'battery', () => batteryInput(), 'serial'],
    ['trucks', 'truck', () => truckInput(), 'fleetNumber'],
    ['chargers', 'charger', () => chargerInput(chargingAreaId), 'name'],
    ['cylinders', 'cylinder', () => cylinderInput(), 'serial'],
    ['areas', 'area', () => areaInput(), 'name'],
  ] as const)('creating %s writes a create row with the new record and who made it', async (path, entity, input, identity) => {
    const body = input()
    const res = await lead.post(`/api/${path}`, { siteId, ...body })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const rows = await auditRows(entity, res.body.item.id)
    expect(rows).toHaveLength(1)
    expect(rows[0]).toMatchObject({ action: 'create', userId: leadUser.id, siteId, before: null })
    expect((rows[0]!.after as Record<string, unknown>)[identity]).toBe((body as Record<string, unknown>)[identity])
  })

  it('an edit writes an update row with the record before and after, and the user', async () => {
    const b = await battery({ siteId, notes: 'Delivered with a cracked vent cap.', capacityAh: 750 })
    const res = await lead.patch(`/api/batteries/${b.id}`, { notes: 'Vent cap replaced.', capacityAh: 775 })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const rows = await auditRows('battery', b.id)
    expect(rows).toHaveLength(1)
    const [row] = rows
    expect(row).toMatchObject({ action: 'update', userId: leadUser.id, siteId })
    expect(row!.before).toMatchObject({ notes: 'Delivered with a cracked vent cap.', capacityAh: 750, serial: b.serial })
    expect(row!.after).toMatchObject({ notes: 'Vent cap replaced.', capacityAh: 775, serial: b.serial })
  })

  it('a refused or invalid edit writes nothing', async () => {
    const b = await battery({ siteId })
    const before = await auditCountAt(siteId)
    expect((await operator.patch(`/api/batteries/${b.id}`, { notes: 'not allowed' })).status).toBe(403)
    expect((await lead.patch(`/api/batteries/${b.id}`, { voltage: 'lots' })).status).toBe(400)
    expect((await lead.patch(`/api/batteries/${b.id}`, { bogus: 1 })).status).toBe(400)
    expect((await lead.post('/api/batteries', { siteId, ...batteryInput({ serial: b.serial }) })).status).toBe(409)
    expect(await auditCountAt(siteId)).toBe(before)
    expect(await auditRows('battery', b.id)).toEqual([])
  })

  it.each([
    ['batteries', 'battery', () => battery({ siteId })],
    ['trucks', 'truck', () => truck({ siteId })],
    ['chargers', 'charger', () => charger({ siteId, areaId: chargingAreaId })],
    ['cylinders', 'cylinder', () => cylinder({ siteId })],
  ] as const)('putting %s out of service writes a hold row with the reason; returning it writes a release', async (path, kind, make) => {
    const asset = await make()
    const reason = 'Cable insulation cut through near the plug.'
    const held = await tech.post(`/api/${path}/${asset.id}/out-of-service`, { outOfService: true, reason })
    expect(held.status, JSON.stringify(held.body)).toBe(200)
    expect(held.body.item).toMatchObject({ outOfService: true, outOfServiceReason: reason })

    let rows = await holds(asset.id)
    expect(rows).toHaveLength(1)
    expect(rows[0]).toMatchObject({ siteId, userId: techUser.id, assetKind: kind, assetId: asset.id, action: 'hold', reason })
    const audit = await auditRows(kind, asset.id)
    expect(audit.at(-1)).toMatchObject({ action: 'out_of_service', userId: techUser.id, note: reason, before: { outOfService: false }, after: { outOfService: true, reason } })

    const released = await tech.post(`/api/${path}/${asset.id}/out-of-service`, { outOfService: false, reason: 'New cable fitted.' })
    expect(released.status).toBe(200)
    expect(released.body.item).toMatchObject({ outOfService: false, outOfServiceReason: null })
    rows = await holds(asset.id)
    expect(rows.map(r => [r.action, r.reason])).toEqual([['hold', reason], ['release', 'New cable fitted.']])
    expect((await auditRows(kind, asset.id)).at(-1)).toMatchObject({ action: 'return_to_service' })
  })

  it('a refused hold writes no hold row', async () => {
    const b = await battery({ siteId })
    expect((await operator.post(`/api/batteries/${b.id}/out-of-service`, { outOfService: true, reason: 'Looks swollen.' })).status).toBe(403)
    expect(await holds(b.id)).toEqual([])
  })
})

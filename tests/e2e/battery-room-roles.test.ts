import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { builtServer, signIn, type Client } from '../support/http'
import { area, battery, closeTestDb, site, user } from '../support/db'
import { fittedTruck, openCharge, readyBattery, roomCharger, tagFor } from '../support/battery-room'
import type { Role } from '../../shared/types/auth'

await setup(builtServer)

const ROLES: Role[] = ['operator', 'technician', 'facilities_lead', 'safety_lead', 'admin']
const FLOOR: Role[] = ['technician', 'facilities_lead', 'safety_lead', 'admin']
const LEADS: Role[] = ['facilities_lead', 'safety_lead', 'admin']

interface World { siteId: string, areaId: string, chargerId: string, userId: string }

describe('battery-room routes: who may do what, and other sites stay hidden', () => {
  const clients = {} as Record<Role, Client>
  const here = {} as World
  const there = {} as World & { batteryId: string, truckId: string, sessionId: string, code: string }

  beforeAll(async () => {
    here.siteId = (await site()).id
    here.areaId = (await area({ siteId: here.siteId })).id
    here.chargerId = (await roomCharger(here.siteId, here.areaId)).id
    for (const role of ROLES) {
      const u = await user({ siteId: here.siteId, roles: [role] })
      here.userId = u.id
      clients[role] = await signIn(u)
    }
    there.siteId = (await site()).id
    there.areaId = (await area({ siteId: there.siteId })).id
    there.chargerId = (await roomCharger(there.siteId, there.areaId)).id
    there.userId = (await user({ siteId: there.siteId, roles: ['technician'] })).id
    there.batteryId = (await readyBattery({ siteId: there.siteId, userId: there.userId, chargerId: there.chargerId })).id
    there.truckId = (await fittedTruck(there.siteId)).id
    there.code = await tagFor('battery', there.batteryId, there.siteId)
    const busy = await battery({ siteId: there.siteId })
    there.sessionId = (await openCharge({ siteId: there.siteId, userId: there.userId, batteryId: busy.id, chargerId: (await roomCharger(there.siteId, there.areaId)).id, startedHoursAgo: 1 })).id
  })
  afterAll(closeTestDb)

  const expected = (role: Role, allowed: Role[], ok: number) => (allowed.includes(role) ? ok : 403)

  it.each(ROLES)('%s: reads the board and looks up codes; not at another site', async (role) => {
    const c = clients[role]
    expect((await c.get(`/api/battery-room/board?siteId=${here.siteId}`)).status).toBe(200)
    const b = await battery({ siteId: here.siteId })
    const code = await tagFor('battery', b.id, here.siteId)
    const found = await c.get(`/api/battery-room/lookup?siteId=${here.siteId}&code=${code.toLowerCase().replace('-', '')}`)
    expect(found.status).toBe(200)
    expect(found.body).toMatchObject({ kind: 'battery', id: b.id, code })
    expect((await c.get(`/api/battery-room/board?siteId=${there.siteId}`)).status).toBe(404)
    expect((await c.get(`/api/battery-room/lookup?siteId=${there.siteId}&code=${there.code}`)).status).toBe(404)
    expect((await c.get(`/api/battery-room/lookup?siteId=${here.siteId}&code=${there.code}`)).status).toBe(404)
  })

  it.each(ROLES)('%s: swaps a battery (anyone at the site); not at another site', async (role) => {
    const t = await fittedTruck(here.siteId)
    const b = await readyBattery({ siteId: here.siteId, userId: here.userId, chargerId: here.chargerId })
    const res = await clients[role].post('/api/battery-room/swaps', { truckId: t.id, batteryInId: b.id, hourMeter: 1, idempotencyKey: randomUUID() })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const away = await clients[role].post('/api/battery-room/swaps', { truckId: there.truckId, batteryInId: there.batteryId, hourMeter: 1, idempotencyKey: randomUUID() })
    expect(away.status).toBe(404)
    const mixed = await clients[role].post('/api/battery-room/swaps', { truckId: (await fittedTruck(here.siteId)).id, batteryInId: there.batteryId, hourMeter: 1, idempotencyKey: randomUUID() })
    expect(mixed.status).toBe(404)
  })

  it.each(ROLES)('%s: the overrides report is for leads; not at another site', async (role) => {
    expect((await clients[role].get(`/api/battery-room/overrides?siteId=${here.siteId}`)).status).toBe(expected(role, LEADS, 200))
    expect((await clients[role].get(`/api/battery-room/overrides?siteId=${there.siteId}`)).status).toBe(404)
  })

  it.each(ROLES)('%s: charge on and off (technicians and leads); not at another site', async (role) => {
    const c = clients[role]
    const b = await battery({ siteId: here.siteId })
    const ch = await roomCharger(here.siteId, here.areaId)
    const on = await c.post('/api/battery-room/charges', { batteryId: b.id, chargerId: ch.id, idempotencyKey: randomUUID() })
    expect(on.status).toBe(expected(role, FLOOR, 201))
    const session = on.status === 201 ? on.body.item.id : (await openCharge({ siteId: here.siteId, userId: here.userId, batteryId: b.id, chargerId: ch.id, startedHoursAgo: 3 })).id
    const off = await c.post(`/api/battery-room/charges/${session}/end`, { ampHoursReturned: 400, endTempF: 95, outcome: 'complete' })
    expect(off.status).toBe(expected(role, FLOOR, 200))
    expect((await c.post('/api/battery-room/charges', { batteryId: there.batteryId, chargerId: there.chargerId, idempotencyKey: randomUUID() })).status).toBe(404)
    expect((await c.post(`/api/battery-room/charges/${there.sessionId}/end`, { ampHoursReturned: 400, endTempF: 95, outcome: 'complete' })).status).toBe(404)
    expect((await c.post('/api/battery-room/charges', { batteryId: b.id, chargerId: there.chargerId, idempotencyKey: randomUUID() })).status).toBe(role === 'operator' ? 403 : 404)
  })

  it.each(ROLES)('%s: electrolyte checks (technicians and leads); not at another site', async (role) => {
    const c = clients[role]
    const b = await battery({ siteId: here.siteId })
    const body = { level: 'ok', scope: 'pilot_cell', cells: [{ cellNumber: 1, specificGravity: 1.275, temperatureF: 82 }] }
    expect((await c.post('/api/battery-room/checks', { batteryId: b.id, idempotencyKey: randomUUID(), ...body })).status).toBe(expected(role, FLOOR, 201))
    expect((await c.post('/api/battery-room/checks', { batteryId: there.batteryId, idempotencyKey: randomUUID(), ...body })).status).toBe(404)
  })

  it('bad input answers 400 with field messages, never 500', async () => {
    const c = clients.technician
    const bad = await c.post('/api/battery-room/swaps', { truckId: 'nope', batteryInId: 12, hourMeter: 'lots' })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.data.fields)).toEqual(expect.arrayContaining(['truckId', 'batteryInId', 'hourMeter', 'idempotencyKey']))
    expect((await c.post('/api/battery-room/checks', '{not json')).status).toBe(400)
    expect((await c.get('/api/battery-room/board?siteId=x')).status).toBe(400)
    expect((await c.post('/api/battery-room/charges/not-a-uuid/end', { ampHoursReturned: 1, endTempF: 80, outcome: 'complete' })).status).toBe(404)
    const signedOut = await (await import('../support/http')).client().get(`/api/battery-room/board?siteId=${here.siteId}`)
    expect(signedOut.status).toBe(401)
  })
})

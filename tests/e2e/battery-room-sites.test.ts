import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { builtServer, signIn, type Client } from '../support/http'
import { area, battery, closeTestDb, site, user } from '../support/db'
import { fittedTruck, openCharge, readyBattery, roomCharger, tagFor } from '../support/battery-room'
import { ROLES, type Role } from '../../shared/types/auth'

await setup(builtServer)

interface World { siteId: string, areaId: string, chargerId: string, userId: string }

describe('battery-room routes across two sites', () => {
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

  // Who may use each battery-room route is in the role × route matrix (access-matrix.test.ts); here, the
  // look-ups and records that mix this site with another one.

  it.each(ROLES)('%s: looks up a code typed loosely; another site\'s code is not found, even asked at this site', async (role) => {
    const c = clients[role]
    const b = await battery({ siteId: here.siteId })
    const code = await tagFor('battery', b.id, here.siteId)
    const found = await c.get(`/api/battery-room/lookup?siteId=${here.siteId}&code=${code.toLowerCase().replace('-', '')}`)
    expect(found.status).toBe(200)
    expect(found.body).toMatchObject({ kind: 'battery', id: b.id, code })
    expect((await c.get(`/api/battery-room/lookup?siteId=${here.siteId}&code=${there.code}`)).status).toBe(404)
  })

  it.each(ROLES)('%s: a swap that puts another site\'s battery in this site\'s truck → 404', async (role) => {
    const mixed = await clients[role].post('/api/battery-room/swaps', { truckId: (await fittedTruck(here.siteId)).id, batteryInId: there.batteryId, hourMeter: 1, idempotencyKey: randomUUID() })
    expect(mixed.status).toBe(404)
  })

  it.each(ROLES)('%s: this site\'s battery on another site\'s charger → 404 (403 first for whoever may not charge at all)', async (role) => {
    const b = await battery({ siteId: here.siteId })
    const res = await clients[role].post('/api/battery-room/charges', { batteryId: b.id, chargerId: there.chargerId, idempotencyKey: randomUUID() })
    expect(res.status).toBe(role === 'operator' ? 403 : 404)
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

import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { builtServer, signIn, type Client } from '../support/http'
import {
  area, areaInput, battery, batteryInput, charger, chargerInput, closeTestDb, cylinder, cylinderInput,
  site, truck, truckInput, user,
} from '../support/db'

await setup(builtServer)

describe('bad input is 400 with field messages, conflicts 409, never 500', () => {
  let siteId: string
  let otherSiteId: string
  let chargingAreaId: string
  let fuelStationId: string
  let admin: Client

  beforeAll(async () => {
    siteId = (await site()).id
    otherSiteId = (await site()).id
    chargingAreaId = (await area({ siteId, kind: 'charging_area' })).id
    fuelStationId = (await area({ siteId, kind: 'fuel_station' })).id
    admin = await signIn(await user({ memberships: [{ siteId, roles: ['admin'] }, { siteId: otherSiteId, roles: ['admin'] }] }))
  })
  afterAll(closeTestDb)

  const without = (body: Record<string, unknown>, key: string) => Object.fromEntries(Object.entries(body).filter(([k]) => k !== key))

  // [what, route, body builder, field expected in data.fields, optional text the message contains]
  const createCases: [string, string, () => Record<string, unknown>, string, string?][] = [
    ['battery without a serial', '/api/batteries', () => without(batteryInput(), 'serial'), 'serial', 'Serial is required.'],
    ['battery with a blank serial', '/api/batteries', () => batteryInput({ serial: '   ' }), 'serial', 'Serial is required.'],
    ['battery voltage as a string', '/api/batteries', () => batteryInput({ voltage: '36' }), 'voltage', 'Voltage must be a number.'],
    ['battery with a negative weight', '/api/batteries', () => batteryInput({ weightLb: -5 }), 'weightLb', 'above 0'],
    ['lead-acid battery whose cell count does not match its voltage (36 V, 20 cells)', '/api/batteries', () => batteryInput({ voltage: 36, cellCount: 20 }), 'cellCount', '18 cells'],
    ['battery of an unknown chemistry', '/api/batteries', () => batteryInput({ chemistry: 'nickel_iron_x' }), 'chemistry'],
    ['battery put in service before it was made', '/api/batteries', () => batteryInput({ manufacturedOn: '2024-05-01', inServiceOn: '2024-01-01' }), 'inServiceOn'],
    ['battery with a date that is not a date', '/api/batteries', () => batteryInput({ manufacturedOn: '05/01/2024' }), 'manufacturedOn'],
    ['battery whose home area is a fuel station', '/api/batteries', () => batteryInput({ homeAreaId: fuelStationId }), 'homeAreaId', 'Pick a charging area.'],
    ['charger whose area is a fuel station', '/api/chargers', () => chargerInput(fuelStationId), 'areaId', 'Pick a charging area.'],
    ['charger without an area', '/api/chargers', () => without(chargerInput(chargingAreaId), 'areaId'), 'areaId'],
    ['charger whose minimum capacity is above its maximum', '/api/chargers', () => chargerInput(chargingAreaId, { minCapacityAh: 900, maxCapacityAh: 600 }), 'maxCapacityAh'],
    ['charger with no chemistry profile', '/api/chargers', () => chargerInput(chargingAreaId, { chemistryProfiles: [] }), 'chemistryProfiles'],
    ['electric truck without its nameplate voltage', '/api/trucks', () => truckInput({ systemVoltage: null }), 'systemVoltage'],
    ['truck of class 8', '/api/trucks', () => truckInput({ power: 'lp_gas', truckClass: 8 }), 'truckClass'],
    ['cylinder created as in use', '/api/cylinders', () => cylinderInput({ status: 'in_use' }), 'status'],
    ['cylinder with a requalification date but no method', '/api/cylinders', () => cylinderInput({ lastRequalifiedOn: '2023-04-01' }), 'lastRequalificationMethod'],
    ['cylinder kept in a charging area', '/api/cylinders', () => cylinderInput({ areaId: chargingAreaId }), 'areaId', 'Pick a fuel station.'],
    ['cylinder with a negative tare weight', '/api/cylinders', () => cylinderInput({ tareLb: -30 }), 'tareLb'],
    ['area of an unknown kind', '/api/areas', () => areaInput({ kind: 'garage' }), 'kind'],
  ]

  it.each(createCases)('%s → 400', async (_what, route, body, field, text) => {
    const res = await admin.post(route, { siteId, ...body() })
    expect(res.status, JSON.stringify(res.body)).toBe(400)
    expect(res.body.data.fields).toHaveProperty(field)
    if (text) expect(res.body.data.fields[field]).toContain(text)
  })

  it('accepts a lithium-ion battery whose cell count is not voltage ÷ 2 (the 2 V rule is for lead-acid)', async () => {
    const res = await admin.post('/api/batteries', { siteId, ...batteryInput({ chemistry: 'lithium_ion', voltage: 48, cellCount: 15 }) })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
  })

  it('a create without a site, or with a site id that is not a uuid → 400 on siteId', async () => {
    for (const body of [batteryInput(), { ...batteryInput(), siteId: 'main-plant' }]) {
      const res = await admin.post('/api/batteries', body)
      expect(res.status).toBe(400)
      expect(res.body.data.fields).toHaveProperty('siteId')
    }
  })

  it('malformed JSON → 400 with a message, on create, edit and out-of-service', async () => {
    const b = await battery({ siteId })
    for (const res of [
      await admin.post('/api/batteries', '{"serial": "B1", '),
      await admin.patch(`/api/batteries/${b.id}`, '{notes: nope}'),
      await admin.post(`/api/batteries/${b.id}/out-of-service`, '{"outOfService": tru'),
    ]) {
      expect(res.status).toBe(400)
      expect(res.body.message).toMatch(/JSON/)
    }
  })

  it('a JSON array where an object belongs → 400', async () => {
    const b = await battery({ siteId })
    expect((await admin.post('/api/batteries', [batteryInput()])).status).toBe(400)
    expect((await admin.patch(`/api/batteries/${b.id}`, [{ notes: 'x' }])).status).toBe(400)
  })

  describe('PATCH', () => {
    it('an unknown field → 400 naming it, and the record is unchanged', async () => {
      const b = await battery({ siteId, notes: 'as made' })
      const res = await admin.patch(`/api/batteries/${b.id}`, { notes: 'edited', colour: 'blue' })
      expect(res.status).toBe(400)
      expect(res.body.data.fields).toEqual({ colour: 'Not a field of this record.' })
      expect((await admin.get(`/api/batteries/${b.id}`)).body.item.notes).toBe('as made')
    })

    it.each(['siteId', 'id', 'outOfService', 'cycleCount', 'currentTruckId'])('%s cannot be set through PATCH → 400', async (field) => {
      const b = await battery({ siteId })
      const value = field === 'outOfService' ? true : field === 'cycleCount' ? 99 : otherSiteId
      const res = await admin.patch(`/api/batteries/${b.id}`, { [field]: value })
      expect(res.status).toBe(400)
      expect(res.body.data.fields).toHaveProperty(field)
    })

    it('a wrong type → 400 on that field', async () => {
      const b = await battery({ siteId })
      const res = await admin.patch(`/api/batteries/${b.id}`, { voltage: 'forty-eight' })
      expect(res.status).toBe(400)
      expect(res.body.data.fields.voltage).toBe('Voltage must be a number.')
    })

    it('checks the whole record after the change (48 V with 18 cells left over)', async () => {
      const b = await battery({ siteId, voltage: 36, cellCount: 18 })
      const res = await admin.patch(`/api/batteries/${b.id}`, { voltage: 48 })
      expect(res.status).toBe(400)
      expect(res.body.data.fields.cellCount).toContain('24 cells')
      expect((await admin.patch(`/api/batteries/${b.id}`, { voltage: 48, cellCount: 24 })).status).toBe(200)
    })

    it('a cylinder cannot be marked in use by an edit', async () => {
      const c = await cylinder({ siteId })
      const res = await admin.patch(`/api/cylinders/${c.id}`, { status: 'in_use' })
      expect(res.status).toBe(400)
      expect(res.body.data.fields).toHaveProperty('status')
    })
  })

  describe('out of service', () => {
    it('a hold without a reason → 400 on reason', async () => {
      const b = await battery({ siteId })
      for (const body of [{ outOfService: true }, { outOfService: true, reason: ' ' }]) {
        const res = await admin.post(`/api/batteries/${b.id}/out-of-service`, body)
        expect(res.status).toBe(400)
        expect(res.body.data.fields).toHaveProperty('reason')
      }
    })

    it('a flag that is not a boolean → 400', async () => {
      const b = await battery({ siteId })
      const res = await admin.post(`/api/batteries/${b.id}/out-of-service`, { outOfService: 'yes', reason: 'Leaking.' })
      expect(res.status).toBe(400)
      expect(res.body.data.fields).toHaveProperty('outOfService')
    })

    it('holding twice, or releasing what is in service → 409', async () => {
      const t = await truck({ siteId })
      expect((await admin.post(`/api/trucks/${t.id}/out-of-service`, { outOfService: false })).status).toBe(409)
      expect((await admin.post(`/api/trucks/${t.id}/out-of-service`, { outOfService: true, reason: 'Mast chain worn.' })).status).toBe(200)
      expect((await admin.post(`/api/trucks/${t.id}/out-of-service`, { outOfService: true, reason: 'Again.' })).status).toBe(409)
      expect((await admin.post(`/api/trucks/${t.id}/out-of-service`, { outOfService: false })).status).toBe(200)
    })
  })

  describe('duplicates → 409', () => {
    it('a battery serial already used at the site', async () => {
      const first = await admin.post('/api/batteries', { siteId, ...batteryInput() })
      expect(first.status).toBe(201)
      const again = await admin.post('/api/batteries', { siteId, ...batteryInput({ serial: first.body.item.serial }) })
      expect(again.status).toBe(409)
      expect(again.body.data.fields).toEqual({ serial: 'Already used at this site.' })
      // serials are unique per site, not across sites
      expect((await admin.post('/api/batteries', { siteId: otherSiteId, ...batteryInput({ serial: first.body.item.serial }) })).status).toBe(201)
    })

    it('a battery renamed to a serial already in use', async () => {
      const a = await battery({ siteId })
      const b = await battery({ siteId })
      const res = await admin.patch(`/api/batteries/${b.id}`, { serial: a.serial })
      expect(res.status).toBe(409)
      expect(res.body.data.fields).toHaveProperty('serial')
    })

    it.each([
      ['trucks', 'fleetNumber', () => truck({ siteId }), (v: string) => truckInput({ fleetNumber: v })],
      ['chargers', 'name', () => charger({ siteId, areaId: chargingAreaId }), (v: string) => chargerInput(chargingAreaId, { name: v })],
      ['cylinders', 'serial', () => cylinder({ siteId }), (v: string) => cylinderInput({ serial: v })],
      ['areas', 'name', () => area({ siteId }), (v: string) => areaInput({ name: v })],
    ] as const)('%s: a %s already used at the site', async (kind, field, make, input) => {
      const existing = await make() as unknown as Record<string, string>
      const res = await admin.post(`/api/${kind}`, { siteId, ...input(existing[field]!) })
      expect(res.status).toBe(409)
      expect(res.body.data.fields).toHaveProperty(field)
    })
  })

  describe('ids in the path', () => {
    const kinds = ['batteries', 'trucks', 'chargers', 'cylinders', 'areas']
    it.each(kinds)('%s: a non-uuid id → 404 on GET, PATCH and out-of-service', async (kind) => {
      expect((await admin.get(`/api/${kind}/not-a-uuid`)).status).toBe(404)
      expect((await admin.get(`/api/${kind}/1'%20OR%20'1'='1`)).status).toBe(404)
      expect((await admin.patch(`/api/${kind}/12345`, { notes: 'x' })).status).toBe(404)
      if (kind !== 'areas') expect((await admin.post(`/api/${kind}/abc/out-of-service`, { outOfService: true, reason: 'Testing ids.' })).status).toBe(404)
    })

    it.each(kinds)('%s: a well-formed id of nothing → 404', async (kind) => {
      expect((await admin.get(`/api/${kind}/00000000-0000-4000-8000-000000000000`)).status).toBe(404)
      expect((await admin.patch(`/api/${kind}/00000000-0000-4000-8000-000000000000`, { notes: 'x' })).status).toBe(404)
    })
  })

  describe('list queries', () => {
    it.each([
      ['pageSize=0', 'pageSize'],
      ['pageSize=5000', 'pageSize'],
      ['page=-1', 'page'],
      ['dir=sideways', 'dir'],
      ['chemistry=nickel', 'chemistry'],
      ['voltage=high', 'voltage'],
      ['outOfService=maybe', 'outOfService'],
    ])('?%s → 400 on %s', async (param, field) => {
      const res = await admin.get(`/api/batteries?siteId=${siteId}&${param}`)
      expect(res.status).toBe(400)
      expect(res.body.data.fields).toHaveProperty(field)
    })

    it('a list without a site, or with a site id that is not a uuid → 400 on siteId', async () => {
      for (const path of ['/api/batteries', '/api/trucks?siteId=plant-1']) {
        const res = await admin.get(path)
        expect(res.status).toBe(400)
        expect(res.body.data.fields).toHaveProperty('siteId')
      }
    })

    it('an unknown sort key falls back to the default sort instead of failing', async () => {
      const res = await admin.get(`/api/batteries?siteId=${siteId}&sort=passwordHash`)
      expect(res.status).toBe(200)
      expect(res.body.sort).toBe('serial')
    })

    it('a search with LIKE wildcards is taken literally', async () => {
      const res = await admin.get(`/api/batteries?siteId=${siteId}&q=${encodeURIComponent('%_\\')}`)
      expect(res.status).toBe(200)
      expect(res.body.total).toBe(0)
    })
  })
})

import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { builtServer, signIn, type Client } from '../support/http'
import {
  area, areaInput, battery, batteryInput, charger, chargerInput, closeTestDb, cylinder, cylinderInput,
  site, truck, truckInput, uniqueName, user,
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
    ['battery made on a day that does not exist (30 February)', '/api/batteries', () => batteryInput({ manufacturedOn: '2024-02-30' }), 'manufacturedOn', 'Not a real date.'],
    ['battery put in service in year 0', '/api/batteries', () => batteryInput({ inServiceOn: '0000-06-01' }), 'inServiceOn', 'Not a real date.'],
    ['battery whose home area is a fuel station', '/api/batteries', () => batteryInput({ homeAreaId: fuelStationId }), 'homeAreaId', 'Pick a charging area.'],
    ['charger whose area is a fuel station', '/api/chargers', () => chargerInput(fuelStationId), 'areaId', 'Pick a charging area.'],
    ['charger without an area', '/api/chargers', () => without(chargerInput(chargingAreaId), 'areaId'), 'areaId'],
    ['charger whose minimum capacity is above its maximum', '/api/chargers', () => chargerInput(chargingAreaId, { minCapacityAh: 900, maxCapacityAh: 600 }), 'maxCapacityAh'],
    ['charger with no chemistry profile', '/api/chargers', () => chargerInput(chargingAreaId, { chemistryProfiles: [] }), 'chemistryProfiles'],
    ['electric truck without its nameplate voltage', '/api/trucks', () => truckInput({ systemVoltage: null }), 'systemVoltage'],
    ['truck of class 8', '/api/trucks', () => truckInput({ power: 'lp_gas', truckClass: 8 }), 'truckClass'],
    ['cylinder created as in use', '/api/cylinders', () => cylinderInput({ status: 'in_use' }), 'status'],
    ['cylinder with a requalification date but no method', '/api/cylinders', () => cylinderInput({ lastRequalifiedOn: '2023-04-01' }), 'lastRequalificationMethod'],
    ['cylinder requalified on 29 February of a common year', '/api/cylinders', () => cylinderInput({ lastRequalifiedOn: '2023-02-29', lastRequalificationMethod: 'external_visual' }), 'lastRequalifiedOn', 'Not a real date.'],
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

  it('a 400 names each field\'s issue code and limits beside its English words (data.issues), body and query alike', async () => {
    // limits as the shared schemas set them: shared/utils/asset-schemas.ts (voltage 12–120 V, serial up to 60
    // characters), shared/utils/schedule-schemas.ts (due list limit up to 20,000)
    const body = await admin.post('/api/batteries', { siteId, ...batteryInput({ voltage: 200, serial: 'S'.repeat(61) }) })
    expect(body.status).toBe(400)
    expect(body.body.data.code).toBe('check_fields')
    expect(body.body.data.fields).toMatchObject({ voltage: 'At most 120 V.' })
    expect(Object.keys(body.body.data.issues)).toEqual(Object.keys(body.body.data.fields))
    expect(body.body.data.issues).toMatchObject({ voltage: { code: 'too_big', origin: 'number', maximum: 120 }, serial: { code: 'too_big', origin: 'string', maximum: 60 } })
    const typed = await admin.post('/api/batteries', { siteId, ...batteryInput({ voltage: '36' }) })
    expect(typed.body.data.issues.voltage).toEqual({ code: 'invalid_type', expected: 'number' })
    const custom = await admin.post('/api/batteries', { siteId, ...batteryInput({ voltage: 36, cellCount: 20 }) })
    expect(custom.body.data.issues.cellCount).toEqual({ code: 'custom' })
    const query = await admin.get(`/api/due?siteId=${siteId}&limit=20001`)
    expect(query.status).toBe(400)
    expect(query.body.data.issues).toEqual({ limit: { code: 'too_big', origin: 'number', maximum: 20_000 } })
    const nul = await admin.get(`/api/batteries?siteId=${siteId}&q=A%00B`)
    expect(nul.body.data).toMatchObject({ code: 'check_fields', issues: { q: { code: 'invalid_format' } } })
    // a site's settings are keyed from the body's top (settings.…), as the site form keys its own check;
    // cool-down at most 24 × 60 = 1440 minutes (shared/utils/site-settings.ts)
    const settings = await admin.patch(`/api/sites/${siteId}`, { settings: { coolDownMinutes: 5000 } })
    expect(settings.status).toBe(400)
    expect(settings.body.data.issues).toEqual({ 'settings.coolDownMinutes': { code: 'too_big', origin: 'number', maximum: 1440 } })
    // a day written right that is not on the calendar says which issue it is (field_issue.date)
    const day = await admin.post('/api/batteries', { siteId, ...batteryInput({ manufacturedOn: '2024-02-30' }) })
    expect(day.body.data.issues.manufacturedOn).toEqual({ code: 'invalid_format', format: 'date' })
  })

  describe('junk in any field is refused (400, or 409 when it collides), never a 500', () => {
    const JUNK: [string, unknown][] = [['null', null], ['an object', { $gt: '' }], ['a list', [1, 2]], ['true', true], ['a word', 'lots'], ['a NUL character', 'A\u0000B']]
    const bodies: [string, string, () => Record<string, unknown>][] = [
      ['batteries', '/api/batteries', () => batteryInput()],
      ['trucks', '/api/trucks', () => truckInput()],
      ['chargers', '/api/chargers', () => chargerInput(chargingAreaId)],
      ['cylinders', '/api/cylinders', () => cylinderInput()],
      ['areas', '/api/areas', () => areaInput()],
    ]
    it.each(bodies)('%s: every field, every kind of junk', async (_kind, route, body) => {
      const outcomes: string[] = []
      for (const field of Object.keys(body())) {
        for (const [what, value] of JUNK) {
          const res = await admin.post(route, { siteId, ...body(), [field]: value })
          if (![201, 400, 409].includes(res.status)) outcomes.push(`${field} = ${what} → ${res.status}`)
        }
      }
      expect(outcomes).toEqual([])
    })

    it.each(bodies)('%s: PATCH with junk in every field', async (kind, route, body) => {
      const created = await admin.post(route, { siteId, ...body() })
      expect(created.status).toBe(201)
      const outcomes: string[] = []
      for (const field of Object.keys(body())) {
        for (const [what, value] of JUNK) {
          const res = await admin.patch(`${route}/${created.body.item.id}`, { [field]: value })
          if (![200, 400, 409].includes(res.status)) outcomes.push(`${kind}.${field} = ${what} → ${res.status}`)
        }
      }
      expect(outcomes).toEqual([])
    })
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
      // zod's code for a key the object does not have, so a screen words it (field_issue.unknown)
      expect(res.body.data).toMatchObject({ code: 'check_fields', issues: { colour: { code: 'unrecognized_keys' } } })
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

    it('a day that does not exist → 400 on that field, not a database error', async () => {
      const b = await battery({ siteId })
      const res = await admin.patch(`/api/batteries/${b.id}`, { inServiceOn: '2025-04-31' })
      expect(res.status).toBe(400)
      expect(res.body.data.fields).toEqual({ inServiceOn: 'Not a real date.' })
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
      expect(again.body.data).toMatchObject({ code: 'asset_taken', params: { name: first.body.item.serial } })
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

    it('a sort key the list does not sort by → 400 on sort, prototype names included', async () => {
      for (const sort of ['passwordHash', 'constructor', '__proto__', 'toString', 'hasOwnProperty', 'valueOf']) {
        const res = await admin.get(`/api/batteries?siteId=${siteId}&sort=${sort}`)
        expect(res.status, sort).toBe(400)
        expect(res.body.data.fields).toHaveProperty('sort')
      }
      for (const path of ['/api/trucks', '/api/chargers', '/api/cylinders', '/api/areas', '/api/batteries/export']) {
        expect((await admin.get(`${path}?siteId=${siteId}&sort=constructor`)).status, path).toBe(400)
      }
      expect((await admin.get(`/api/batteries?siteId=${siteId}&sort=capacityAh`)).body.sort).toBe('capacityAh')
    })

    it('a NUL character in the query → 400, not a database error', async () => {
      for (const param of ['q=A%00B', 'chemistry=agm%00']) {
        const res = await admin.get(`/api/batteries?siteId=${siteId}&${param}`)
        expect(res.status).toBe(400)
        expect(res.body.data.fields).toHaveProperty(param.split('=')[0]!)
      }
    })

    it('a search with LIKE wildcards is taken literally', async () => {
      const res = await admin.get(`/api/batteries?siteId=${siteId}&q=${encodeURIComponent('%_\\')}`)
      expect(res.status).toBe(200)
      expect(res.body.total).toBe(0)
    })
  })
})

describe('a list pages, sorts, filters and searches on the server', () => {
  let siteId: string
  let stem: string
  let admin: Client
  const serial = (n: number) => `${stem}-${String(n).padStart(2, '0')}`
  const serials = (res: { body: { items: { serial: string }[] } }) => res.body.items.map(i => i.serial)

  beforeAll(async () => {
    siteId = (await site()).id
    stem = uniqueName('PG')
    admin = await signIn(await user({ siteId, roles: ['admin'] }))
    // 01, 03, 05 are AGM; voltages 24/36/48 in turn
    for (let n = 1; n <= 7; n++) {
      const voltage = [24, 36, 48][n % 3]!
      await battery({ siteId, serial: serial(n), chemistry: n % 2 === 1 && n <= 5 ? 'agm' : 'flooded_lead_acid', voltage, cellCount: voltage / 2 })
    }
    // a battery at another site never shows up here
    await battery({ siteId: (await site()).id, serial: serial(8), chemistry: 'agm' })
  })
  afterAll(closeTestDb)

  const list = (query: string) => admin.get(`/api/batteries?siteId=${siteId}&${query}`)

  it('pages through in the default order (serial, ascending) with the right total', async () => {
    const p1 = await list('pageSize=3')
    expect(p1.status).toBe(200)
    expect(p1.body).toMatchObject({ total: 7, page: 1, pageSize: 3, sort: 'serial', dir: 'asc' })
    expect(serials(p1)).toEqual([serial(1), serial(2), serial(3)])
    expect(serials(await list('pageSize=3&page=2'))).toEqual([serial(4), serial(5), serial(6)])
    const p3 = await list('pageSize=3&page=3')
    expect(serials(p3)).toEqual([serial(7)])
    const p4 = await list('pageSize=3&page=4')
    expect(p4.body).toMatchObject({ total: 7, items: [] })
  })

  it('sorts descending', async () => {
    const res = await list('sort=serial&dir=desc&pageSize=4')
    expect(serials(res)).toEqual([serial(7), serial(6), serial(5), serial(4)])
    expect(res.body.total).toBe(7)
  })

  it('sends the same row, status included, whether the page is sorted by its own columns or by a status column', async () => {
    // by serial the page's ids are found before the status is joined; by cycles the status is joined to sort
    const bySerial = (await list('pageSize=10')).body.items as { id: string }[]
    const byCycles = (await list('sort=cycleCount&pageSize=10')).body.items as { id: string }[]
    expect(byCycles.map(i => i.id).sort()).toEqual(bySerial.map(i => i.id).sort())
    for (const item of bySerial) expect(byCycles.find(i => i.id === item.id)).toEqual(item)
    expect(bySerial[0]).toHaveProperty('cycleCount')
    expect(bySerial[0]).toHaveProperty('tagCode')
  })

  it('sorts by a number column', async () => {
    const res = await list('sort=voltage&dir=desc')
    const volts = res.body.items.map((i: { voltage: number }) => i.voltage)
    expect(volts).toEqual([...volts].sort((a, b) => b - a))
    expect(volts[0]).toBe(48)
  })

  it('filters by chemistry, and the total counts the filtered rows', async () => {
    const res = await list('chemistry=agm')
    expect(res.body.total).toBe(3)
    expect(serials(res)).toEqual([serial(1), serial(3), serial(5)])
    const paged = await list('chemistry=agm&dir=desc&pageSize=2&page=1')
    expect(paged.body.total).toBe(3)
    expect(serials(paged)).toEqual([serial(5), serial(3)])
    expect((await list('chemistry=agm&voltage=36')).body.total).toBe(1)
  })

  it('filters by out-of-service', async () => {
    const [held] = (await list(`q=${serial(6)}`)).body.items
    expect((await admin.post(`/api/batteries/${held.id}/out-of-service`, { outOfService: true, reason: 'Dead cell.' })).status).toBe(200)
    expect(serials(await list('outOfService=true'))).toEqual([serial(6)])
    expect((await list('outOfService=false')).body.total).toBe(6)
  })

  it('searches by serial, whole or in part, in any case', async () => {
    expect(serials(await list(`q=${serial(4)}`))).toEqual([serial(4)])
    const res = await list(`q=${encodeURIComponent(stem.toLowerCase())}`)
    expect(res.body.total).toBe(7)
    expect((await list(`q=${stem}-0&pageSize=2`)).body).toMatchObject({ total: 7 })
    expect((await list('q=no-such-serial-anywhere')).body).toMatchObject({ total: 0, items: [] })
  })
})

import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { eq } from 'drizzle-orm'
import { builtServer, signIn, type Client } from '../support/http'
import {
  area, battery, batteryInput, charger, chargerInput, closeTestDb, cylinder,
  site, tables, truck, user, useTestDb,
} from '../support/db'

await setup(builtServer)

interface Other { id: string }

describe('a user of site A cannot reach site B', () => {
  let siteA: string
  let siteB: string
  let areaA: string
  let areaB: string
  let fuelB: string
  let adminA: Client
  let adminB: Client
  const inB = {} as Record<string, Other>

  const KINDS = {
    batteries: { edit: { notes: 'moved' } },
    trucks: { edit: { model: 'moved' } },
    chargers: { edit: { notes: 'moved' } },
    cylinders: { edit: { notes: 'moved' } },
    areas: { edit: { notes: 'moved' } },
  } as const
  type Kind = keyof typeof KINDS

  beforeAll(async () => {
    const org = (await site()).organizationId
    siteA = (await site({ organizationId: org })).id
    siteB = (await site({ organizationId: org })).id
    areaA = (await area({ siteId: siteA })).id
    areaB = (await area({ siteId: siteB })).id
    fuelB = (await area({ siteId: siteB, kind: 'fuel_station' })).id
    inB.batteries = await battery({ siteId: siteB, homeAreaId: areaB })
    inB.trucks = await truck({ siteId: siteB })
    inB.chargers = await charger({ siteId: siteB, areaId: areaB })
    inB.cylinders = await cylinder({ siteId: siteB, areaId: fuelB })
    inB.areas = { id: areaB }
    adminA = await signIn(await user({ siteId: siteA, roles: ['admin'] }))
    adminB = await signIn(await user({ siteId: siteB, roles: ['admin'] }))
  })
  afterAll(closeTestDb)

  // The answer to each route for a member of another site (404) is in the role × route matrix
  // (access-matrix.test.ts); here, that nothing of site B moves when they try, by kind.
  describe.each(Object.keys(KINDS) as Kind[])('%s', (kind) => {
    it('site B\'s own admin reaches the record (the fixture is sound)', async () => {
      expect((await adminB.get(`/api/${kind}/${inB[kind]!.id}`)).status).toBe(200)
    })

    it('an edit from site A → 404, and nothing changes', async () => {
      const res = await adminA.patch(`/api/${kind}/${inB[kind]!.id}`, KINDS[kind].edit)
      expect(res.status).toBe(404)
      expect(res.body.item).toBeUndefined()
      const table = { batteries: tables.batteries, trucks: tables.trucks, chargers: tables.chargers, cylinders: tables.lpCylinders, areas: tables.areas }[kind]
      const [row] = await useTestDb().select().from(table).where(eq(table.id, inB[kind]!.id))
      for (const field of Object.keys(KINDS[kind].edit)) expect((row as Record<string, unknown>)[field]).not.toBe('moved')
    })
  })

  it('a role at site A does not carry over to site B (operator at B, admin at A: editing at B is 403)', async () => {
    const both = await signIn(await user({ memberships: [{ siteId: siteA, roles: ['admin'] }, { siteId: siteB, roles: ['operator'] }] }))
    expect((await both.get(`/api/batteries/${inB.batteries!.id}`)).status).toBe(200)
    expect((await both.patch(`/api/batteries/${inB.batteries!.id}`, { notes: 'moved' })).status).toBe(403)
    expect((await both.post(`/api/batteries/${inB.batteries!.id}/out-of-service`, { outOfService: true, reason: 'Not allowed here.' })).status).toBe(403)
    expect((await both.post('/api/batteries', { siteId: siteB, ...batteryInput() })).status).toBe(403)
    expect((await both.post('/api/batteries', { siteId: siteA, ...batteryInput() })).status).toBe(201)
  })

  it('a user with no site at all gets 404 for records and lists', async () => {
    const nobody = await signIn(await user())
    expect((await nobody.get(`/api/batteries/${inB.batteries!.id}`)).status).toBe(404)
    expect((await nobody.get(`/api/batteries?siteId=${siteB}`)).status).toBe(404)
    expect((await nobody.get('/api/sites')).body.items).toEqual([])
  })

  it('site B\'s areas cannot be referenced from site A (400 on the field)', async () => {
    const bat = await adminA.post('/api/batteries', { siteId: siteA, ...batteryInput({ homeAreaId: areaB }) })
    expect(bat.status).toBe(400)
    expect(bat.body.data.fields.homeAreaId).toBeTruthy()

    const chg = await adminA.post('/api/chargers', { siteId: siteA, ...chargerInput(areaB) })
    expect(chg.status).toBe(400)
    expect(chg.body.data.fields.areaId).toBeTruthy()

    const mine = await battery({ siteId: siteA, homeAreaId: areaA })
    const moved = await adminA.patch(`/api/batteries/${mine.id}`, { homeAreaId: areaB })
    expect(moved.status).toBe(400)
    expect(moved.body.data.fields.homeAreaId).toBeTruthy()
  })

  it('sites and users of site B stay out of reach', async () => {
    const sites = await adminA.get('/api/sites')
    expect(sites.body.items.map((s: { id: string }) => s.id)).toEqual([siteA])
    expect((await adminA.patch(`/api/sites/${siteB}`, { name: 'Taken over' })).status).toBe(404)
    expect((await adminA.get(`/api/users?siteId=${siteB}`)).status).toBe(404)
  })
})

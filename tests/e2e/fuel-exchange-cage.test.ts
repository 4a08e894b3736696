import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { eq } from 'drizzle-orm'
import { builtServer, client, type Client } from '../support/http'
import { closeTestDb, site, tables, truck, useTestDb } from '../support/db'
import { freshCylinder, fuelPerson, fuelStation, lpTruck, passingInspection, storedCylinder } from '../support/fuel'
import type { Role } from '../../shared/types/auth'

await setup(builtServer)

const exchangesOf = (truckId: string) => useTestDb().select().from(tables.cylinderExchanges).where(eq(tables.cylinderExchanges.truckId, truckId))

describe('cylinder exchange on a truck', () => {
  let siteId: string
  let areaId: string
  let operator: Client

  beforeAll(async () => {
    siteId = (await site()).id
    areaId = (await fuelStation(siteId)).id
    ;({ client: operator } = await fuelPerson(siteId, ['operator'], { trained: false }))
  })
  afterAll(closeTestDb)

  it('an operator fits a full cylinder: on is in use on the truck, off goes to the cage as empty', async () => {
    const t = await lpTruck(siteId)
    const first = await freshCylinder(siteId, { areaId, status: 'full' })
    const fit = await operator.post(`/api/trucks/${t.id}/cylinder-exchanges`, { cylinderOnId: first.id, cylinderOffId: null })
    expect(fit.status, JSON.stringify(fit.body)).toBe(201)
    expect(await storedCylinder(first.id)).toMatchObject({ status: 'in_use', currentTruckId: t.id })

    const second = await freshCylinder(siteId, { areaId, status: 'full' })
    const change = await operator.post(`/api/trucks/${t.id}/cylinder-exchanges`, { cylinderOnCode: second.serial, cylinderOffId: first.id, idempotencyKey: `ex-${second.id}` })
    expect(change.status, JSON.stringify(change.body)).toBe(201)
    expect(change.body.item).toMatchObject({ cylinderOnId: second.id, cylinderOffId: first.id })
    expect(await storedCylinder(first.id)).toMatchObject({ status: 'empty', currentTruckId: null })
    expect(await storedCylinder(second.id)).toMatchObject({ status: 'in_use', currentTruckId: t.id })

    const repeat = await operator.post(`/api/trucks/${t.id}/cylinder-exchanges`, { cylinderOnCode: second.serial, cylinderOffId: first.id, idempotencyKey: `ex-${second.id}` })
    expect(repeat.status).toBe(200)
    expect(repeat.body.item.id).toBe(change.body.item.id)
    expect(await exchangesOf(t.id)).toHaveLength(2)

    const history = await operator.get(`/api/history/cylinder/${first.id}`)
    expect(history.body.items.map((i: { title: string }) => i.title)).toEqual(expect.arrayContaining([`Put on truck ${t.fleetNumber}`, `Taken off truck ${t.fleetNumber} (to the cage, empty)`]))
  })

  it.each([
    ['empty', 'is empty'],
    ['quarantined', 'is quarantined'],
    ['condemned', 'is condemned'],
  ] as const)('refuses a cylinder that is %s (409 with the reason)', async (status, words) => {
    const t = await lpTruck(siteId)
    const c = await freshCylinder(siteId, { areaId, status })
    const res = await operator.post(`/api/trucks/${t.id}/cylinder-exchanges`, { cylinderOnId: c.id, cylinderOffId: null })
    expect(res.status, JSON.stringify(res.body)).toBe(409)
    expect(res.body.data.reasons.map((r: { message: string }) => r.message).join(' ')).toContain(words)
    expect(await exchangesOf(t.id)).toHaveLength(0)
  })

  it('refuses a full cylinder overdue for requalification, and one out of service', async () => {
    const t = await lpTruck(siteId)
    const old = await freshCylinder(siteId, { areaId, status: 'full', manufactureYear: 2010, manufactureMonth: 3 })
    const res = await operator.post(`/api/trucks/${t.id}/cylinder-exchanges`, { cylinderOnId: old.id, cylinderOffId: null })
    expect(res.status).toBe(409)
    expect(res.body.data.reasons.map((r: { message: string }) => r.message).join(' ')).toContain('2022-03-31')
    const held = await freshCylinder(siteId, { areaId, status: 'full' })
    await useTestDb().update(tables.lpCylinders).set({ outOfService: true, outOfServiceReason: 'Valve sticking' }).where(eq(tables.lpCylinders.id, held.id))
    const res2 = await operator.post(`/api/trucks/${t.id}/cylinder-exchanges`, { cylinderOnId: held.id, cylinderOffId: null })
    expect(res2.status).toBe(409)
    expect(res2.body.data.reasons.map((r: { message: string }) => r.message).join(' ')).toContain('Valve sticking')
  })

  it('refuses when the cylinder named as coming off is not the truck\'s, and on a truck that is not LP-gas', async () => {
    const t = await lpTruck(siteId)
    const fitted = await freshCylinder(siteId, { areaId, status: 'in_use', currentTruckId: t.id })
    const full = await freshCylinder(siteId, { areaId, status: 'full' })
    const res = await operator.post(`/api/trucks/${t.id}/cylinder-exchanges`, { cylinderOnId: full.id, cylinderOffId: null })
    expect(res.status).toBe(409)
    expect(res.body.data.currentCylinderId).toBe(fitted.id)
    const electric = await truck({ siteId })
    const res2 = await operator.post(`/api/trucks/${electric.id}/cylinder-exchanges`, { cylinderOnId: full.id, cylinderOffId: null })
    expect(res2.status).toBe(409)
    expect((await storedCylinder(full.id)).status).toBe('full')
  })

  it('two changes at once with the same cylinder: one wins, the other is refused', async () => {
    const a = await lpTruck(siteId)
    const b = await lpTruck(siteId)
    const c = await freshCylinder(siteId, { areaId, status: 'full' })
    const [r1, r2] = await Promise.all([
      operator.post(`/api/trucks/${a.id}/cylinder-exchanges`, { cylinderOnId: c.id, cylinderOffId: null }),
      operator.post(`/api/trucks/${b.id}/cylinder-exchanges`, { cylinderOnId: c.id, cylinderOffId: null }),
    ])
    expect([r1.status, r2.status].sort()).toEqual([201, 409])
  })

  it('role and site checks: every role changes cylinders at its site; other sites 404; signed out 401', async () => {
    const roles: Role[] = ['operator', 'technician', 'facilities_lead', 'safety_lead', 'admin']
    for (const role of roles) {
      const { client: c } = await fuelPerson(siteId, [role], { trained: false })
      const t = await lpTruck(siteId)
      const cyl = await freshCylinder(siteId, { areaId, status: 'full' })
      expect((await c.post(`/api/trucks/${t.id}/cylinder-exchanges`, { cylinderOnId: cyl.id, cylinderOffId: null })).status).toBe(201)
      expect((await c.get(`/api/fuel/lp-trucks?siteId=${siteId}`)).status).toBe(200)
      expect((await c.get(`/api/fuel/cage?siteId=${siteId}`)).status).toBe(200)
    }
    const { client: stranger } = await fuelPerson((await site()).id, ['admin'], { trained: false })
    const t = await lpTruck(siteId)
    const cyl = await freshCylinder(siteId, { areaId, status: 'full' })
    expect((await stranger.post(`/api/trucks/${t.id}/cylinder-exchanges`, { cylinderOnId: cyl.id, cylinderOffId: null })).status).toBe(404)
    expect((await stranger.get(`/api/fuel/lp-trucks?siteId=${siteId}`)).status).toBe(404)
    expect((await stranger.get(`/api/fuel/cage?siteId=${siteId}`)).status).toBe(404)
    expect((await client().get(`/api/fuel/cage?siteId=${siteId}`)).status).toBe(401)
    expect((await storedCylinder(cyl.id)).status).toBe('full')
  })
})

describe('the Cylinder cage', () => {
  it('counts by state, totals stored propane against the station limit and warns from 80 %', async () => {
    const siteId = (await site()).id
    const { client: tech } = await fuelPerson(siteId, ['technician'])
    // 200 lb limit; four full 33.5 lb cylinders = 134 lb (67 %)
    const station = await fuelStation(siteId, 200)
    for (let i = 0; i < 4; i++) await freshCylinder(siteId, { areaId: station.id, status: 'full' })
    await freshCylinder(siteId, { areaId: station.id, status: 'empty' })
    await freshCylinder(siteId, { areaId: station.id, status: 'quarantined' })
    await freshCylinder(siteId, { areaId: station.id, status: 'condemned' })
    const t = await lpTruck(siteId)
    await freshCylinder(siteId, { areaId: station.id, status: 'in_use', currentTruckId: t.id })
    // due within 90 days: made 12 years before next month
    const soon = new Date()
    soon.setUTCMonth(soon.getUTCMonth() + 1)
    const dueSoon = await freshCylinder(siteId, { areaId: station.id, status: 'empty', manufactureYear: soon.getUTCFullYear() - 12, manufactureMonth: soon.getUTCMonth() + 1 })

    let res = await tech.get(`/api/fuel/cage?siteId=${siteId}`)
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    let cage = res.body.stations.find((s: { areaId: string }) => s.areaId === station.id)
    expect(cage.counts).toEqual({ full: 4, empty: 2, in_use: 1, quarantined: 1, condemned: 1 })
    expect(cage.storedPropaneLb).toBeCloseTo(134, 9)
    expect(cage.storage).toMatchObject({ limitLb: 200, level: 'ok' })
    expect(cage.storage.percentOfLimit).toBeCloseTo(67, 9)
    // six full cylinders is the default reorder point (site settings)
    expect(cage.reorder).toEqual({ below: true, full: 4, reorderAt: 6 })
    expect(cage.requalificationDue.map((c: { id: string }) => c.id)).toEqual([dueSoon.id])

    // a fifth full cylinder: 167.5 lb = 83.75 % of 200 → the 80 % warning
    const fifth = await freshCylinder(siteId, { areaId: station.id, status: 'empty' })
    const fill = await tech.post(`/api/cylinders/${fifth.id}/refills`, { inspection: passingInspection(), grossBeforeLb: 31, grossAfterLb: 62 })
    expect(fill.status).toBe(201)
    res = await tech.get(`/api/fuel/cage?siteId=${siteId}`)
    cage = res.body.stations.find((s: { areaId: string }) => s.areaId === station.id)
    expect(cage.counts.full).toBe(5)
    expect(cage.storedPropaneLb).toBeCloseTo(167.5, 9)
    expect(cage.storage.level).toBe('approaching')

    // two more: 234.5 lb, over the 200 lb limit
    for (let i = 0; i < 2; i++) await freshCylinder(siteId, { areaId: station.id, status: 'full' })
    res = await tech.get(`/api/fuel/cage?siteId=${siteId}`)
    cage = res.body.stations.find((s: { areaId: string }) => s.areaId === station.id)
    expect(cage.storage.level).toBe('over')
    expect(cage.reorder.below).toBe(false)
  })

  it('counts what a refused overfill left in an empty cylinder as stored propane', async () => {
    const siteId = (await site()).id
    const { client: tech } = await fuelPerson(siteId, ['technician'])
    const station = await fuelStation(siteId, 1000)
    const c = await freshCylinder(siteId, { areaId: station.id, status: 'empty' })
    const res = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), grossBeforeLb: 31, grossAfterLb: 65 })
    expect(res.status).toBe(422)
    const cage = (await tech.get(`/api/fuel/cage?siteId=${siteId}`)).body.stations[0]
    // 65 − 30 lb stamped tare = 35 lb still in the cylinder
    expect(cage.storedPropaneLb).toBeCloseTo(35, 9)
  })
})

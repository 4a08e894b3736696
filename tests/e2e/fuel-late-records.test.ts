import { afterAll, beforeEach, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { randomUUID } from 'node:crypto'
import { builtServer, type Client } from '../support/http'
import { closeTestDb, site } from '../support/db'
import { freshCylinder, fuelPerson, fuelStation, lpTruck, passingInspection, refillsOf } from '../support/fuel'

await setup(builtServer)

// A refill or a cylinder change kept on a device while the station had no signal arrives later with the
// time Save was pressed (the outbox sends it as `at`); it is stored with that time, within the 24 h window.
const hoursAgo = (h: number) => new Date(Date.now() - h * 3_600_000).toISOString()

describe('fuel records sent late from a device', () => {
  let siteId: string
  let areaId: string
  let tech: Client
  let ready: Promise<void> | undefined
  beforeEach(() => ready ??= (async () => {
    siteId = (await site()).id
    areaId = (await fuelStation(siteId)).id
    ;({ client: tech } = await fuelPerson(siteId, ['technician']))
  })())
  afterAll(closeTestDb)

  it('a refill keeps the time it was made; a time in the future or past the window is refused with a field message', async () => {
    const c = await freshCylinder(siteId, { areaId, status: 'empty' })
    const at = hoursAgo(3)
    const key = randomUUID()
    const res = await tech.post(`/api/cylinders/${c.id}/refills`, { inspection: passingInspection(), grossBeforeLb: 31, grossAfterLb: 62, at, idempotencyKey: key })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(new Date(res.body.item.at).toISOString()).toBe(at)
    const [stored] = await refillsOf(c.id)
    expect(stored!.at.toISOString()).toBe(at)
    expect(stored!.recordedAt.getTime()).toBeGreaterThan(stored!.at.getTime())

    const other = await freshCylinder(siteId, { areaId, status: 'empty' })
    const future = await tech.post(`/api/cylinders/${other.id}/refills`, { inspection: passingInspection(), grossBeforeLb: 31, grossAfterLb: 62, at: new Date(Date.now() + 3_600_000).toISOString() })
    expect(future.status).toBe(400)
    expect(future.body.data.fields.at).toMatch(/future/)
    const old = await tech.post(`/api/cylinders/${other.id}/refills`, { inspection: passingInspection(), grossBeforeLb: 31, grossAfterLb: 62, at: hoursAgo(30) })
    expect(old.status).toBe(400)
    expect(old.body.data.fields.at).toMatch(/24 h/)
    expect(await refillsOf(other.id)).toHaveLength(0)
  })

  it('a late copy of a stored refill is answered with the record, however old', async () => {
    const c = await freshCylinder(siteId, { areaId, status: 'empty' })
    const key = randomUUID()
    const body = { inspection: passingInspection(), grossBeforeLb: 31, grossAfterLb: 62, at: hoursAgo(1), idempotencyKey: key }
    const first = await tech.post(`/api/cylinders/${c.id}/refills`, body)
    expect(first.status).toBe(201)
    const copy = await tech.post(`/api/cylinders/${c.id}/refills`, { ...body, at: hoursAgo(40) })
    expect(copy.status).toBe(200)
    expect(copy.body.item.id).toBe(first.body.item.id)
    expect(await refillsOf(c.id)).toHaveLength(1)
  })

  it('a cylinder change keeps the time it was made', async () => {
    const t = await lpTruck(siteId)
    const full = await freshCylinder(siteId, { areaId, status: 'full' })
    const at = hoursAgo(2)
    const res = await tech.post(`/api/trucks/${t.id}/cylinder-exchanges`, { cylinderOnId: full.id, cylinderOffId: null, at, idempotencyKey: randomUUID() })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(new Date(res.body.item.at).toISOString()).toBe(at)
    const next = await freshCylinder(siteId, { areaId, status: 'full' })
    const future = await tech.post(`/api/trucks/${t.id}/cylinder-exchanges`, { cylinderOnId: next.id, cylinderOffId: full.id, at: new Date(Date.now() + 3_600_000).toISOString() })
    expect(future.status).toBe(400)
  })
})

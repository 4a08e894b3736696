import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { asc, eq } from 'drizzle-orm'
import { builtServer, signIn, type Client } from '../support/http'
import { area, battery, closeTestDb, rebuildSite, site, tables, user, useTestDb } from '../support/db'
import { fittedTruck, hoursAgo, pastCharge, putInTruck, roomCharger } from '../support/battery-room'
import { defaultSiteSettings } from '../../shared/utils/site-settings'

await setup(builtServer)

const codes = (body: { data?: { reasons?: { code: string }[] } }) => (body.data?.reasons ?? []).map(r => r.code)

describe('charge sessions and electrolyte checks', () => {
  let siteId: string
  let areaId: string
  let techId: string
  let tech: Client

  beforeAll(async () => {
    siteId = (await site()).id
    areaId = (await area({ siteId })).id
    const te = await user({ siteId, roles: ['technician'] })
    techId = te.id
    tech = await signIn(te)
  })
  afterAll(closeTestDb)

  const board = async () => (await tech.get(`/api/battery-room/board?siteId=${siteId}`)).body as { batteries: { id: string, state: string, readyAt: string | null, coolingMinutesLeft: number, flags: { key: string }[], cycleCount: number }[] }
  const card = async (id: string) => (await board()).batteries.find(b => b.id === id)!
  // a settings change recomputes the site's read models, as PATCH /api/sites/:id does
  const setCoolDown = async (minutes: number) => {
    await useTestDb().update(tables.sites).set({ settings: { ...defaultSiteSettings(), coolDownMinutes: minutes } }).where(eq(tables.sites.id, siteId))
    await rebuildSite(siteId)
  }
  const chargeOn = (body: Record<string, unknown>) => tech.post('/api/battery-room/charges', { idempotencyKey: randomUUID(), ...body })

  it('on charge, then off: Cooling until the site\'s cool-down has passed, then Ready; energy, cost and the cycle are counted', async () => {
    const ch = await roomCharger(siteId, areaId, { efficiency: 0.85 })
    const b = await battery({ siteId, homeAreaId: areaId })
    expect((await card(b.id)).state).toBe('needs_charge')
    const on = await chargeOn({ batteryId: b.id, chargerId: ch.id, at: hoursAgo(9).toISOString() })
    expect(on.status, JSON.stringify(on.body)).toBe(201)
    expect((await card(b.id)).state).toBe('on_charge')

    const endedAt = hoursAgo(1)
    const off = await tech.post(`/api/battery-room/charges/${on.body.item.id}/end`, { ampHoursReturned: 600, endTempF: 104, equalize: false, outcome: 'complete', endedAt: endedAt.toISOString() })
    expect(off.status, JSON.stringify(off.body)).toBe(200)
    // 600 Ah × 36 V / 1000 / 0.85 = 25.41 kWh; at the default 0.12 per kWh, 3.05
    expect(off.body.item.gridKwh).toBeCloseTo(25.412, 3)
    expect(off.body.item.energyCost).toBeCloseTo(3.049, 3)
    expect(off.body.item).toMatchObject({ countedCycle: true, ranHot: false, outcome: 'complete' })

    const cooling = await card(b.id)
    expect(cooling.state).toBe('cooling')
    expect(new Date(cooling.readyAt!).getTime()).toBe(endedAt.getTime() + 480 * 60_000)
    expect(cooling.coolingMinutesLeft).toBeGreaterThan(415)
    expect(cooling.cycleCount).toBe(1)

    await setCoolDown(61)
    expect((await card(b.id)).state).toBe('cooling')
    await setCoolDown(59)
    const ready = await card(b.id)
    expect(ready.state).toBe('ready')
    expect(new Date(ready.readyAt!).getTime()).toBe(endedAt.getTime() + 59 * 60_000)
    await setCoolDown(480)
  })

  it('a charge that ends hot is flagged; an interrupted one leaves the battery needing a charge; a second end is refused', async () => {
    const ch = await roomCharger(siteId, areaId)
    const b = await battery({ siteId, homeAreaId: areaId })
    const on = await chargeOn({ batteryId: b.id, chargerId: ch.id })
    const off = await tech.post(`/api/battery-room/charges/${on.body.item.id}/end`, { ampHoursReturned: 100, endTempF: 121, outcome: 'interrupted' })
    expect(off.status).toBe(200)
    expect(off.body.item).toMatchObject({ ranHot: true, countedCycle: false })
    const c = await card(b.id)
    expect(c.state).toBe('needs_charge')
    expect(c.flags.map(f => f.key)).toContain('ranHot')
    const twice = await tech.post(`/api/battery-room/charges/${on.body.item.id}/end`, { ampHoursReturned: 100, endTempF: 90, outcome: 'complete' })
    expect(twice.status).toBe(409)
  })

  it('an equalize charge is recorded as one and clears "equalize due"', async () => {
    const ch = await roomCharger(siteId, areaId)
    const b = await battery({ siteId, homeAreaId: areaId, inServiceOn: '2025-01-06' })
    expect((await card(b.id)).flags.map(f => f.key)).toContain('equalizeDue')
    const on = await chargeOn({ batteryId: b.id, chargerId: ch.id, at: hoursAgo(12).toISOString() })
    const off = await tech.post(`/api/battery-room/charges/${on.body.item.id}/end`, { ampHoursReturned: 700, endTempF: 100, equalize: true, outcome: 'complete', endedAt: hoursAgo(1).toISOString() })
    expect(off.body.item.equalize).toBe(true)
    expect((await card(b.id)).flags.map(f => f.key)).not.toContain('equalizeDue')
  })

  it('refuses a charger that does not match; a technician may override with a reason', async () => {
    const ch = await roomCharger(siteId, areaId, { outputVoltage: 48 })
    const b = await battery({ siteId })
    const refused = await chargeOn({ batteryId: b.id, chargerId: ch.id })
    expect(refused.status).toBe(409)
    expect(codes(refused.body)).toEqual(['charger_voltage_mismatch'])
    const small = await roomCharger(siteId, areaId, { minCapacityAh: 800 })
    expect(codes((await chargeOn({ batteryId: b.id, chargerId: small.id })).body)).toEqual(['capacity_below_charger_range'])
    const over = await chargeOn({ batteryId: b.id, chargerId: small.id, overrideReason: 'Maker approved this pairing in writing.' })
    expect(over.status).toBe(201)
    expect(over.body.item.overrideReason).toBe('Maker approved this pairing in writing.')
  })

  it('refuses a battery that is in a truck, already on charge, or a charger already in use', async () => {
    const ch = await roomCharger(siteId, areaId)
    const inTruck = await battery({ siteId })
    await putInTruck(inTruck.id, (await fittedTruck(siteId)).id)
    expect(codes((await chargeOn({ batteryId: inTruck.id, chargerId: ch.id })).body)).toEqual(['in_truck'])
    const b = await battery({ siteId })
    expect((await chargeOn({ batteryId: b.id, chargerId: ch.id })).status).toBe(201)
    const other = await roomCharger(siteId, areaId)
    expect(codes((await chargeOn({ batteryId: b.id, chargerId: other.id })).body)).toEqual(['already_on_charge'])
    const b2 = await battery({ siteId })
    expect(codes((await chargeOn({ batteryId: b2.id, chargerId: ch.id })).body)).toEqual(['charger_busy'])
  })

  it('an every-cell reading with a weak cell stores each corrected reading and raises the weak-cell flag', async () => {
    const b = await battery({ siteId, homeAreaId: areaId })
    // 18 cells at 100 °F: each corrects by +0.008 to 80 °F (0.004 per 10 °F) [pub, in several battery and engine manuals]
    const cells = Array.from({ length: 18 }, (_, i) => ({ cellNumber: i + 1, specificGravity: i === 6 ? 1.235 : 1.272, temperatureF: 100 }))
    const res = await tech.post('/api/battery-room/checks', { batteryId: b.id, level: 'ok', waterAddedGal: 0, scope: 'every_cell', cells, idempotencyKey: randomUUID() })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.lowCells).toEqual([7])
    expect(res.body.item.spread).toBeCloseTo(0.037, 6)
    expect(res.body.item.lowCellCount).toBe(1)
    // mean (17 × 1.280 + 1.243) / 18 = 1.2779, between 1.250 = 75 % and 1.280 = 100 % [pub, US Army TM 5-1185]
    expect(res.body.item.meanCorrectedSg).toBeCloseTo(1.27794, 5)
    expect(res.body.item.stateOfChargePct).toBeCloseTo(98.29, 2)
    const stored = await useTestDb().select().from(tables.cellReadings).where(eq(tables.cellReadings.checkId, res.body.item.id)).orderBy(asc(tables.cellReadings.cellNumber))
    expect(stored).toHaveLength(18)
    expect(stored[0]!.correctedSg).toBeCloseTo(1.280, 6)
    expect(stored[6]).toMatchObject({ cellNumber: 7, low: true })
    expect(stored[6]!.correctedSg).toBeCloseTo(1.243, 6)
    expect((await card(b.id)).flags.map(f => f.key)).toContain('weakCell')
  })

  it('a pilot-cell reading gives the state of charge from the TM 5-1185 table', async () => {
    const b = await battery({ siteId })
    // 1.250 at 80 °F = 75 % [pub, US Army TM 5-1185]
    const res = await tech.post('/api/battery-room/checks', { batteryId: b.id, level: 'ok', scope: 'pilot_cell', cells: [{ cellNumber: 5, specificGravity: 1.25, temperatureF: 80 }], idempotencyKey: randomUUID() })
    expect(res.status).toBe(201)
    expect(res.body.item.stateOfChargePct).toBeCloseTo(75, 6)
    expect(res.body.item.spread).toBeNull()
  })

  it('watering a battery that has not just finished a charge carries the caution; just after a charge it does not', async () => {
    const ch = await roomCharger(siteId, areaId)
    const stale = await battery({ siteId })
    const before = await tech.post('/api/battery-room/checks', { batteryId: stale.id, level: 'low', waterAddedGal: 0.5, idempotencyKey: randomUUID() })
    expect(before.status).toBe(201)
    expect(before.body.warnings.map((w: { code: string }) => w.code)).toEqual(['water_before_charge'])
    expect(before.body.warnings[0].message).toContain('Water after charging, not before, unless plates are exposed')
    expect(before.body.item.afterCharge).toBe(false)
    const fresh = await battery({ siteId })
    await pastCharge({ siteId, userId: techId, batteryId: fresh.id, chargerId: ch.id, endedHoursAgo: 1 })
    const after = await tech.post('/api/battery-room/checks', { batteryId: fresh.id, level: 'ok', waterAddedGal: 0.5, idempotencyKey: randomUUID() })
    expect(after.body.warnings).toEqual([])
    expect(after.body.item.afterCharge).toBe(true)
  })

  it('refuses the wrong number of cells, a cell beyond the battery, a sealed battery, and stores a retried check once', async () => {
    const b = await battery({ siteId })
    const few = await tech.post('/api/battery-room/checks', { batteryId: b.id, level: 'ok', scope: 'every_cell', cells: [{ cellNumber: 1, specificGravity: 1.28, temperatureF: 80 }], idempotencyKey: randomUUID() })
    expect(few.status).toBe(400)
    expect(few.body.data.fields.cells).toContain('18 cells')
    const beyond = await tech.post('/api/battery-room/checks', { batteryId: b.id, level: 'ok', scope: 'pilot_cell', cells: [{ cellNumber: 19, specificGravity: 1.28, temperatureF: 80 }], idempotencyKey: randomUUID() })
    expect(beyond.status).toBe(400)
    const nonsense = await tech.post('/api/battery-room/checks', { batteryId: b.id, level: 'ok', scope: 'pilot_cell', cells: [{ cellNumber: 1, specificGravity: 1280, temperatureF: 80 }], idempotencyKey: randomUUID() })
    expect(nonsense.status).toBe(400)
    const sealed = await battery({ siteId, chemistry: 'agm' })
    expect((await tech.post('/api/battery-room/checks', { batteryId: sealed.id, level: 'ok', idempotencyKey: randomUUID() })).status).toBe(400)
    const key = randomUUID()
    const first = await tech.post('/api/battery-room/checks', { batteryId: b.id, level: 'ok', idempotencyKey: key })
    const again = await tech.post('/api/battery-room/checks', { batteryId: b.id, level: 'ok', idempotencyKey: key })
    expect([first.status, again.status]).toEqual([201, 200])
    expect(again.body.item.id).toBe(first.body.item.id)
  })

  it('a battery held out of service through the registry shows Out of service on the board until released', async () => {
    const b = await battery({ siteId, homeAreaId: areaId })
    const hold = await tech.post(`/api/batteries/${b.id}/out-of-service`, { outOfService: true, reason: 'Terminal post loose' })
    expect(hold.status).toBe(200)
    expect((await card(b.id)).state).toBe('out_of_service')
    const release = await tech.post(`/api/batteries/${b.id}/out-of-service`, { outOfService: false, reason: 'Post re-torqued' })
    expect(release.status).toBe(200)
    expect((await card(b.id)).state).toBe('needs_charge')
  })

  it('refuses a time more than 24 h back or in the future', async () => {
    const b = await battery({ siteId })
    const ch = await roomCharger(siteId, areaId)
    const old = await chargeOn({ batteryId: b.id, chargerId: ch.id, at: hoursAgo(30).toISOString() })
    expect(old.status).toBe(400)
    expect(old.body.data.fields.at).toContain('24 h')
    const future = await chargeOn({ batteryId: b.id, chargerId: ch.id, at: hoursAgo(-2).toISOString() })
    expect(future.status).toBe(400)
  })
})

import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { eq } from 'drizzle-orm'
import { builtServer, signIn, type Client, type Reply } from '../support/http'
import { area, battery, closeTestDb, site, tables, user, useTestDb } from '../support/db'
import { fittedTruck, hoursAgo, openCharge, pastCharge, putInTruck, qualify, readyBattery, roomCharger, storedBattery } from '../support/battery-room'
import { freshCylinder, fuelPerson, fuelStation, lpTruck, passingInspection } from '../support/fuel'
import { CHARGING_KEYS, allPass, chargingArea, daysFrom, person, todayIn } from '../support/due'

await setup(builtServer)

// A record kept on a device may arrive twice (a lost answer, two tabs): the server stores it once.
const statuses = (replies: Reply[]) => replies.map(r => r.status).sort()

describe('floor records sent more than once', () => {
  let siteId: string
  let areaId: string
  let chargerId: string
  let techId: string
  let tech: Client
  let other: Client

  beforeAll(async () => {
    siteId = (await site()).id
    areaId = (await area({ siteId })).id
    chargerId = (await roomCharger(siteId, areaId)).id
    const te = await user({ siteId, roles: ['technician'] })
    techId = te.id
    await qualify(te.id)
    tech = await signIn(te)
    const ot = await user({ siteId, roles: ['technician'] })
    await qualify(ot.id)
    other = await signIn(ot)
  })
  afterAll(closeTestDb)

  const swapsWith = (key: string) => useTestDb().select().from(tables.batterySwaps).where(eq(tables.batterySwaps.idempotencyKey, key))
  const chargesWith = (key: string) => useTestDb().select().from(tables.chargeSessions).where(eq(tables.chargeSessions.idempotencyKey, key))
  const checksWith = (key: string) => useTestDb().select().from(tables.electrolyteChecks).where(eq(tables.electrolyteChecks.idempotencyKey, key))

  async function swapSetup() {
    const t = await fittedTruck(siteId, { hourMeter: 100 })
    const out = await battery({ siteId, homeAreaId: areaId })
    await putInTruck(out.id, t.id)
    const fresh = await readyBattery({ siteId, userId: techId, chargerId, homeAreaId: areaId, restedHours: 12 })
    return { truckId: t.id, batteryOutId: out.id, batteryInId: fresh.id, hourMeter: 101, idempotencyKey: randomUUID() }
  }

  it('a swap sent again is answered 200 with the stored record, and a late copy keeps the time Save was pressed', async () => {
    const body = await swapSetup()
    const pressed = hoursAgo(2).toISOString()
    const first = await tech.post('/api/battery-room/swaps', { ...body, at: pressed })
    expect(first.status, JSON.stringify(first.body)).toBe(201)
    const again = await tech.post('/api/battery-room/swaps', { ...body, at: pressed })
    expect(again.status).toBe(200)
    expect(again.body).toMatchObject({ replayed: true, item: { id: first.body.item.id } })
    const rows = await swapsWith(body.idempotencyKey)
    expect(rows).toHaveLength(1)
    expect(rows[0]!.at.toISOString()).toBe(pressed)
  })

  it('a swap sent three times at once is stored once and every copy is answered 2xx', async () => {
    const body = await swapSetup()
    const replies = await Promise.all([1, 2, 3].map(() => tech.post('/api/battery-room/swaps', body)))
    expect(statuses(replies), JSON.stringify(replies.map(r => r.body))).toEqual([200, 200, 201])
    expect(new Set(replies.map(r => r.body.item.id)).size).toBe(1)
    expect(await swapsWith(body.idempotencyKey)).toHaveLength(1)
  })

  it('a swap whose battery was taken meanwhile is refused with the reason on late arrival', async () => {
    const body = await swapSetup()
    const elsewhere = await fittedTruck(siteId, { hourMeter: 5 })
    const taken = await other.post('/api/battery-room/swaps', { truckId: elsewhere.id, batteryOutId: null, batteryInId: body.batteryInId, hourMeter: 6, idempotencyKey: randomUUID() })
    expect(taken.status, JSON.stringify(taken.body)).toBe(201)
    const late = await tech.post('/api/battery-room/swaps', { ...body, at: hoursAgo(1).toISOString() })
    expect(late.status).toBe(409)
    expect(late.body.message).toContain('someone has just taken it')
    expect(await swapsWith(body.idempotencyKey)).toHaveLength(0)
  })

  it('a retry key of someone else\'s record is refused, not answered with their record', async () => {
    const body = await swapSetup()
    expect((await tech.post('/api/battery-room/swaps', body)).status).toBe(201)
    const stolen = await other.post('/api/battery-room/swaps', body)
    expect(stolen.status).toBe(409)
    expect(stolen.body.item).toBeUndefined()
  })

  it('a battery put on charge twice, in turn and at once, is one charge session', async () => {
    const b = await battery({ siteId, homeAreaId: areaId })
    const ch = await roomCharger(siteId, areaId)
    const body = { batteryId: b.id, chargerId: ch.id, idempotencyKey: randomUUID() }
    const first = await tech.post('/api/battery-room/charges', body)
    expect(first.status, JSON.stringify(first.body)).toBe(201)
    const again = await tech.post('/api/battery-room/charges', body)
    expect(again.status).toBe(200)
    expect(again.body.item.id).toBe(first.body.item.id)
    expect(await chargesWith(body.idempotencyKey)).toHaveLength(1)

    const b2 = await battery({ siteId, homeAreaId: areaId })
    const ch2 = await roomCharger(siteId, areaId)
    const body2 = { batteryId: b2.id, chargerId: ch2.id, idempotencyKey: randomUUID() }
    const replies = await Promise.all([1, 2, 3].map(() => tech.post('/api/battery-room/charges', body2)))
    expect(statuses(replies), JSON.stringify(replies.map(r => r.body))).toEqual([200, 200, 201])
    expect(await chargesWith(body2.idempotencyKey)).toHaveLength(1)
  })

  it('a charge taken off twice, in turn and at once, ends once and counts one cycle', async () => {
    const readings = { ampHoursReturned: 600, endTempF: 104, equalize: false, outcome: 'complete' }
    for (const atOnce of [false, true]) {
      const b = await battery({ siteId, homeAreaId: areaId })
      const open = await openCharge({ siteId, userId: techId, batteryId: b.id, chargerId: (await roomCharger(siteId, areaId)).id, startedHoursAgo: 8 })
      const body = { ...readings, idempotencyKey: randomUUID(), endedAt: hoursAgo(1).toISOString() }
      const send = () => tech.post(`/api/battery-room/charges/${open.id}/end`, body)
      const replies = atOnce ? await Promise.all([send(), send(), send()]) : [await send(), await send()]
      expect(replies.every(r => r.status === 200), JSON.stringify(replies.map(r => [r.status, r.body]))).toBe(true)
      expect(replies.filter(r => r.body.replayed).length).toBe(replies.length - 1)
      expect((await storedBattery(b.id)).cycleCount).toBe(1)
      const [session] = await useTestDb().select().from(tables.chargeSessions).where(eq(tables.chargeSessions.id, open.id))
      expect(session!.endedBy).toBe(techId)
    }
  })

  it('a charge already ended by someone else, or with other readings, is a conflict', async () => {
    const b = await battery({ siteId, homeAreaId: areaId })
    const open = await openCharge({ siteId, userId: techId, batteryId: b.id, chargerId: (await roomCharger(siteId, areaId)).id, startedHoursAgo: 8 })
    const body = { ampHoursReturned: 600, endTempF: 104, equalize: false, outcome: 'complete', idempotencyKey: randomUUID() }
    expect((await other.post(`/api/battery-room/charges/${open.id}/end`, body)).status).toBe(200)
    const mine = await tech.post(`/api/battery-room/charges/${open.id}/end`, body)
    expect(mine.status).toBe(409)
    expect(mine.body.message).toContain('already been ended')
    const changed = await other.post(`/api/battery-room/charges/${open.id}/end`, { ...body, ampHoursReturned: 610 })
    expect(changed.status).toBe(409)
  })

  it('an electrolyte check sent twice, in turn and at once, is one check with one set of cell readings', async () => {
    for (const atOnce of [false, true]) {
      const b = await battery({ siteId, homeAreaId: areaId, voltage: 24, cellCount: 12 })
      await pastCharge({ siteId, userId: techId, batteryId: b.id, chargerId, endedHoursAgo: 1 })
      const cells = Array.from({ length: 12 }, (_, i) => ({ cellNumber: i + 1, specificGravity: 1.28, temperatureF: 80 }))
      const body = { batteryId: b.id, level: 'ok', waterAddedGal: 0.5, scope: 'every_cell', cells, idempotencyKey: randomUUID() }
      const send = () => tech.post('/api/battery-room/checks', body)
      const replies = atOnce ? await Promise.all([send(), send(), send()]) : [await send(), await send()]
      expect(statuses(replies), JSON.stringify(replies.map(r => r.body))).toEqual(atOnce ? [200, 200, 201] : [200, 201])
      const rows = await checksWith(body.idempotencyKey)
      expect(rows).toHaveLength(1)
      expect(await useTestDb().select().from(tables.cellReadings).where(eq(tables.cellReadings.checkId, rows[0]!.id))).toHaveLength(12)
    }
  })

  it('checklist items sent twice, in turn and at once, are entered once', async () => {
    const logArea = (await chargingArea(siteId)).id
    const { client: logger } = await person(siteId, ['technician'])
    const [tz] = await useTestDb().select({ timeZone: tables.sites.timeZone }).from(tables.sites).where(eq(tables.sites.id, siteId))
    for (const [n, atOnce] of [[1, false], [2, true]] as const) {
      const body = { siteId, areaId: logArea, date: daysFrom(todayIn(tz!.timeZone), -n), entries: allPass(CHARGING_KEYS).slice(0, 3), idempotencyKey: randomUUID() }
      const send = () => logger.post('/api/logs/entries', body)
      const replies = atOnce ? await Promise.all([send(), send(), send()]) : [await send(), await send()]
      expect(statuses(replies), JSON.stringify(replies.map(r => r.body))).toEqual(atOnce ? [200, 200, 201] : [200, 201])
      const rows = await useTestDb().select().from(tables.areaLogEntries).where(eq(tables.areaLogEntries.idempotencyKey, `${body.idempotencyKey}:${body.entries[0]!.itemKey}`))
      expect(rows).toHaveLength(1)
    }
  })

  describe('fuel station', () => {
    let stationId: string
    let fuelTech: Client
    let operator: Client

    beforeAll(async () => {
      stationId = (await fuelStation(siteId)).id
      ;({ client: fuelTech } = await fuelPerson(siteId, ['technician']))
      ;({ client: operator } = await fuelPerson(siteId, ['operator'], { trained: false }))
    })

    const refillsWith = (key: string) => useTestDb().select().from(tables.cylinderRefills).where(eq(tables.cylinderRefills.idempotencyKey, key))
    const exchangesWith = (key: string) => useTestDb().select().from(tables.cylinderExchanges).where(eq(tables.cylinderExchanges.idempotencyKey, key))

    it('a refill sent twice, in turn and at once, is one refill', async () => {
      for (const atOnce of [false, true]) {
        const c = await freshCylinder(siteId, { areaId: stationId })
        const body = { inspection: passingInspection(), grossBeforeLb: 31, grossAfterLb: 62, idempotencyKey: randomUUID() }
        const send = () => fuelTech.post(`/api/cylinders/${c.id}/refills`, body)
        const replies = atOnce ? await Promise.all([send(), send(), send()]) : [await send(), await send()]
        expect(statuses(replies), JSON.stringify(replies.map(r => r.body))).toEqual(atOnce ? [200, 200, 201] : [200, 201])
        expect(await refillsWith(body.idempotencyKey)).toHaveLength(1)
      }
    })

    it('a cylinder exchange sent twice, in turn and at once, is one exchange', async () => {
      for (const atOnce of [false, true]) {
        const t = await lpTruck(siteId)
        const on = await freshCylinder(siteId, { areaId: stationId, status: 'full' })
        const body = { cylinderOnId: on.id, cylinderOffId: null, idempotencyKey: randomUUID() }
        const send = () => operator.post(`/api/trucks/${t.id}/cylinder-exchanges`, body)
        const replies = atOnce ? await Promise.all([send(), send(), send()]) : [await send(), await send()]
        expect(statuses(replies), JSON.stringify(replies.map(r => r.body))).toEqual(atOnce ? [200, 200, 201] : [200, 201])
        expect(await exchangesWith(body.idempotencyKey)).toHaveLength(1)
      }
    })
  })
})

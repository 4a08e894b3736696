import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import postgres from 'postgres'
import { drizzle } from 'drizzle-orm/postgres-js'
import { eq } from 'drizzle-orm'
import { builtServer, signIn, type Client } from '../support/http'
import { area, batteryInput, closeTestDb, rebuildSite, site, tables, truck, user, useTestDb } from '../support/db'
import { fittedTruck, hoursAgo, putInTruck, roomCharger } from '../support/battery-room'
import { loadBatteryRows } from '../../server/utils/battery-room/status'
import { loadBatteryFactsFor } from '../../server/utils/due/facts-battery'
import { batteryCreateSchema } from '../../shared/utils/asset-schemas'

await setup(builtServer)

type Board = { batteries: { id: string, serial: string, state: string, flags: { key: string }[] }[], suggestion: { choice: string | null, ranked: string[] } | null, trucks: { id: string }[] }

describe('the Bay board', () => {
  let siteId: string
  let bigArea: string
  let otherArea: string
  let userId: string
  let chargerId: string
  let operator: Client

  // Rows straight into the database, many at a time.
  async function batteries(n: number, areaId: string, over: Record<string, unknown> = {}) {
    const values = Array.from({ length: n }, () => ({ ...batteryCreateSchema.parse(batteryInput(over)), siteId, homeAreaId: areaId }))
    return useTestDb().insert(tables.batteries).values(values).returning()
  }
  async function charged(ids: string[], endedAt: Date, open = false) {
    if (!ids.length) return
    await useTestDb().insert(tables.chargeSessions).values(ids.map(batteryId => ({
      siteId, userId, batteryId, chargerId, at: new Date(endedAt.getTime() - 8 * 3_600_000),
      ...(open ? {} : { endedAt, outcome: 'complete' as const, ampHoursReturned: 500, endTempF: 100 }),
    })))
  }

  beforeAll(async () => {
    siteId = (await site()).id
    bigArea = (await area({ siteId })).id
    otherArea = (await area({ siteId })).id
    const u = await user({ siteId, roles: ['operator'] })
    userId = u.id
    operator = await signIn(u)
    chargerId = (await roomCharger(siteId, bigArea)).id

    // 200 batteries in one area: 80 ready, 40 cooling, 40 needing a charge, 20 in trucks, 20 out of service.
    const rows = await batteries(200, bigArea)
    const ids = rows.map(r => r.id)
    await charged(ids.slice(0, 80), hoursAgo(10))
    await charged(ids.slice(80, 120), hoursAgo(2))
    for (const id of ids.slice(160, 180)) await putInTruck(id, (await fittedTruck(siteId)).id, userId)
    for (const id of ids.slice(180)) {
      await useTestDb().update(tables.batteries).set({ outOfService: true, outOfServiceReason: 'Cracked case' }).where(eq(tables.batteries.id, id))
    }
    await batteries(5, otherArea)
    await rebuildSite(siteId)
  })
  afterAll(closeTestDb)

  it('shows all 200 batteries of an area by state, and none from another area', async () => {
    const started = performance.now()
    const res = await operator.get(`/api/battery-room/board?siteId=${siteId}&areaId=${bigArea}`)
    const ms = performance.now() - started
    expect(res.status).toBe(200)
    const board = res.body as Board
    expect(board.batteries).toHaveLength(200)
    const byState = Object.fromEntries(['ready', 'cooling', 'needs_charge', 'in_truck', 'out_of_service'].map(s => [s, board.batteries.filter(b => b.state === s).length]))
    expect(byState).toEqual({ ready: 80, cooling: 40, needs_charge: 40, in_truck: 20, out_of_service: 20 })
    console.info(`board for 200 batteries answered in ${ms.toFixed(0)} ms`)
    const all = (await operator.get(`/api/battery-room/board?siteId=${siteId}`)).body as Board
    expect(all.batteries).toHaveLength(205)
  })

  it('reads the board from the read models, and computes the facts of every battery, in one statement each, however many batteries there are', async () => {
    let statements = 0
    // fetch_types off: the client's own start-up lookup of array types is not a statement of ours
    const countStatement = () => {
      statements += 1
    }
    const client = postgres(process.env.NUXT_DATABASE_URL!, { max: 1, fetch_types: false, onnotice: () => {}, debug: countStatement })
    try {
      const db = drizzle(client, { casing: 'snake_case' })
      const big = await loadBatteryRows(db, { siteId, areaId: bigArea })
      expect(big).toHaveLength(200)
      expect(statements).toBe(1)
      const small = await loadBatteryRows(db, { siteId, areaId: otherArea })
      expect(small).toHaveLength(5)
      expect(statements).toBe(2)
      const facts = await loadBatteryFactsFor(db, { siteId })
      expect(facts).toHaveLength(205)
      expect(statements).toBe(3)
      console.info(`board: 2 statements for 200 + 5 batteries; facts: 1 statement for 205`)
    }
    finally {
      await client.end()
    }
  })

  it('suggests the compatible Ready battery rested longest, then the one with fewest cycles', async () => {
    const pickArea = (await area({ siteId })).id
    const t = await fittedTruck(siteId)
    const longAgo = hoursAgo(20)
    const [recent] = await batteries(1, pickArea)
    const [worn] = await batteries(1, pickArea)
    const [fresh] = await batteries(1, pickArea)
    const [wrongVolts] = await batteries(1, pickArea, { voltage: 24, cellCount: 12 })
    const [cooling] = await batteries(1, pickArea)
    await charged([recent!.id], hoursAgo(12))
    await charged([worn!.id, fresh!.id], longAgo)
    await charged([wrongVolts!.id], hoursAgo(40))
    await charged([cooling!.id], hoursAgo(1))
    await rebuildSite(siteId)
    // cycles counted as if from their records: 10, 300 and 50
    for (const [b, cycles] of [[recent!, 10], [worn!, 300], [fresh!, 50]] as const) {
      await useTestDb().update(tables.batteryStatus).set({ cycles }).where(eq(tables.batteryStatus.batteryId, b.id))
    }
    const res = await operator.get(`/api/battery-room/board?siteId=${siteId}&areaId=${pickArea}&truckId=${t.id}`)
    expect(res.status).toBe(200)
    const board = res.body as Board
    expect(board.suggestion!.choice).toBe(fresh!.id)
    expect(board.suggestion!.ranked).toEqual([fresh!.id, worn!.id, recent!.id])
    expect((await operator.get(`/api/battery-room/board?siteId=${siteId}&truckId=${pickArea}`)).status).toBe(404)
  })

  it('sorts serials and fleet numbers as people read them: 2 before 10', async () => {
    const here = (await site()).id
    const lead = await signIn(await user({ siteId: here, roles: ['facilities_lead'] }))
    for (const fleetNumber of ['MB-10', 'MB-2', 'MB-1']) await truck({ siteId: here, fleetNumber, power: 'electric' })
    const made = Array.from({ length: 3 }, () => ({ ...batteryCreateSchema.parse(batteryInput()), siteId: here }))
    await useTestDb().insert(tables.batteries).values(made.map((b, i) => ({ ...b, serial: ['B-9', 'B-10', 'B-100'][i]! })))
    await rebuildSite(here)
    const board = await lead.get(`/api/battery-room/board?siteId=${here}`)
    expect(board.body.trucks.map((t: { fleetNumber: string }) => t.fleetNumber)).toEqual(['MB-1', 'MB-2', 'MB-10'])
    expect(board.body.batteries.map((b: { serial: string }) => b.serial)).toEqual(['B-9', 'B-10', 'B-100'])
    const list = await lead.get(`/api/batteries?siteId=${here}&sort=serial`)
    expect(list.body.items.map((b: { serial: string }) => b.serial)).toEqual(['B-9', 'B-10', 'B-100'])
    const desc = await lead.get(`/api/trucks?siteId=${here}&sort=fleetNumber&dir=desc`)
    expect(desc.body.items.map((t: { fleetNumber: string }) => t.fleetNumber)).toEqual(['MB-10', 'MB-2', 'MB-1'])
  })
})

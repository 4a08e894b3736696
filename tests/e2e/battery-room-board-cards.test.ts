import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { eq } from 'drizzle-orm'
import { area, batteryInput, closeTestDb, site, tables, truck, user, useTestDb } from '../support/db'
import { hoursAgo, roomCharger } from '../support/battery-room'
import { batteryCreateSchema } from '../../shared/utils/asset-schemas'
import { batteryCard, loadBatteryRows } from '../../server/utils/battery-room/status'
import { boardCard, boardCardsJson } from '../../server/utils/battery-room/board-cards'

// The wall board's cards are written as JSON by PostgreSQL (boardCardsJson); a truck's suggestion and the
// floor forms build them in TypeScript (batteryCard, boardCard). Here both read the same random stored
// states and obligations at random moments: around a cool-down's end to the millisecond, and around the
// site's midnight (America/Chicago, the day daylight saving time starts) against the due dates.

const BASE = Date.parse('2027-03-14T06:00:00Z') // local midnight in Chicago, the morning clocks go forward
const HOUR = 3_600_000
const STORED = ['out_of_service', 'in_truck', 'on_charge', 'charged', 'needs_charge'] as const
const day = fc.integer({ min: -3, max: 3 }).map(n => new Date(BASE + n * 24 * HOUR).toISOString().slice(0, 10))
const obligation = fc.option(fc.record({
  dueOn: fc.option(day, { nil: null }),
  dueAtCount: fc.option(fc.integer({ min: 0, max: 12 }), { nil: null }),
  countNow: fc.option(fc.integer({ min: 0, max: 12 }), { nil: null }),
  dueSoonDays: fc.integer({ min: 0, max: 3 }),
}), { nil: null })
const status = fc.option(fc.record({
  state: fc.constantFrom(...STORED),
  readyOffset: fc.option(fc.oneof(fc.integer({ min: -3 * HOUR, max: 3 * HOUR }), fc.constantFrom(-1, 0, 1, 59_999, 60_000, 60_001)), { nil: null }),
  cycles: fc.integer({ min: 0, max: 2000 }),
  weakCell: fc.boolean(),
  ranHot: fc.boolean(),
  onCharger: fc.boolean(),
}), { nil: null })
const battery = fc.record({ outOfService: fc.boolean(), status, watering: obligation, equalize: obligation })

describe('the Bay board\'s cards made in PostgreSQL', () => {
  let siteId: string
  let areaA: string
  let chargerId: string
  let sessionId: string
  let trucks: string[]
  let batteries: string[]
  const timeZone = 'America/Chicago'

  beforeAll(async () => {
    siteId = (await site({ timeZone })).id
    areaA = (await area({ siteId })).id
    const areaB = (await area({ siteId })).id
    chargerId = (await roomCharger(siteId, areaA)).id
    const u = await user({ siteId, roles: ['operator'] })
    trucks = [(await truck({ siteId })).id, (await truck({ siteId })).id]
    const rows = await useTestDb().insert(tables.batteries).values(Array.from({ length: 12 }, (_, i) => ({
      ...batteryCreateSchema.parse(batteryInput()), siteId, homeAreaId: i % 2 ? areaA : areaB,
    }))).returning()
    batteries = rows.map(r => r.id)
    await useTestDb().insert(tables.tags).values({ code: `BRD-${batteries[0]!.slice(0, 8)}`, assetKind: 'battery', assetId: batteries[0]!, siteId })
    const [session] = await useTestDb().insert(tables.chargeSessions).values({ siteId, userId: u.id, batteryId: batteries[1]!, chargerId, at: hoursAgo(1) }).returning()
    sessionId = session!.id
  })
  afterAll(closeTestDb)

  async function store(facts: fc.Value<typeof battery>[]) {
    const db = useTestDb()
    await db.delete(tables.batteryStatus).where(eq(tables.batteryStatus.siteId, siteId))
    await db.delete(tables.obligations).where(eq(tables.obligations.siteId, siteId))
    let truckIndex = 0
    for (const [i, f] of facts.entries()) {
      const batteryId = batteries[i]!
      await db.update(tables.batteries).set({ outOfService: f.outOfService, outOfServiceReason: f.outOfService ? 'Cracked case' : null }).where(eq(tables.batteries.id, batteryId))
      if (f.status) {
        const s = f.status
        const truckId = s.state === 'in_truck' && truckIndex < trucks.length ? trucks[truckIndex++]! : null
        await db.insert(tables.batteryStatus).values({
          batteryId, siteId, state: s.state, stateSince: new Date(BASE - 5 * HOUR), cycles: s.cycles, weakCell: s.weakCell, ranHot: s.ranHot,
          readyAt: s.readyOffset === null ? null : new Date(BASE + s.readyOffset), truckId,
          chargeSessionId: s.state === 'on_charge' ? sessionId : null, chargerId: s.onCharger ? chargerId : null,
        })
      }
      for (const [rule, o] of [['battery_watering', f.watering], ['battery_equalize', f.equalize]] as const) {
        if (!o) continue
        await db.insert(tables.obligations).values({
          siteId, ruleKey: rule, kind: rule, subjectKind: 'battery', subjectId: batteryId, label: 'B', what: rule, responsibleRole: 'technician', ...o,
        })
      }
    }
  }

  it('are the TypeScript cards for the same rows at the same moment', async () => {
    const moment = fc.oneof(fc.integer({ min: -2 * 24 * HOUR, max: 2 * 24 * HOUR }), fc.constantFrom(-1, 0, 1, 60_000, 24 * HOUR - 1, 24 * HOUR))
    await fc.assert(fc.asyncProperty(fc.array(battery, { minLength: 12, maxLength: 12 }), fc.array(moment, { minLength: 3, maxLength: 3 }), async (facts, moments) => {
      await store(facts)
      for (const offset of moments) {
        const now = new Date(BASE + offset)
        for (const areaId of [undefined, areaA]) {
          const fromSql = JSON.parse(await boardCardsJson(useTestDb(), { siteId, areaId }, now))
          const fromTs = (await loadBatteryRows(useTestDb(), { siteId, areaId })).map(r => boardCard(batteryCard(r, timeZone, now)))
          expect(fromSql).toEqual(JSON.parse(JSON.stringify(fromTs)))
        }
      }
    }), { numRuns: 40 })
  })
})

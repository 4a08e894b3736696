import type { z } from 'zod'
import { batteryTruckFit, isIssuableBattery, rankBatteriesForTruck } from '#shared/utils/battery-fit'
import type { boardQuerySchema } from '#shared/utils/battery-room-schemas'
import type { BoardCardData } from '#shared/types/floor'
import type { BatteryCard } from './status'

export type BoardQuery = z.output<typeof boardQuerySchema>

// The Bay board: every battery of an area (or the site) from battery_status with its state at this
// moment, the electric trucks to pick from, and for a chosen truck the batteries in the order to take them.
// Wall screens and phones poll the board; one read per site revision serves them all for a few seconds
// (the cooling countdown moves with the clock alone, so the time limit is short).
export const BOARD_CACHE_MS = 5_000

export const boardCacheKey = (query: BoardQuery) => `board:${query.areaId ?? ''}:${query.truckId ?? ''}`

/** The fields of a battery card the board shows (the floor forms' look-up sends the whole card). */
const boardCard = (c: BatteryCard): BoardCardData => ({
  id: c.id, serial: c.serial, tagCode: c.tagCode, voltage: c.voltage, capacityAh: c.capacityAh, cycleCount: c.cycleCount,
  ratedCycles: c.ratedCycles, outOfServiceReason: c.outOfServiceReason, state: c.state, coolingMinutesLeft: c.coolingMinutesLeft,
  readyAt: c.readyAt, flags: c.flags, readiness: c.readiness.map(r => ({ code: r.code })),
  truck: c.truck ? { id: c.truck.id, fleetNumber: c.truck.fleetNumber } : null,
  charge: c.charge ? { chargerName: c.charge.chargerName } : null,
})

export async function computeBoard(query: BoardQuery) {
  const db = useDb()
  const now = new Date()
  const [settings, areas, rows, trucks, checks] = await Promise.all([
    batteryRoomSettings(db, query.siteId),
    db.select({ id: tables.areas.id, name: tables.areas.name }).from(tables.areas)
      .where(and(eq(tables.areas.siteId, query.siteId), eq(tables.areas.kind, 'charging_area'), eq(tables.areas.archived, false)))
      .orderBy(asc(natural(tables.areas.name))),
    loadBatteryRows(db, { siteId: query.siteId, areaId: query.areaId }),
    db.select({
      id: tables.trucks.id, fleetNumber: tables.trucks.fleetNumber, systemVoltage: tables.trucks.systemVoltage, outOfService: tables.trucks.outOfService,
      compartmentLengthIn: tables.trucks.compartmentLengthIn, compartmentWidthIn: tables.trucks.compartmentWidthIn, compartmentHeightIn: tables.trucks.compartmentHeightIn,
      minBatteryWeightLb: tables.trucks.minBatteryWeightLb, maxBatteryWeightLb: tables.trucks.maxBatteryWeightLb, connector: tables.trucks.connector, allowedChemistries: tables.trucks.allowedChemistries,
    }).from(tables.trucks)
      .where(and(eq(tables.trucks.siteId, query.siteId), eq(tables.trucks.power, 'electric')))
      .orderBy(asc(natural(tables.trucks.fleetNumber))),
    shiftInspectionStatus(db, query.siteId, now),
  ])
  if (query.areaId && !areas.some(a => a.id === query.areaId)) throw createError({ statusCode: 404, message: 'No such charging area at this site.' })
  const cards = rows.map(r => batteryCard(r, settings.timeZone, now))
  let suggestion = null
  if (query.truckId) {
    const truck = trucks.find(t => t.id === query.truckId)
    if (!truck) throw createError({ statusCode: 404, message: 'No such electric truck at this site.' })
    const spec = truckSpec(truck)
    const byId = new Map(rows.map(r => [r.id, r]))
    const ranked = rankBatteriesForTruck(cards.filter(c => c.state !== 'in_truck').map(c => ({
      id: c.id, ready: c.readiness.length === 0, cycleCount: c.cycleCount,
      restedSince: c.readyAt ? new Date(c.readyAt) : null,
      fitReasons: batteryTruckFit(spec, byId.get(c.id)!),
    })))
    const issuable = ranked.filter(isIssuableBattery)
    suggestion = {
      truckId: truck.id,
      choice: issuable[0]?.id ?? null,
      ranked: issuable.slice(0, 5).map(r => r.id),
      compatibleNotReady: ranked.filter(r => r.fitReasons.length === 0 && !r.ready).length,
    }
  }
  const byTruck = new Map(cards.filter(c => c.truck).map(c => [c.truck!.id, c]))
  return {
    now: now.toISOString(),
    areaId: query.areaId ?? null,
    areas,
    policy: { coolDownMinutes: settings.coolDownMinutes, cellSpreadThreshold: settings.cellSpreadThreshold },
    batteries: cards.map(boardCard),
    trucks: trucks.map(t => ({ id: t.id, fleetNumber: t.fleetNumber, systemVoltage: t.systemVoltage, outOfService: t.outOfService, batteryId: byTruck.get(t.id)?.id ?? null, inspection: checks.stateOf[t.id] ?? null })),
    suggestion,
  }
}

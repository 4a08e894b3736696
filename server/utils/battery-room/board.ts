import type { z } from 'zod'
import { batteryTruckFit, isIssuableBattery, rankBatteriesForTruck } from '#shared/utils/battery-fit'
import type { boardQuerySchema } from '#shared/utils/battery-room-schemas'
import type { BoardReply as BoardAnswer } from '#shared/types/floor'
import { shiftStartedAt } from '#shared/utils/shift-times'
import { parseSiteSettings } from '#shared/utils/site-settings'
import { boardCard, boardWallJson } from './board-cards'
import { truckCheckState } from '../inspection/shift'
import type { Actor } from '../auth'
import type { Database } from '../db'

export type BoardQuery = z.output<typeof boardQuerySchema>

// The Bay board: every battery of an area (or the site) from battery_status with its state at this
// moment, the electric trucks to pick from, and for a chosen truck the batteries in the order to take them.
// Wall screens and phones poll the board; one read per site revision serves them all for a few seconds
// (the cooling countdown moves with the clock alone, so the time limit is short).
export const BOARD_CACHE_MS = 5_000

export const boardCacheKey = (query: BoardQuery) => `board:${query.areaId ?? ''}:${query.truckId ?? ''}`

export async function computeBoard(actor: Actor, query: BoardQuery): Promise<BoardAnswer | JsonText> {
  const db = useDb()
  const now = new Date()
  // the wall board (no truck chosen) reads its areas, trucks, cards and the site's settings in one
  // statement; a truck's suggestion needs the cards as rows and the trucks' sizes
  const [settings, areas, trucks, cards] = query.truckId
    ? await Promise.all([
        cachedBatteryRoomSettings(actor, query.siteId), areasOf(db, query.siteId), trucksOf(db, query.siteId),
        loadBatteryRows(db, { siteId: query.siteId, areaId: query.areaId }),
      ])
    : await boardWallJson(db, query, now).then(w => [{ ...parseSiteSettings(w.settings), timeZone: w.timeZone }, w.areas, w.trucks, w.cards] as const)
  if (query.areaId && !areas.some(a => a.id === query.areaId)) throw codedError(404, 'no_such_charging_area', 'No such charging area at this site.')
  const shiftStart = shiftStartedAt(now, settings.shiftStarts, settings.timeZone)
  const head = {
    now: now.toISOString(),
    areaId: query.areaId ?? null,
    areas,
    policy: { coolDownMinutes: settings.coolDownMinutes, cellSpreadThreshold: settings.cellSpreadThreshold },
  }
  const truckList = trucks.map(t => ({
    id: t.id, fleetNumber: t.fleetNumber, systemVoltage: t.systemVoltage, outOfService: t.outOfService, batteryId: t.batteryId,
    inspection: t.outOfService ? null : truckCheckState(t, shiftStart),
  }))
  if (typeof cards === 'string') {
    return new JsonText(`${JSON.stringify(head).slice(0, -1)},"batteries":${cards},${JSON.stringify({ trucks: truckList, suggestion: null }).slice(1)}`)
  }
  const cardsAt = cards.map(r => batteryCard(r, settings.timeZone, now))
  const truck = (trucks as Awaited<ReturnType<typeof trucksOf>>).find(t => t.id === query.truckId)
  if (!truck) throw codedError(404, 'no_such_electric_truck', 'No such electric truck at this site.')
  const spec = truckSpec(truck)
  const byId = new Map(cards.map(r => [r.id, r]))
  const ranked = rankBatteriesForTruck(cardsAt.filter(c => c.state !== 'in_truck').map(c => ({
    id: c.id, ready: c.readiness.length === 0, cycleCount: c.cycleCount,
    restedSince: c.readyAt ? new Date(c.readyAt) : null,
    fitReasons: batteryTruckFit(spec, byId.get(c.id)!),
  })))
  const issuable = ranked.filter(isIssuableBattery)
  const suggestion = {
    truckId: truck.id,
    choice: issuable[0]?.id ?? null,
    ranked: issuable.slice(0, 5).map(r => r.id),
    compatibleNotReady: ranked.filter(r => r.fitReasons.length === 0 && !r.ready).length,
  }
  return { ...head, batteries: cardsAt.map(boardCard), trucks: truckList, suggestion }
}

const areasOf = (db: Database, siteId: string) => db.select({ id: tables.areas.id, name: tables.areas.name }).from(tables.areas)
  .where(and(eq(tables.areas.siteId, siteId), eq(tables.areas.kind, 'charging_area'), eq(tables.areas.archived, false)))
  .orderBy(asc(natural(tables.areas.name)))

/** The site's electric trucks with what a battery must fit (for a truck's suggestion). */
const trucksOf = (db: Database, siteId: string) => db.select({
  id: tables.trucks.id, fleetNumber: tables.trucks.fleetNumber, systemVoltage: tables.trucks.systemVoltage, outOfService: tables.trucks.outOfService,
  compartmentLengthIn: tables.trucks.compartmentLengthIn, compartmentWidthIn: tables.trucks.compartmentWidthIn, compartmentHeightIn: tables.trucks.compartmentHeightIn,
  minBatteryWeightLb: tables.trucks.minBatteryWeightLb, maxBatteryWeightLb: tables.trucks.maxBatteryWeightLb, connector: tables.trucks.connector, allowedChemistries: tables.trucks.allowedChemistries,
  batteryId: tables.batteryStatus.batteryId,
  lastInspectionAt: tables.truckStatus.lastInspectionAt, holdSince: tables.truckStatus.holdSince, holdReason: tables.truckStatus.holdReason,
}).from(tables.trucks)
  .leftJoin(tables.batteryStatus, eq(tables.batteryStatus.truckId, tables.trucks.id))
  // joined by the site too, so PostgreSQL reads this site's truck status rows by index, not all of them
  .leftJoin(tables.truckStatus, and(eq(tables.truckStatus.truckId, tables.trucks.id), eq(tables.truckStatus.siteId, siteId)))
  .where(and(eq(tables.trucks.siteId, siteId), eq(tables.trucks.power, 'electric')))
  .orderBy(asc(natural(tables.trucks.fleetNumber)))

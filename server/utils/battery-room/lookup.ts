import type { z } from 'zod'
import type { lookupQuerySchema } from '#shared/utils/battery-room-schemas'
import { normalizeTagCode } from '#shared/utils/tag-codes'

export type LookupQuery = z.output<typeof lookupQuerySchema>

async function liveTag(kind: string, id: string) {
  const t = tables.tags
  return (await useDb().select({ code: t.code }).from(t).where(and(eq(t.assetKind, kind as never), eq(t.assetId, id), isNull(t.retiredAt))))[0]?.code ?? null
}

async function findTarget(query: LookupQuery): Promise<{ kind: string, id: string } | undefined> {
  const db = useDb()
  const code = normalizeTagCode(query.code)
  if (code) {
    const [tag] = await db.select().from(tables.tags).where(and(eq(tables.tags.code, code), eq(tables.tags.siteId, query.siteId)))
    if (tag) return { kind: tag.assetKind, id: tag.assetId }
  }
  const typed = query.code.trim().toLowerCase()
  const [bat] = await db.select({ id: tables.batteries.id }).from(tables.batteries).where(and(eq(tables.batteries.siteId, query.siteId), sql`lower(${tables.batteries.serial}) = ${typed}`))
  if (bat) return { kind: 'battery', id: bat.id }
  const [trk] = await db.select({ id: tables.trucks.id }).from(tables.trucks).where(and(eq(tables.trucks.siteId, query.siteId), sql`lower(${tables.trucks.fleetNumber}) = ${typed}`))
  if (trk) return { kind: 'truck', id: trk.id }
  const [chg] = await db.select({ id: tables.chargers.id }).from(tables.chargers).where(and(eq(tables.chargers.siteId, query.siteId), sql`lower(${tables.chargers.name}) = ${typed}`))
  return chg ? { kind: 'charger', id: chg.id } : undefined
}

// A typed or scanned code (tag code, battery serial, truck fleet number or charger name) at a site,
// with what the floor forms need to know about it.
export async function lookupFloorCode(query: LookupQuery) {
  const db = useDb()
  const target = await findTarget(query)
  if (!target) throw codedError(404, 'code_not_found', `No battery, truck or charger "${query.code.trim()}" at this site. Check the label and type it again.`, { params: { code: query.code.trim() } })
  if (target.kind === 'battery') {
    const settings = await batteryRoomSettings(db, query.siteId)
    const [row] = await loadBatteryRows(db, { siteId: query.siteId, batteryIds: [target.id] })
    if (!row) throw codedError(404, 'no_such_battery', 'No such battery at this site.')
    return { kind: 'battery' as const, id: target.id, code: row.tagCode, label: row.serial, battery: batteryCard(row, settings.timeZone, new Date()) }
  }
  if (target.kind === 'truck') {
    const [found] = await db.select({ truck: tables.trucks, hourMeter: tables.truckStatus.hourMeter }).from(tables.trucks)
      .leftJoin(tables.truckStatus, eq(tables.truckStatus.truckId, tables.trucks.id)).where(eq(tables.trucks.id, target.id))
    const truck = found!.truck
    const [current] = await db.select({ id: tables.batteries.id, serial: tables.batteries.serial }).from(tables.batteryStatus)
      .innerJoin(tables.batteries, eq(tables.batteries.id, tables.batteryStatus.batteryId)).where(eq(tables.batteryStatus.truckId, target.id))
    return {
      kind: 'truck' as const, id: target.id, code: await liveTag('truck', target.id), label: truck.fleetNumber,
      truck: {
        fleetNumber: truck.fleetNumber, power: truck.power, systemVoltage: truck.systemVoltage, hourMeter: found!.hourMeter ?? truck.hourMeter,
        outOfService: truck.outOfService, currentBattery: current ? { ...current, tagCode: await liveTag('battery', current.id) } : null,
      },
    }
  }
  if (target.kind === 'charger') {
    const [charger] = await db.select().from(tables.chargers).where(eq(tables.chargers.id, target.id))
    const cs = tables.chargeSessions
    const [open] = await db.select({ id: cs.id, batteryId: cs.batteryId, at: cs.at, serial: tables.batteries.serial }).from(tables.batteryStatus)
      .innerJoin(cs, eq(cs.id, tables.batteryStatus.chargeSessionId))
      .innerJoin(tables.batteries, eq(tables.batteries.id, cs.batteryId))
      .where(eq(tables.batteryStatus.chargerId, target.id))
    return {
      kind: 'charger' as const, id: target.id, code: await liveTag('charger', target.id), label: charger!.name,
      charger: { name: charger!.name, outputVoltage: charger!.outputVoltage, outOfService: charger!.outOfService, chemistryProfiles: charger!.chemistryProfiles, minCapacityAh: charger!.minCapacityAh, maxCapacityAh: charger!.maxCapacityAh, openSession: open ?? null },
    }
  }
  throw codedError(404, 'code_not_battery_room', `"${query.code.trim()}" is not a battery, truck or charger.`, { params: { code: query.code.trim() } })
}

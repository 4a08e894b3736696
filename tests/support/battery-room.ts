import { sql } from 'drizzle-orm'
import { battery, charger, refreshReadModels, tables, truck, useTestDb } from './db'

const HOUR = 3_600_000
export const hoursAgo = (h: number) => new Date(Date.now() - h * HOUR)

/** An electric truck with a full nameplate: 36 V, Grey 350 A, flooded lead-acid, 1,800–2,400 lb, 40 × 22 × 33 in. */
export function fittedTruck(siteId: string, over: Record<string, unknown> = {}) {
  return truck({
    siteId, connector: 'Grey 350 A', compartmentLengthIn: 40, compartmentWidthIn: 22, compartmentHeightIn: 33, ...over,
  })
}

/** A battery's row with where it is now (battery_status: the swaps decide it). */
export async function storedBattery(id: string) {
  const [row] = await useTestDb().select({ battery: tables.batteries, truckId: tables.batteryStatus.truckId, cycles: tables.batteryStatus.cycles })
    .from(tables.batteries).leftJoin(tables.batteryStatus, sql`${tables.batteryStatus.batteryId} = ${tables.batteries.id}`).where(sql`${tables.batteries.id} = ${id}`)
  return { ...row!.battery, currentTruckId: row!.truckId ?? null, cycleCount: row!.cycles ?? 0 }
}

/** A truck's hour meter now (truck_status: its latest reading). */
export async function truckHours(id: string) {
  const [row] = await useTestDb().select({ hourMeter: tables.truckStatus.hourMeter }).from(tables.truckStatus).where(sql`${tables.truckStatus.truckId} = ${id}`)
  return row?.hourMeter ?? null
}

/** A tag code for a fixture row, from the same gap-free counter the server uses. */
export async function tagFor(kind: 'battery' | 'truck' | 'charger' | 'cylinder', assetId: string, siteId: string): Promise<string> {
  const prefix = { battery: 'B', truck: 'T', charger: 'C', cylinder: 'L' }[kind]
  const [row] = await useTestDb().execute<{ last: number }>(sql`
    INSERT INTO tag_counters (prefix, last) VALUES (${prefix}, 1)
    ON CONFLICT (prefix) DO UPDATE SET last = tag_counters.last + 1 RETURNING last`)
  const code = `${prefix}-${String(row!.last).padStart(5, '0')}`
  await useTestDb().insert(tables.tags).values({ code, assetKind: kind, assetId, siteId })
  return code
}

/** A finished charge written straight to the database (ended `endedHoursAgo` ago after 8 h on charge). */
export async function pastCharge(o: { siteId: string, userId: string, batteryId: string, chargerId: string, endedHoursAgo: number, equalize?: boolean, endTempF?: number, outcome?: 'complete' | 'interrupted' }) {
  const [row] = await useTestDb().insert(tables.chargeSessions).values({
    siteId: o.siteId, userId: o.userId, batteryId: o.batteryId, chargerId: o.chargerId,
    at: hoursAgo(o.endedHoursAgo + 8), endedAt: hoursAgo(o.endedHoursAgo), endedBy: o.userId,
    ampHoursReturned: 500, endTempF: o.endTempF ?? 100, equalize: o.equalize ?? false, outcome: o.outcome ?? 'complete',
  }).returning()
  await refreshReadModels(o.siteId, [{ kind: 'battery', id: o.batteryId }])
  return row!
}

/** A charge still running, started `startedHoursAgo` ago. */
export async function openCharge(o: { siteId: string, userId: string, batteryId: string, chargerId: string, startedHoursAgo: number }) {
  const [row] = await useTestDb().insert(tables.chargeSessions).values({
    siteId: o.siteId, userId: o.userId, batteryId: o.batteryId, chargerId: o.chargerId, at: hoursAgo(o.startedHoursAgo),
  }).returning()
  await refreshReadModels(o.siteId, [{ kind: 'battery', id: o.batteryId }])
  return row!
}

/** A battery that is Ready: its last charge ended `restedHours` ago (past the default 8 h cool-down). */
export async function readyBattery(o: { siteId: string, userId: string, chargerId: string, restedHours?: number } & Record<string, unknown>) {
  const { userId, chargerId, restedHours, ...rest } = o
  const b = await battery(rest as { siteId: string })
  await pastCharge({ siteId: o.siteId, userId, batteryId: b.id, chargerId, endedHoursAgo: restedHours ?? 9 })
  return b
}

/** A charger in a charging area that matches the default fixture battery (36 V, flooded, 500–1,000 Ah). */
export function roomCharger(siteId: string, areaId: string, over: Record<string, unknown> = {}) {
  return charger({ siteId, areaId, ...over })
}

export async function qualify(userId: string, expiresOn = '2099-12-31') {
  await useTestDb().insert(tables.qualifications).values({ userId, kind: 'battery_changing', trainedOn: '2025-01-06', expiresOn })
}

/** The battery fitted in the truck, as a swap record an hour ago (where a battery is comes from the swaps). */
export async function putInTruck(batteryId: string, truckId: string, userId?: string) {
  const db = useTestDb()
  const [b] = await db.select({ siteId: tables.batteries.siteId }).from(tables.batteries).where(sql`${tables.batteries.id} = ${batteryId}`)
  const by = userId ?? (await db.select({ id: tables.users.id }).from(tables.users).limit(1))[0]?.id
  await db.insert(tables.batterySwaps).values({ siteId: b!.siteId, userId: by!, at: hoursAgo(1), truckId, batteryInId: batteryId, hourMeter: null })
  await refreshReadModels(b!.siteId, [{ kind: 'battery', id: batteryId }, { kind: 'truck', id: truckId }])
}

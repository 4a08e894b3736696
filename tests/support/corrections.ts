import { randomUUID } from 'node:crypto'
import type { CorrectableKind } from '../../shared/utils/correction-schemas'
import { tables, useTestDb } from './db'

// One fresh record of each correctable kind, written straight to the database (the records the routes
// would have stored), and a valid correction body for it.
export interface RecordWorld { siteId: string, userId: string, truckId: string, batteryId: string, chargerId: string, lpTruckId: string, cylinderId: string, areaId: string }

const today = () => new Date().toISOString().slice(0, 10)

export async function freshRecord(kind: CorrectableKind, w: RecordWorld, at = new Date(), recordedAt = at): Promise<string> {
  const db = useTestDb()
  const base = { siteId: w.siteId, userId: w.userId, at, recordedAt }
  const one = async (rows: { id: string }[]) => rows[0]!.id
  switch (kind) {
    case 'battery-swap': return one(await db.insert(tables.batterySwaps).values({ ...base, truckId: w.truckId, batteryInId: w.batteryId, hourMeter: 10 }).returning())
    case 'charge-session': return one(await db.insert(tables.chargeSessions).values({ ...base, batteryId: w.batteryId, chargerId: w.chargerId, endedAt: at, endedBy: w.userId, ampHoursReturned: 500, endTempF: 100, outcome: 'complete' }).returning())
    case 'electrolyte-check': return one(await db.insert(tables.electrolyteChecks).values({ ...base, batteryId: w.batteryId, level: 'ok' }).returning())
    case 'cylinder-refill': return one(await db.insert(tables.cylinderRefills).values({ ...base, cylinderId: w.cylinderId, inspection: {}, grossBeforeLb: 31, grossAfterLb: 60, productSg: 0.504, netAddedLb: 29 }).returning())
    case 'cylinder-exchange': return one(await db.insert(tables.cylinderExchanges).values({ ...base, truckId: w.lpTruckId, cylinderOnId: w.cylinderId }).returning())
    case 'requalification': return one(await db.insert(tables.requalifications).values({ ...base, cylinderId: w.cylinderId, performedOn: today(), method: 'external_visual', marking: 'E', passed: true }).returning())
    case 'emissions-test': return one(await db.insert(tables.emissionsTests).values({ ...base, truckId: w.lpTruckId, testedOn: today(), testerName: 'Tess Tester', coIdlePct: 0.5, coHighIdlePct: 0.5, passed: true, nextDueOn: today() }).returning())
    case 'co-reading': return one(await db.insert(tables.coReadings).values({ ...base, areaId: w.areaId, takenOn: today(), ppm: 5, durationHours: 8 }).returning())
  }
}

/** A correction body for a record made by `freshRecord`. */
export function correctionBody(kind: CorrectableKind, w: RecordWorld): Record<string, unknown> {
  const common = { reason: 'Typed the wrong figure.', idempotencyKey: randomUUID() }
  switch (kind) {
    case 'battery-swap': return { ...common, truckId: w.truckId, batteryInId: w.batteryId, hourMeter: 12 }
    case 'charge-session': return { ...common, ampHoursReturned: 450, endTempF: 101, outcome: 'complete' }
    case 'electrolyte-check': return { ...common, level: 'low', waterAddedGal: 1 }
    case 'cylinder-refill': return { ...common, grossBeforeLb: 31, grossAfterLb: 58 }
    case 'cylinder-exchange': return { ...common, cylinderOnId: w.cylinderId, hourMeter: 20 }
    case 'requalification': return { ...common, method: 'external_visual', marking: 'E' }
    case 'emissions-test': return { ...common, testerName: 'Tess Tester', coIdlePct: 0.6, coHighIdlePct: 0.6 }
    case 'co-reading': return { ...common, ppm: 6, durationHours: 8 }
  }
}

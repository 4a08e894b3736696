import { eq } from 'drizzle-orm'
import type { InspectionFact } from '../../shared/utils/truck-inspection'
import { tables, useTestDb } from './db'

// The inspection facts of a site's trucks worked out in memory from the records (for readModelsFromRecords):
// the readings inspections add, the failed critical checks since the last return, the last of each.

export interface TruckInspectionFacts {
  readings: { at: Date, recordedAt: Date, hourMeter: number | null, truckId: string }[]
  failedInspections: InspectionFact[]
  lastReturnAt: Date | null
  lastInspectionAt: Date | null
}

export async function inspectionFactsFromRecords(siteId: string): Promise<(truckId: string) => TruckInspectionFacts> {
  const db = useTestDb()
  const [inspections, returns, people] = await Promise.all([
    db.select().from(tables.truckInspections).where(eq(tables.truckInspections.siteId, siteId)),
    db.select().from(tables.truckReturns).where(eq(tables.truckReturns.siteId, siteId)),
    db.select({ id: tables.users.id, name: tables.users.name }).from(tables.users),
  ])
  const nameOf = new Map(people.map(p => [p.id, p.name]))
  const max = (dates: Date[]) => (dates.length ? new Date(Math.max(...dates.map(d => d.getTime()))) : null)
  return (truckId) => {
    const mine = inspections.filter(i => i.truckId === truckId)
    const lastReturnAt = max(returns.filter(r => r.truckId === truckId).map(r => r.at))
    return {
      readings: mine.filter(i => i.hourMeter !== null),
      lastReturnAt,
      lastInspectionAt: max(mine.map(i => i.at)),
      failedInspections: mine.filter(i => i.criticalFailed.length > 0 && (!lastReturnAt || i.at > lastReturnAt))
        .map(i => ({ id: i.id, at: i.at, userId: i.userId, userName: nameOf.get(i.userId) ?? '', criticalFailed: i.criticalFailed })),
    }
  }
}

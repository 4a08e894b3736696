import { sql } from 'drizzle-orm'
import { parseSiteSettings } from '#shared/utils/site-settings'
import { localDate } from '#shared/utils/due-dates'
import { localDayStart, shiftStartedAt } from '#shared/utils/shift-times'
import type { ShiftInspectionStatus, TruckCheckState } from '#shared/types/inspection'
import type { DbOrTx } from '../db'

// The site's pre-shift checks at this moment (29 CFR 1910.178(q)(7): examined before being placed in
// service, after each shift where trucks run round the clock). Read at request time: the shift boundary
// moves with the clock, not with a record.
export async function shiftInspectionStatus(db: DbOrTx, siteId: string, now = new Date()): Promise<ShiftInspectionStatus> {
  const [site] = await db.select({ settings: tables.sites.settings, timeZone: tables.sites.timeZone }).from(tables.sites).where(eq(tables.sites.id, siteId))
  const timeZone = site?.timeZone ?? 'UTC'
  const since = shiftStartedAt(now, parseSiteSettings(site?.settings).shiftStarts, timeZone)
  const dayStart = localDayStart(localDate(now, timeZone), timeZone)
  const rows = (await db.execute(sql`
    SELECT t.id, t.fleet_number AS "fleetNumber",
      (SELECT code FROM tags WHERE tags.asset_kind = 'truck' AND tags.asset_id = t.id AND tags.retired_at IS NULL) AS "tagCode",
      ts.last_inspection_at AS "lastInspectionAt", ts.hold_since AS "holdSince", ts.hold_reason AS "holdReason",
      GREATEST((SELECT max(s.at) FROM battery_swaps s WHERE s.truck_id = t.id), (SELECT max(x.at) FROM cylinder_exchanges x WHERE x.truck_id = t.id)) AS "lastUsedAt"
    FROM trucks t LEFT JOIN truck_status ts ON ts.truck_id = t.id
    WHERE t.site_id = ${siteId} AND NOT t.out_of_service
    ORDER BY t.fleet_number COLLATE natural_sort`)) as unknown as { id: string, fleetNumber: string, tagCode: string | null, lastInspectionAt: string | Date | null, holdSince: string | Date | null, holdReason: string | null, lastUsedAt: string | Date | null }[]
  const time = (v: string | Date | null) => (v === null ? null : new Date(v))
  const out: ShiftInspectionStatus = { shiftStartedAt: since.toISOString(), unchecked: [], held: [], stateOf: {} }
  for (const r of rows) {
    const inspected = time(r.lastInspectionAt)
    const heldSince = time(r.holdSince)
    const state = truckCheckState(r, since)
    out.stateOf[r.id] = state
    if (heldSince && state === 'held') {
      out.held.push({ id: r.id, fleetNumber: r.fleetNumber, tagCode: r.tagCode, since: heldSince.toISOString(), hours: Math.floor((now.getTime() - heldSince.getTime()) / 3_600_000), reason: r.holdReason! })
      continue
    }
    const checked = state === 'checked'
    const used = time(r.lastUsedAt)
    const usedToday = (used && used >= dayStart) || (inspected && inspected >= dayStart)
    if (!checked && usedToday) out.unchecked.push({ id: r.id, fleetNumber: r.fleetNumber, tagCode: r.tagCode, lastInspectionAt: inspected?.toISOString() ?? null })
  }
  out.held.sort((a, b) => a.since.localeCompare(b.since))
  return out
}

/** A truck's pre-shift check at this moment: held (an inspection hold with its reason), checked since the shift began, or not. */
export function truckCheckState(r: { lastInspectionAt: string | Date | null, holdSince: string | Date | null, holdReason: string | null }, shiftStart: Date): TruckCheckState {
  if (r.holdSince !== null && r.holdReason) return 'held'
  return r.lastInspectionAt !== null && new Date(r.lastInspectionAt) >= shiftStart ? 'checked' : 'unchecked'
}

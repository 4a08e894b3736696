import { isEffectiveRecord, rowsOf } from '../due/effective'
import { num, numOrNull, scopeCte, type ReportScope } from './scope'

/** The recent window a battery's rate and capacity are read over (days). */
export const RECENT_DAYS = 90

export interface BatteryReportFacts {
  id: string
  serial: string
  site: string
  chemistry: string
  voltage: number
  capacityAh: number
  ratedCycles: number
  replacementPrice: number | null
  /** from battery_status, the read model that counts cycles (never recounted here) */
  cycles: number
  inServiceOn: string | null
  /** counted cycles in the last RECENT_DAYS before the range's end */
  recentCycles: number
  ahRecent: number | null
  ahBefore: number | null
  lastSpread: number | null
  lowCellCount: number | null
  weakCell: boolean
}

// Every battery of the scope's sites with its counts from battery_status and, over the RECENT_DAYS before
// the range's end and the RECENT_DAYS before that, its counted charges and mean Ah returned per counted
// charge (standing charge sessions only).
export async function batteryFacts(scope: ReportScope): Promise<BatteryReportFacts[]> {
  const rows = await rowsOf<Record<string, unknown>>(useDb(), sql`
    WITH ${scopeCte(scope)},
    recent AS (
      SELECT c.battery_id,
             count(*) FILTER (WHERE c.at >= scope.t1 - make_interval(days => ${RECENT_DAYS}))::int AS recent_cycles,
             avg(c.amp_hours_returned) FILTER (WHERE c.at >= scope.t1 - make_interval(days => ${RECENT_DAYS})) AS ah_recent,
             avg(c.amp_hours_returned) FILTER (WHERE c.at < scope.t1 - make_interval(days => ${RECENT_DAYS})) AS ah_before
      FROM scope JOIN charge_sessions c ON c.site_id = scope.site_id
        AND c.at >= scope.t1 - make_interval(days => ${2 * RECENT_DAYS}) AND c.at < scope.t1
      WHERE c.counted_cycle AND c.ended_at IS NOT NULL AND ${isEffectiveRecord('charge_sessions', 'c')}
      GROUP BY c.battery_id
    )
    SELECT b.id, b.serial, scope.site_name AS site, b.chemistry::text, b.voltage, b.capacity_ah AS "capacityAh", b.rated_cycles AS "ratedCycles",
           b.replacement_price AS "replacementPrice", coalesce(bs.cycles, 0) AS cycles,
           coalesce(b.in_service_on, b.manufactured_on)::text AS "inServiceOn",
           coalesce(r.recent_cycles, 0) AS "recentCycles", r.ah_recent AS "ahRecent", r.ah_before AS "ahBefore",
           bs.last_spread AS "lastSpread", bs.low_cell_count AS "lowCellCount", coalesce(bs.weak_cell, false) AS "weakCell"
    FROM scope JOIN batteries b ON b.site_id = scope.site_id
    LEFT JOIN battery_status bs ON bs.battery_id = b.id
    LEFT JOIN recent r ON r.battery_id = b.id
    ORDER BY b.serial`)
  return rows.map(r => ({
    id: String(r.id), serial: String(r.serial), site: String(r.site), chemistry: String(r.chemistry), voltage: num(r.voltage),
    capacityAh: num(r.capacityAh), ratedCycles: num(r.ratedCycles), replacementPrice: numOrNull(r.replacementPrice), cycles: num(r.cycles),
    inServiceOn: (r.inServiceOn as string | null) ?? null, recentCycles: num(r.recentCycles), ahRecent: numOrNull(r.ahRecent),
    ahBefore: numOrNull(r.ahBefore), lastSpread: numOrNull(r.lastSpread), lowCellCount: numOrNull(r.lowCellCount), weakCell: r.weakCell === true,
  }))
}

/** Years from a YYYY-MM-DD date to another. */
export function yearsBetween(from: string | null, to: string): number | null {
  if (!from) return null
  return (Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / (365.25 * 86_400_000)
}

import { sql, type SQL } from 'drizzle-orm'
import type { BatteryChemistry } from '../../../shared/utils/battery-fit'
import type { BatteryFacts } from '../../../shared/utils/derived-battery'
import type { CompletionFact } from '../../../shared/utils/derived-custom'
import { isEffectiveRecord, epochMs, rowsOf, dateFromMs, idIn, type SqlRunner } from './effective'

// A battery's facts from its effective records, for many batteries in one statement: LATERAL look-ups
// pick each battery's latest rows through the (battery_id, at) indexes, so the number of statements does
// not grow with the number of batteries.

interface Row {
  id: string
  siteId: string
  serial: string
  tagCode: string | null
  homeAreaId: string | null
  chemistry: BatteryChemistry
  outOfService: boolean
  createdMs: number
  inServiceOn: string | null
  heldMs: number | null
  openChargeId: string | null
  openChargeMs: number | null
  openChargerId: string | null
  lastEndedMs: number | null
  lastOutcome: 'complete' | 'interrupted' | null
  lastEndTempF: number | null
  cycles: number
  lastInMs: number | null
  lastInTruckId: string | null
  lastOutMs: number | null
  displaced: boolean
  lastWateredMs: number | null
  lastEqualizedMs: number | null
  chargeEndsMs: number[] | null
  lastSgMs: number | null
  lastSg: number | null
  lastSocPct: number | null
  lastCellMs: number | null
  lastSpread: number | null
  lowCellCount: number | null
}

export interface BatteryFactsQuery {
  siteId: string
  /** these batteries only (else every battery of the site) */
  batteryIds?: readonly string[]
  /** also count charge ends from here (a lead-added charges schedule counts from when it was added) */
  chargesSince?: Date | null
}

export async function loadBatteryFactsFor(db: SqlRunner, q: BatteryFactsQuery, completions: CompletionFact[] = []): Promise<BatteryFacts[]> {
  if (q.batteryIds && q.batteryIds.length === 0) return []
  const where: SQL = q.batteryIds ? sql`b.site_id = ${q.siteId} AND ${idIn('b.id', q.batteryIds)}` : sql`b.site_id = ${q.siteId}`
  const since = q.chargesSince ? sql`${q.chargesSince.toISOString()}::timestamptz` : sql`NULL::timestamptz`
  // the earliest moment a rule counts charges from: the last watering or equalize (flooded), or a lead-added schedule
  const anchor = sql`LEAST(CASE WHEN b.chemistry = 'flooded_lead_acid' THEN LEAST(COALESCE(wt.at, '-infinity'::timestamptz), COALESCE(eq.ended_at, '-infinity'::timestamptz)) END, ${since})`
  const rows = await rowsOf<Row>(db, sql`
    SELECT b.id, b.site_id AS "siteId", b.serial, tg.code AS "tagCode", b.home_area_id AS "homeAreaId", b.chemistry,
      b.out_of_service AS "outOfService", ${epochMs('b.created_at')} AS "createdMs", b.in_service_on::text AS "inServiceOn",
      ${epochMs('h.at')} AS "heldMs",
      oc.id AS "openChargeId", ${epochMs('oc.at')} AS "openChargeMs", oc.charger_id AS "openChargerId",
      ${epochMs('lc.ended_at')} AS "lastEndedMs", lc.outcome AS "lastOutcome", lc.end_temp_f AS "lastEndTempF",
      cy.n AS cycles,
      ${epochMs('si.at')} AS "lastInMs", si.truck_id AS "lastInTruckId", ${epochMs('so.at')} AS "lastOutMs",
      (si.id IS NOT NULL AND EXISTS (
        SELECT 1 FROM battery_swaps s2 WHERE s2.truck_id = si.truck_id AND s2.battery_in_id <> b.id
          AND (s2.at, s2.recorded_at) > (si.at, si.recorded_at) AND ${isEffectiveRecord('battery_swaps', 's2')})) AS displaced,
      ${epochMs('wt.at')} AS "lastWateredMs", ${epochMs('eq.ended_at')} AS "lastEqualizedMs",
      ends.list AS "chargeEndsMs",
      ${epochMs('sg.at')} AS "lastSgMs", sg.mean_corrected_sg AS "lastSg", sg.state_of_charge_pct AS "lastSocPct",
      ${epochMs('cc.at')} AS "lastCellMs", cc.spread AS "lastSpread", cc.low_cell_count AS "lowCellCount"
    FROM batteries b
    LEFT JOIN tags tg ON tg.asset_kind = 'battery' AND tg.asset_id = b.id AND tg.retired_at IS NULL
    LEFT JOIN LATERAL (
      SELECT ah.at FROM asset_holds ah WHERE ah.asset_kind = 'battery' AND ah.asset_id = b.id AND ah.action = 'hold' ORDER BY ah.at DESC LIMIT 1
    ) h ON b.out_of_service
    LEFT JOIN LATERAL (
      SELECT c.id, c.at, c.charger_id FROM charge_sessions c
      WHERE c.battery_id = b.id AND c.ended_at IS NULL AND ${isEffectiveRecord('charge_sessions', 'c')} ORDER BY c.at DESC LIMIT 1
    ) oc ON true
    LEFT JOIN LATERAL (
      SELECT c.ended_at, c.outcome, c.end_temp_f FROM charge_sessions c
      WHERE c.battery_id = b.id AND c.ended_at IS NOT NULL AND ${isEffectiveRecord('charge_sessions', 'c')} ORDER BY c.at DESC LIMIT 1
    ) lc ON true
    LEFT JOIN LATERAL (
      SELECT count(*)::int AS n FROM charge_sessions c WHERE c.battery_id = b.id AND c.counted_cycle AND ${isEffectiveRecord('charge_sessions', 'c')}
    ) cy ON true
    LEFT JOIN LATERAL (
      SELECT s.id, s.at, s.recorded_at, s.truck_id FROM battery_swaps s
      WHERE s.battery_in_id = b.id AND ${isEffectiveRecord('battery_swaps', 's')} ORDER BY s.at DESC, s.recorded_at DESC LIMIT 1
    ) si ON true
    LEFT JOIN LATERAL (
      SELECT s.at FROM battery_swaps s
      WHERE s.battery_out_id = b.id AND ${isEffectiveRecord('battery_swaps', 's')} ORDER BY s.at DESC, s.recorded_at DESC LIMIT 1
    ) so ON true
    LEFT JOIN LATERAL (
      SELECT e.at FROM electrolyte_checks e
      WHERE e.battery_id = b.id AND e.water_added_gal > 0 AND ${isEffectiveRecord('electrolyte_checks', 'e')} ORDER BY e.at DESC LIMIT 1
    ) wt ON true
    LEFT JOIN LATERAL (
      SELECT c.ended_at FROM charge_sessions c
      WHERE c.battery_id = b.id AND c.equalize AND c.outcome = 'complete' AND c.ended_at IS NOT NULL AND ${isEffectiveRecord('charge_sessions', 'c')}
      ORDER BY c.at DESC LIMIT 1
    ) eq ON true
    LEFT JOIN LATERAL (
      -- a session ending after the anchor started at most a few days before it: the bound on c.at lets
      -- the (battery_id, at) index skip the battery's older sessions
      SELECT json_agg(${epochMs('c.ended_at')} ORDER BY c.ended_at) AS list FROM charge_sessions c
      WHERE c.battery_id = b.id AND c.ended_at IS NOT NULL AND c.ended_at > ${anchor}
        AND c.at > ${anchor} - interval '3 days' AND ${isEffectiveRecord('charge_sessions', 'c')}
    ) ends ON ${anchor} IS NOT NULL
    LEFT JOIN LATERAL (
      SELECT e.at, e.mean_corrected_sg, e.state_of_charge_pct FROM electrolyte_checks e
      WHERE e.battery_id = b.id AND e.mean_corrected_sg IS NOT NULL AND ${isEffectiveRecord('electrolyte_checks', 'e')} ORDER BY e.at DESC LIMIT 1
    ) sg ON true
    LEFT JOIN LATERAL (
      SELECT e.at, e.spread, e.low_cell_count FROM electrolyte_checks e
      WHERE e.battery_id = b.id AND e.scope = 'every_cell' AND ${isEffectiveRecord('electrolyte_checks', 'e')} ORDER BY e.at DESC LIMIT 1
    ) cc ON true
    WHERE ${where}`)
  const bySubject = groupCompletions(completions)
  return rows.map(r => ({
    id: r.id,
    siteId: r.siteId,
    serial: r.serial,
    tagCode: r.tagCode,
    homeAreaId: r.homeAreaId,
    chemistry: r.chemistry,
    outOfService: r.outOfService,
    createdAt: dateFromMs(r.createdMs)!,
    inServiceOn: r.inServiceOn,
    heldAt: dateFromMs(r.heldMs),
    openCharge: r.openChargeId ? { id: r.openChargeId, at: dateFromMs(r.openChargeMs)!, chargerId: r.openChargerId! } : null,
    lastEndedCharge: r.lastEndedMs === null ? null : { endedAt: dateFromMs(r.lastEndedMs)!, outcome: r.lastOutcome, endTempF: r.lastEndTempF },
    cycles: Number(r.cycles ?? 0),
    lastIn: r.lastInMs === null ? null : { at: dateFromMs(r.lastInMs)!, truckId: r.lastInTruckId! },
    lastOut: dateFromMs(r.lastOutMs),
    displaced: !!r.displaced,
    lastWateredAt: dateFromMs(r.lastWateredMs),
    lastEqualizedAt: dateFromMs(r.lastEqualizedMs),
    chargeEnds: (r.chargeEndsMs ?? []).map(v => new Date(Number(v))),
    lastSg: r.lastSgMs === null || r.lastSg === null ? null : { at: dateFromMs(r.lastSgMs)!, meanCorrectedSg: r.lastSg, stateOfChargePct: r.lastSocPct },
    lastCellCheck: r.lastCellMs === null ? null : { at: dateFromMs(r.lastCellMs)!, spread: r.lastSpread, lowCellCount: Number(r.lowCellCount ?? 0) },
    completions: bySubject.get(r.id) ?? [],
  }))
}

export function groupCompletions(completions: readonly CompletionFact[]): Map<string, CompletionFact[]> {
  const by = new Map<string, CompletionFact[]>()
  for (const c of completions) by.set(c.subjectId, [...(by.get(c.subjectId) ?? []), c])
  return by
}

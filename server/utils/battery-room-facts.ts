import { sql, type SQL } from 'drizzle-orm'
import type { BatteryChemistry, FitReason } from '../../shared/utils/battery-fit'
import { batteryReadinessReasons } from '../../shared/utils/battery-fit'
import { BATTERY_STATE_LABELS, DEFAULT_BATTERY_CARE_POLICY, batteryFlags, deriveBatteryState, type BatteryFlags, type BatteryState } from '../../shared/utils/battery-state'
import type { SiteSettings } from '../../shared/utils/site-settings'

/** Anything that runs a statement: the database, a transaction, or a test connection. */
export interface SqlRunner {
  execute: (query: SQL) => PromiseLike<unknown>
}

/** One battery's latest records, as the single board query returns them (times in epoch ms). */
export interface BatteryFactsRow {
  id: string
  siteId: string
  serial: string
  tagCode: string | null
  homeAreaId: string | null
  chemistry: BatteryChemistry
  voltage: number
  cellCount: number
  capacityAh: number
  weightLb: number
  lengthIn: number
  widthIn: number
  heightIn: number
  connector: string
  cycleCount: number
  ratedCycles: number
  outOfService: boolean
  outOfServiceReason: string | null
  currentTruckId: string | null
  truckFleetNumber: string | null
  truckTagCode: string | null
  commissionedMs: number
  openChargeId: string | null
  openChargeSinceMs: number | null
  openChargerId: string | null
  openChargerName: string | null
  openChargerAreaId: string | null
  lastChargeEndedMs: number | null
  lastChargeOutcome: 'complete' | 'interrupted' | null
  lastChargeEndTempF: number | null
  lastChargeEqualize: boolean | null
  lastRemovedMs: number | null
  lastInstalledMs: number | null
  lastWateredMs: number | null
  lastEqualizedMs: number | null
  chargesSinceWatering: number
  chargesSinceEqualize: number
  lastCellCheckMs: number | null
  lastSpread: number | null
  lastLowCellCount: number | null
  lastCheckMs: number | null
  lastStateOfChargePct: number | null
}

export interface BatteryFactsFilter {
  /** the site, or any of these sites (with batteryIds: the caller then checks each row's siteId) */
  siteId: string | string[]
  /** batteries whose home is this charging area, or that sit on one of its chargers */
  areaId?: string
  batteryIds?: string[]
}

const ms = (column: SQL) => sql`(EXTRACT(EPOCH FROM ${column}) * 1000)::float8`

// Every battery of a site (or one area, or a few ids) with its latest swap, charge and check, in
// one statement: LATERAL subqueries pick each battery's latest rows, so the count of statements does
// not grow with the number of batteries.
export async function loadBatteryFacts(db: SqlRunner, filter: BatteryFactsFilter): Promise<BatteryFactsRow[]> {
  const where: SQL[] = [typeof filter.siteId === 'string'
    ? sql`b.site_id = ${filter.siteId}`
    : sql`b.site_id IN (${sql.join(filter.siteId.map(id => sql`${id}::uuid`), sql`, `)})`]
  if (typeof filter.siteId !== 'string' && filter.siteId.length === 0) return []
  if (filter.areaId) where.push(sql`(b.home_area_id = ${filter.areaId} OR oc.charger_area_id = ${filter.areaId})`)
  if (filter.batteryIds) {
    if (filter.batteryIds.length === 0) return []
    where.push(sql`b.id IN (${sql.join(filter.batteryIds.map(id => sql`${id}::uuid`), sql`, `)})`)
  }
  const rows = await db.execute(sql`
    SELECT
      b.id, b.site_id AS "siteId", b.serial, tg.code AS "tagCode", b.home_area_id AS "homeAreaId", b.chemistry,
      b.voltage, b.cell_count AS "cellCount", b.capacity_ah AS "capacityAh", b.weight_lb AS "weightLb",
      b.length_in AS "lengthIn", b.width_in AS "widthIn", b.height_in AS "heightIn", b.connector,
      b.cycle_count AS "cycleCount", b.rated_cycles AS "ratedCycles", b.out_of_service AS "outOfService",
      b.out_of_service_reason AS "outOfServiceReason", b.current_truck_id AS "currentTruckId",
      tr.fleet_number AS "truckFleetNumber", ttg.code AS "truckTagCode",
      ${ms(sql`COALESCE(b.in_service_on::timestamptz, b.created_at)`)} AS "commissionedMs",
      oc.id AS "openChargeId", ${ms(sql`oc.at`)} AS "openChargeSinceMs", oc.charger_id AS "openChargerId",
      oc.charger_name AS "openChargerName", oc.charger_area_id AS "openChargerAreaId",
      ${ms(sql`lc.ended_at`)} AS "lastChargeEndedMs", lc.outcome AS "lastChargeOutcome",
      lc.end_temp_f AS "lastChargeEndTempF", lc.equalize AS "lastChargeEqualize",
      ${ms(sql`sw.removed_at`)} AS "lastRemovedMs", ${ms(sql`sw.installed_at`)} AS "lastInstalledMs",
      ${ms(sql`wt.watered_at`)} AS "lastWateredMs", ${ms(sql`eq.equalized_at`)} AS "lastEqualizedMs",
      cnt.since_watering AS "chargesSinceWatering", cnt.since_equalize AS "chargesSinceEqualize",
      ${ms(sql`cc.at`)} AS "lastCellCheckMs", cc.spread AS "lastSpread", cc.low_cell_count AS "lastLowCellCount",
      ${ms(sql`lk.at`)} AS "lastCheckMs", lk.state_of_charge_pct AS "lastStateOfChargePct"
    FROM batteries b
    LEFT JOIN tags tg ON tg.asset_kind = 'battery' AND tg.asset_id = b.id AND tg.retired_at IS NULL
    LEFT JOIN trucks tr ON tr.id = b.current_truck_id
    LEFT JOIN tags ttg ON ttg.asset_kind = 'truck' AND ttg.asset_id = tr.id AND ttg.retired_at IS NULL
    LEFT JOIN LATERAL (
      SELECT c.id, c.at, c.charger_id, ch.name AS charger_name, ch.area_id AS charger_area_id
      FROM charge_sessions c JOIN chargers ch ON ch.id = c.charger_id
      WHERE c.battery_id = b.id AND c.ended_at IS NULL AND c.corrects_id IS NULL
      ORDER BY c.at DESC LIMIT 1
    ) oc ON true
    LEFT JOIN LATERAL (
      SELECT c.ended_at, c.outcome, c.end_temp_f, c.equalize
      FROM charge_sessions c
      WHERE c.battery_id = b.id AND c.ended_at IS NOT NULL
      ORDER BY c.at DESC LIMIT 1
    ) lc ON true
    LEFT JOIN LATERAL (
      SELECT
        (SELECT s.at FROM battery_swaps s WHERE s.battery_out_id = b.id ORDER BY s.at DESC LIMIT 1) AS removed_at,
        (SELECT s.at FROM battery_swaps s WHERE s.battery_in_id = b.id ORDER BY s.at DESC LIMIT 1) AS installed_at
    ) sw ON true
    LEFT JOIN LATERAL (
      SELECT max(e.at) AS watered_at FROM electrolyte_checks e WHERE e.battery_id = b.id AND e.water_added_gal > 0
    ) wt ON true
    LEFT JOIN LATERAL (
      SELECT c.ended_at AS equalized_at FROM charge_sessions c
      WHERE c.battery_id = b.id AND c.equalize AND c.outcome = 'complete'
      ORDER BY c.at DESC LIMIT 1
    ) eq ON true
    LEFT JOIN LATERAL (
      SELECT
        (count(*) FILTER (WHERE c.ended_at > COALESCE(wt.watered_at, '-infinity'::timestamptz)))::int AS since_watering,
        (count(*) FILTER (WHERE c.ended_at > COALESCE(eq.equalized_at, '-infinity'::timestamptz)))::int AS since_equalize
      FROM charge_sessions c
      WHERE c.battery_id = b.id AND c.ended_at IS NOT NULL
        AND c.ended_at > LEAST(COALESCE(wt.watered_at, '-infinity'::timestamptz), COALESCE(eq.equalized_at, '-infinity'::timestamptz))
        -- a session ending after that moment started at most a day or so before it: lets the (battery_id, at)
        -- index skip the battery's older sessions
        AND c.at > LEAST(COALESCE(wt.watered_at, '-infinity'::timestamptz), COALESCE(eq.equalized_at, '-infinity'::timestamptz)) - interval '3 days'
    ) cnt ON true
    LEFT JOIN LATERAL (
      SELECT e.at, e.spread, e.low_cell_count FROM electrolyte_checks e
      WHERE e.battery_id = b.id AND e.scope = 'every_cell'
      ORDER BY e.at DESC LIMIT 1
    ) cc ON true
    LEFT JOIN LATERAL (
      SELECT e.at, e.state_of_charge_pct FROM electrolyte_checks e
      WHERE e.battery_id = b.id AND e.mean_corrected_sg IS NOT NULL
      ORDER BY e.at DESC LIMIT 1
    ) lk ON true
    WHERE ${sql.join(where, sql` AND `)}
    ORDER BY b.serial`)
  return rows as unknown as BatteryFactsRow[]
}

export type FlagKey = 'wateringOverdue' | 'wateringDue' | 'equalizeDue' | 'weakCell' | 'ranHot'

export const BATTERY_FLAG_LABELS: Record<FlagKey, string> = {
  wateringOverdue: 'Watering overdue',
  wateringDue: 'Watering due',
  equalizeDue: 'Equalize due',
  weakCell: 'Weak cell',
  ranHot: 'Ran hot',
}

export interface BatteryRoomStatus {
  state: BatteryState
  label: string
  coolingMinutesLeft: number
  readyAt: Date | null
  flags: BatteryFlags
  /** the flags that are set, in words, most urgent first */
  flagList: { key: FlagKey, label: string }[]
  /** why it may not go into a truck now; empty when it is ready to issue */
  readiness: FitReason[]
}

const days = (fromMs: number, now: Date) => Math.max(0, (now.getTime() - fromMs) / 86_400_000)
const toDate = (v: number | null) => (v === null ? null : new Date(v))

/** A battery's derived state, care flags and readiness from its facts and the site's policy. */
export function batteryRoomStatus(f: BatteryFactsRow, settings: SiteSettings, now: Date): BatteryRoomStatus {
  const derived = deriveBatteryState({
    outOfService: f.outOfService,
    installedInTruck: f.currentTruckId !== null,
    chargeOpenSince: toDate(f.openChargeSinceMs),
    lastChargeEndedAt: toDate(f.lastChargeEndedMs),
    lastChargeComplete: f.lastChargeOutcome === 'complete',
    lastRemovedFromTruckAt: toDate(f.lastRemovedMs),
  }, { coolDownMinutes: settings.coolDownMinutes }, now)
  const flags = batteryFlags({
    chargesSinceWatering: f.chargesSinceWatering,
    daysSinceWatering: days(f.lastWateredMs ?? f.commissionedMs, now),
    chargesSinceEqualize: f.chargesSinceEqualize,
    daysSinceEqualize: days(f.lastEqualizedMs ?? f.commissionedMs, now),
    lastSpread: f.lastSpread,
    lowCellCount: f.lastLowCellCount,
    lastEndTempF: f.lastChargeEndTempF,
  }, {
    ...DEFAULT_BATTERY_CARE_POLICY,
    wateringEveryCharges: settings.wateringEveryCharges,
    wateringEveryDays: settings.wateringEveryDays,
    equalizeEveryCharges: settings.equalizeEveryCharges,
    equalizeEveryDays: settings.equalizeEveryDays,
    maxChargeTempF: settings.maxChargeTempF,
    maxCellSpread: settings.cellSpreadThreshold,
  })
  // Sealed batteries take no water and no equalize from the room.
  if (f.chemistry !== 'flooded_lead_acid') {
    flags.wateringDue = false
    flags.wateringOverdue = false
    flags.equalizeDue = false
  }
  const order: FlagKey[] = ['wateringOverdue', 'weakCell', 'ranHot', 'wateringDue', 'equalizeDue']
  const flagList = order
    .filter(k => flags[k] && !(k === 'wateringDue' && flags.wateringOverdue))
    .map(key => ({ key, label: BATTERY_FLAG_LABELS[key] }))
  const readiness = batteryReadinessReasons({
    state: derived.state,
    outOfService: f.outOfService,
    wateringOverdue: flags.wateringOverdue,
    coolingMinutesLeft: derived.coolingMinutesLeft,
  })
  return { ...derived, label: BATTERY_STATE_LABELS[derived.state], flags, flagList, readiness }
}

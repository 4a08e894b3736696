import { sql, type SQL } from 'drizzle-orm'
import type { BatteryChemistry, FitReason } from '../../../shared/utils/battery-fit'
import { batteryReadinessReasons } from '../../../shared/utils/battery-fit'
import { BATTERY_STATE_LABELS, batteryStateAt, type BatteryState } from '../../../shared/utils/battery-state'
import type { StoredBatteryState } from '../../../shared/utils/derived-battery'
import { localDate } from '../../../shared/utils/due-dates'
import { obligationStateAt } from '../../../shared/utils/due-rules'
import { justFinishedCharge } from '../../../shared/utils/battery-room-schemas'
import { epochMs, rowsOf, dateFromMs, idIn, type SqlRunner } from '../due/effective'
import { subjectObligationsJson, type SubjectRow } from '../due/list'

// Batteries as the Bay board, the floor forms and the tag page show them, read from battery_status and
// the battery's watering and equalize obligations in one statement. Cooling turns Ready, and Due soon
// turns Overdue, here at read time from the stored dates.

interface CardRow {
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
  ratedCycles: number
  outOfService: boolean
  outOfServiceReason: string | null
  state: StoredBatteryState | null
  sinceMs: number | null
  readyMs: number | null
  truckId: string | null
  truckFleetNumber: string | null
  truckTagCode: string | null
  chargeSessionId: string | null
  chargerId: string | null
  /** what is due on it, when asked for (withObligations) */
  obligations?: SubjectRow[]
  chargerName: string | null
  cycles: number | null
  lastChargeEndedMs: number | null
  lastInstalledMs: number | null
  lastSocPct: number | null
  weakCell: boolean | null
  ranHot: boolean | null
  wDueOn: string | null
  wDueAt: number | null
  wNow: number | null
  wSoon: number | null
  eDueOn: string | null
  eDueAt: number | null
  eNow: number | null
  eSoon: number | null
  timeZone: string
}

export interface BatteryCardQuery {
  siteId: string | readonly string[]
  /** batteries whose home is this charging area, or that sit on one of its chargers */
  areaId?: string
  batteryIds?: readonly string[]
  /** also what is due on each battery (the tag page's and the battery page's status) */
  withObligations?: boolean
}

// Per battery, by index (LIMIT keeps the planner from turning these into hash joins over whole tables).
// The board's cards (board-cards.ts) read the same three pieces.
/** The battery `b`'s obligation of `ruleKey` as `alias` (due_on, due_at_count, count_now, due_soon_days). */
export const obligationJoin = (alias: string, ruleKey: string) => sql.raw(`LEFT JOIN LATERAL (
      SELECT o.due_on, o.due_at_count, o.count_now, o.due_soon_days FROM obligations o
      WHERE o.site_id = b.site_id AND o.rule_key = '${ruleKey}' AND o.subject_kind = 'battery' AND o.subject_id = b.id LIMIT 1
    ) ${alias} ON true`)
/** The live tag's code of the asset of `kind` whose id is in `idColumn`. */
export const liveTag = (kind: string, idColumn: string) => sql.raw(`(SELECT t.code FROM tags t WHERE t.asset_kind = '${kind}' AND t.asset_id = ${idColumn} AND t.retired_at IS NULL LIMIT 1)`)
/** The battery `b` belongs to the charging area: its home, or it sits on one of the area's chargers. */
export const inChargingArea = (areaId: string) => sql`(b.home_area_id = ${areaId} OR b.id IN (
      SELECT s2.battery_id FROM battery_status s2 JOIN chargers c2 ON c2.id = s2.charger_id WHERE c2.area_id = ${areaId}))`

// The card rows' SELECT without its order: `where` picks the batteries (b), `statusSite` the status rows' sites.
function batteryRowsSql(where: SQL, statusSite: SQL, withObligations?: boolean) {
  return sql`
    SELECT b.id, b.site_id AS "siteId", b.serial, ${liveTag('battery', 'b.id')} AS "tagCode", b.home_area_id AS "homeAreaId", b.chemistry, b.voltage,
      b.cell_count AS "cellCount", b.capacity_ah AS "capacityAh", b.weight_lb AS "weightLb", b.length_in AS "lengthIn",
      b.width_in AS "widthIn", b.height_in AS "heightIn", b.connector, b.rated_cycles AS "ratedCycles",
      b.out_of_service AS "outOfService", b.out_of_service_reason AS "outOfServiceReason",
      s.state, ${epochMs('s.state_since')} AS "sinceMs", ${epochMs('s.ready_at')} AS "readyMs", s.truck_id AS "truckId",
      (SELECT tr.fleet_number FROM trucks tr WHERE tr.id = s.truck_id) AS "truckFleetNumber", ${liveTag('truck', 's.truck_id')} AS "truckTagCode",
      s.charge_session_id AS "chargeSessionId", s.charger_id AS "chargerId", (SELECT ch.name FROM chargers ch WHERE ch.id = s.charger_id) AS "chargerName", s.cycles, ${epochMs('s.last_charge_ended_at')} AS "lastChargeEndedMs",
      ${epochMs('s.last_installed_at')} AS "lastInstalledMs", s.last_soc_pct AS "lastSocPct", s.weak_cell AS "weakCell", s.ran_hot AS "ranHot",
      st.time_zone AS "timeZone",
      w.due_on::text AS "wDueOn", w.due_at_count AS "wDueAt", w.count_now AS "wNow", w.due_soon_days AS "wSoon",
      e.due_on::text AS "eDueOn", e.due_at_count AS "eDueAt", e.count_now AS "eNow", e.due_soon_days AS "eSoon"
      ${withObligations ? sql`, ${subjectObligationsJson(sql.raw('b.site_id'), 'battery', sql.raw('b.id'))} AS obligations` : sql``}
    FROM batteries b
    JOIN sites st ON st.id = b.site_id
    LEFT JOIN battery_status s ON s.battery_id = b.id AND ${statusSite}
    ${obligationJoin('w', 'battery_watering')}
    ${obligationJoin('e', 'battery_equalize')}
    WHERE ${where}`
}

export async function loadBatteryRows(db: SqlRunner, q: BatteryCardQuery): Promise<CardRow[]> {
  const sites = typeof q.siteId === 'string' ? [q.siteId] : q.siteId
  if (sites.length === 0 || q.batteryIds?.length === 0) return []
  const siteIs = (column: string) => idIn(column, sites)
  const where: SQL[] = [siteIs('b.site_id')]
  if (q.areaId) where.push(inChargingArea(q.areaId))
  if (q.batteryIds) where.push(idIn('b.id', q.batteryIds))
  return rowsOf<CardRow>(db, sql`${batteryRowsSql(sql.join(where, sql` AND `), siteIs('s.site_id'), q.withObligations)}
    ORDER BY b.serial COLLATE natural_sort`)
}

/**
 * One battery's row with what is due on it (as loadBatteryRows gives it with withObligations), as a JSON
 * value, for the battery whose row is `table`'s in the statement around it (the tag look-up's).
 */
export const batteryRowJson = (table: SQL) =>
  sql`(SELECT row_to_json(x) FROM (${batteryRowsSql(sql`b.id = ${table}.id`, sql.raw('s.site_id = b.site_id'), true)}) x)`

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
  flags: Record<FlagKey, boolean>
  /** the flags that are set, in words, most urgent first */
  flagList: { key: FlagKey, label: string }[]
  /** why it may not go into a truck now; empty when it is ready to issue */
  readiness: FitReason[]
}

const obligationState = (dueOn: string | null, dueAt: number | null, now: number | null, soon: number | null, today: string) =>
  soon === null ? null : obligationStateAt({ dueOn, dueAtCount: dueAt, countNow: now, dueSoonDays: soon }, today)

/** A battery's state, flags and readiness at `now`, from its stored status and obligations. */
export function batteryRoomStatus(r: CardRow, timeZone: string, now: Date): BatteryRoomStatus {
  const derived = batteryStateAt(r.state ?? (r.outOfService ? 'out_of_service' : 'needs_charge'), dateFromMs(r.readyMs), now)
  const today = localDate(now, timeZone)
  const watering = obligationState(r.wDueOn, r.wDueAt, r.wNow, r.wSoon, today)
  const equalize = obligationState(r.eDueOn, r.eDueAt, r.eNow, r.eSoon, today)
  const flags: Record<FlagKey, boolean> = {
    wateringOverdue: watering === 'overdue',
    wateringDue: watering === 'due_soon',
    equalizeDue: equalize === 'due_soon' || equalize === 'overdue',
    weakCell: !!r.weakCell,
    ranHot: !!r.ranHot,
  }
  const order: FlagKey[] = ['wateringOverdue', 'weakCell', 'ranHot', 'wateringDue', 'equalizeDue']
  const flagList = order.filter(k => flags[k]).map(key => ({ key, label: BATTERY_FLAG_LABELS[key] }))
  const readiness = batteryReadinessReasons({
    state: derived.state, outOfService: r.outOfService, wateringOverdue: flags.wateringOverdue, coolingMinutesLeft: derived.coolingMinutesLeft,
  })
  return { ...derived, label: BATTERY_STATE_LABELS[derived.state], flags, flagList, readiness }
}

/** A battery as the board and the floor forms show it. */
export function batteryCard(r: CardRow, timeZone: string, now: Date) {
  const status = batteryRoomStatus(r, timeZone, now)
  const lastChargeEndedAt = dateFromMs(r.lastChargeEndedMs)
  return {
    id: r.id, serial: r.serial, tagCode: r.tagCode, homeAreaId: r.homeAreaId, chemistry: r.chemistry,
    voltage: r.voltage, cellCount: r.cellCount, capacityAh: r.capacityAh, weightLb: r.weightLb, connector: r.connector,
    cycleCount: r.cycles ?? 0, ratedCycles: r.ratedCycles, outOfServiceReason: r.outOfService ? r.outOfServiceReason : null,
    state: status.state, label: status.label, coolingMinutesLeft: status.coolingMinutesLeft,
    readyAt: status.readyAt?.toISOString() ?? null, flags: status.flagList, readiness: status.readiness,
    truck: r.truckId ? { id: r.truckId, fleetNumber: r.truckFleetNumber, tagCode: r.truckTagCode } : null,
    charge: r.chargeSessionId
      ? { id: r.chargeSessionId, chargerId: r.chargerId, chargerName: r.chargerName, since: dateFromMs(r.sinceMs)!.toISOString() }
      : null,
    lastChargeEndedAt: lastChargeEndedAt?.toISOString() ?? null,
    justCharged: justFinishedCharge({ chargeOpen: r.chargeSessionId !== null, lastChargeEndedAt, lastInstalledAt: dateFromMs(r.lastInstalledMs) }, now),
    lastStateOfChargePct: r.lastSocPct,
  }
}
export type BatteryCard = ReturnType<typeof batteryCard>
export type BatteryRow = CardRow

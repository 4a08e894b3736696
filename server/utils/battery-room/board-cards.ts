import { sql, type SQL } from 'drizzle-orm'
import { obligationStateSql } from '../due/list'
import { rowsOf, type SqlRunner } from '../due/effective'
import type { BoardCardData } from '../../../shared/types/floor'
import { BATTERY_FLAG_LABELS, inChargingArea, liveTag, obligationJoin, type BatteryCard, type FlagKey } from './status'

// The Bay board's battery cards as one JSON text made by PostgreSQL from battery_status and the watering
// and equalize obligations, with the state at `now` worked out there: the same cards as
// boardCard(batteryCard(row)) (tests/e2e/battery-room-board-cards.test.ts compares both on the same rows
// at moments either side of a cool-down's end and a due date). A wall board polls this every few seconds;
// building the cards as JavaScript objects and writing them out again cost about four times as much.

/** The fields of a battery card the board shows (the floor forms' look-up sends the whole card). */
export const boardCard = (c: BatteryCard): BoardCardData => ({
  id: c.id, serial: c.serial, tagCode: c.tagCode, voltage: c.voltage, capacityAh: c.capacityAh, cycleCount: c.cycleCount,
  ratedCycles: c.ratedCycles, outOfServiceReason: c.outOfServiceReason, state: c.state, coolingMinutesLeft: c.coolingMinutesLeft,
  readyAt: c.readyAt, flags: c.flags, readiness: c.readiness.map(r => ({ code: r.code })),
  truck: c.truck ? { id: c.truck.id, fleetNumber: c.truck.fleetNumber } : null,
  charge: c.charge ? { chargerName: c.charge.chargerName } : null,
})

const flag = (key: FlagKey) => JSON.stringify({ key, label: BATTERY_FLAG_LABELS[key] })
const code = (c: string) => JSON.stringify({ code: c })

/** `[a,b,…]` of the texts that are not NULL, as json. */
const jsonList = (items: SQL[]) => sql`('[' || concat_ws(',', ${sql.join(items, sql`, `)}) || ']')::json`

export async function boardCardsJson(db: SqlRunner, q: { siteId: string, areaId?: string }, now: Date): Promise<string> {
  const [row] = await rowsOf<{ cards: string }>(db, cardsStatement(q, now, sql``))
  return row!.cards
}

/** A truck of the wall board's list, with what its pre-shift state is worked out from. */
export interface WallTruck {
  id: string
  fleetNumber: string
  systemVoltage: number
  outOfService: boolean
  batteryId: string | null
  lastInspectionAt: string | null
  holdSince: string | null
  holdReason: string | null
}

/**
 * The wall board in one statement: its cards (as boardCardsJson), the site's charging areas, its electric
 * trucks and the site's settings. A board polls every few seconds; each statement is a round trip to PostgreSQL.
 */
export async function boardWallJson(db: SqlRunner, q: { siteId: string, areaId?: string }, now: Date) {
  const [row] = await rowsOf<{ cards: string, areas: { id: string, name: string }[], trucks: WallTruck[], settings: unknown, timeZone: string }>(db, cardsStatement(q, now, sql`,
    (SELECT k.settings FROM k) AS settings,
    (SELECT k.time_zone FROM k) AS "timeZone",
    (SELECT coalesce(json_agg(a), '[]') FROM (
      SELECT ar.id, ar.name FROM areas ar
      WHERE ar.site_id = ${q.siteId} AND ar.kind = 'charging_area' AND NOT ar.archived
      ORDER BY ar.name COLLATE natural_sort) a) AS areas,
    (SELECT coalesce(json_agg(t), '[]') FROM (
      SELECT tr.id, tr.fleet_number AS "fleetNumber", tr.system_voltage AS "systemVoltage", tr.out_of_service AS "outOfService",
        bs.battery_id AS "batteryId", ts.last_inspection_at AS "lastInspectionAt", ts.hold_since AS "holdSince", ts.hold_reason AS "holdReason"
      FROM trucks tr
      LEFT JOIN battery_status bs ON bs.truck_id = tr.id
      -- joined by the site too, so PostgreSQL reads this site's truck status rows by index, not all of them
      LEFT JOIN truck_status ts ON ts.truck_id = tr.id AND ts.site_id = ${q.siteId}
      WHERE tr.site_id = ${q.siteId} AND tr.power = 'electric'
      ORDER BY tr.fleet_number COLLATE natural_sort) t) AS trucks`))
  return row!
}

function cardsStatement(q: { siteId: string, areaId?: string }, now: Date, more: SQL): SQL {
  const nowMs = sql`${now.getTime()}::float8`
  const where: SQL[] = [sql`b.site_id = ${q.siteId}`]
  if (q.areaId) where.push(inChargingArea(q.areaId))
  const today = sql`k.today`
  return sql`
    WITH k AS (SELECT (to_timestamp(${nowMs} / 1000) AT TIME ZONE st.time_zone)::date AS today, st.settings, st.time_zone FROM sites st WHERE st.id = ${q.siteId}),
    c AS (
      SELECT b.id, b.serial, b.voltage, b.capacity_ah, b.rated_cycles, b.out_of_service,
        CASE WHEN b.out_of_service THEN b.out_of_service_reason END AS oos_reason,
        ${liveTag('battery', 'b.id')} AS tag_code,
        coalesce(s.cycles, 0) AS cycles, s.truck_id, s.charge_session_id,
        (SELECT tr.fleet_number FROM trucks tr WHERE tr.id = s.truck_id) AS fleet_number,
        (SELECT ch.name FROM chargers ch WHERE ch.id = s.charger_id) AS charger_name,
        coalesce(s.state, CASE WHEN b.out_of_service THEN 'out_of_service' ELSE 'needs_charge' END) AS stored,
        floor(EXTRACT(EPOCH FROM s.ready_at) * 1000)::float8 AS ready_ms,
        date_trunc('milliseconds', s.ready_at) AS ready_at,
        coalesce(s.weak_cell, false) AS weak_cell, coalesce(s.ran_hot, false) AS ran_hot,
        CASE WHEN w.due_soon_days IS NOT NULL THEN ${obligationStateSql(today, 'w')} END AS watering,
        CASE WHEN e.due_soon_days IS NOT NULL THEN ${obligationStateSql(today, 'e')} END AS equalize
      FROM batteries b
      CROSS JOIN k
      LEFT JOIN battery_status s ON s.battery_id = b.id AND s.site_id = ${q.siteId}
      ${obligationJoin('w', 'battery_watering')}
      ${obligationJoin('e', 'battery_equalize')}
      WHERE ${sql.join(where, sql` AND `)}
    ), d AS (
      SELECT c.*,
        CASE WHEN c.stored <> 'charged' THEN c.stored WHEN c.ready_ms > ${nowMs} THEN 'cooling' ELSE 'ready' END AS state
      FROM c
    )
    SELECT (SELECT coalesce(json_agg(x), '[]')::text FROM (
      SELECT d.id, d.serial, d.tag_code AS "tagCode", d.voltage, d.capacity_ah AS "capacityAh", d.cycles AS "cycleCount",
        d.rated_cycles AS "ratedCycles", d.oos_reason AS "outOfServiceReason", d.state,
        CASE WHEN d.state = 'cooling' THEN ceil((d.ready_ms - ${nowMs}) / 60000)::int ELSE 0 END AS "coolingMinutesLeft",
        CASE WHEN d.stored = 'charged' AND d.ready_at IS NOT NULL
          THEN to_char(d.ready_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') END AS "readyAt",
        ${jsonList([
          sql`CASE WHEN d.watering = 'overdue' THEN ${flag('wateringOverdue')}::text END`,
          sql`CASE WHEN d.weak_cell THEN ${flag('weakCell')}::text END`,
          sql`CASE WHEN d.ran_hot THEN ${flag('ranHot')}::text END`,
          sql`CASE WHEN d.watering = 'due_soon' THEN ${flag('wateringDue')}::text END`,
          sql`CASE WHEN d.equalize IN ('due_soon', 'overdue') THEN ${flag('equalizeDue')}::text END`,
        ])} AS flags,
        ${jsonList([
          sql`CASE WHEN d.out_of_service OR d.state = 'out_of_service' THEN ${code('out_of_service')}::text END`,
          sql`CASE WHEN d.state = 'in_truck' THEN ${code('already_in_truck')}::text END`,
          sql`CASE WHEN d.state IN ('on_charge', 'needs_charge') THEN ${code('not_charged')}::text END`,
          sql`CASE WHEN d.state = 'cooling' THEN ${code('still_cooling')}::text END`,
          sql`CASE WHEN d.watering = 'overdue' THEN ${code('watering_overdue')}::text END`,
        ])} AS readiness,
        CASE WHEN d.truck_id IS NOT NULL THEN json_build_object('id', d.truck_id, 'fleetNumber', d.fleet_number) END AS truck,
        CASE WHEN d.charge_session_id IS NOT NULL THEN json_build_object('chargerName', d.charger_name) END AS charge
      FROM d ORDER BY d.serial COLLATE natural_sort
    ) x) AS cards${more}`
}

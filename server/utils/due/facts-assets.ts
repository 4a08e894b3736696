import { sql, type SQL } from 'drizzle-orm'
import type { CompletionFact } from '../../../shared/utils/derived-custom'
import type { AreaFacts, ChargerFacts, CylinderFacts, TruckFacts } from '../../../shared/utils/derived-subjects'
import type { RequalificationMethod } from '../../../shared/utils/requalification'
import { CHARGER_ITEM_KEY, EXTINGUISHER_ITEM_KEY, EYEWASH_ITEM_KEY } from '../../../shared/utils/area-checklists'
import { isEffectiveRecord, epochMs, rowsOf, dateFromMs, idIn, type SqlRunner } from './effective'
import { groupCompletions } from './facts-battery'

// Facts of trucks, chargers, areas and cylinders from their effective records (one statement per kind).

const scope = (alias: string, siteId: string, ids?: readonly string[]): SQL =>
  ids ? sql`${sql.raw(alias)}.site_id = ${siteId} AND ${idIn(`${alias}.id`, ids)}` : sql`${sql.raw(alias)}.site_id = ${siteId}`

const liveTag = (kind: string, idColumn: string) =>
  sql`(SELECT code FROM tags WHERE tags.asset_kind = ${kind} AND tags.asset_id = ${sql.raw(idColumn)} AND tags.retired_at IS NULL)`

// The latest effective passing entry of one checklist item in an area's logs, newest log first.
const lastPass = (areaIdColumn: string, itemKey: string) => sql`(
  SELECT e.at FROM area_logs l
  JOIN area_log_entries e ON e.log_id = l.id AND e.item_key = ${itemKey} AND e.result = 'pass'
  WHERE l.area_id = ${sql.raw(areaIdColumn)} AND ${isEffectiveRecord('area_log_entries', 'e')}
  ORDER BY l.period_start DESC, e.at DESC LIMIT 1)`

// The last return to service, the last inspection, and the inspections with a failed critical item since
// that return (the inspection hold is read from them by shared/utils/truck-inspection.ts).
const inspectionFacts = sql`
    LEFT JOIN LATERAL (SELECT max(r.at) AS at FROM truck_returns r WHERE r.truck_id = t.id) rt ON true
    LEFT JOIN LATERAL (SELECT max(i.at) AS at FROM truck_inspections i WHERE i.truck_id = t.id) li ON true
    LEFT JOIN LATERAL (
      SELECT json_agg(json_build_array(i.id, ${epochMs('i.at')}, i.user_id, u.name, i.critical_failed) ORDER BY i.at) AS list
      FROM truck_inspections i JOIN users u ON u.id = i.user_id
      WHERE i.truck_id = t.id AND cardinality(i.critical_failed) > 0 AND (rt.at IS NULL OR i.at > rt.at)
    ) ins ON true`

export interface TruckFactsQuery {
  siteId: string
  truckIds?: readonly string[]
  /** every reading (hours rules count from old ones); otherwise only the latest of each record kind */
  allReadings?: boolean
}

export async function loadTruckFactsFor(db: SqlRunner, q: TruckFactsQuery, completions: CompletionFact[] = []): Promise<TruckFacts[]> {
  if (q.truckIds && q.truckIds.length === 0) return []
  const limit = q.allReadings ? 1_000_000 : 1
  const readings = (table: 'battery_swaps' | 'cylinder_exchanges', alias: string) => sql`(
    SELECT ${sql.raw(alias)}.at, ${sql.raw(alias)}.recorded_at, ${sql.raw(alias)}.hour_meter FROM ${sql.raw(table)} ${sql.raw(alias)}
    WHERE ${sql.raw(alias)}.truck_id = t.id AND ${sql.raw(alias)}.hour_meter IS NOT NULL AND ${isEffectiveRecord(table, alias)}
    ORDER BY ${sql.raw(alias)}.at DESC, ${sql.raw(alias)}.recorded_at DESC LIMIT ${limit})`
  const rows = await rowsOf<{
    id: string
    siteId: string
    fleetNumber: string
    tagCode: string | null
    homeAreaId: string | null
    power: TruckFacts['power']
    outOfService: boolean
    createdMs: number
    registeredHours: number
    readings: [number, number][] | null
    testedOn: string | null
    passed: boolean | null
    returnMs: number | null
    inspectedMs: number | null
    failed: [string, number, string, string, string[]][] | null
  }>(db, sql`
    SELECT t.id, t.site_id AS "siteId", t.fleet_number AS "fleetNumber", ${liveTag('truck', 't.id')} AS "tagCode", t.home_area_id AS "homeAreaId",
      t.power, t.out_of_service AS "outOfService", ${epochMs('t.created_at')} AS "createdMs", t.hour_meter AS "registeredHours",
      rd.list AS readings, et.tested_on::text AS "testedOn", et.passed,
      ${epochMs('rt.at')} AS "returnMs", ${epochMs('li.at')} AS "inspectedMs", ins.list AS failed
    FROM trucks t
    LEFT JOIN LATERAL (
      SELECT json_agg(json_build_array(${epochMs('r.at')}, r.hour_meter) ORDER BY r.at, r.recorded_at) AS list FROM (
        ${readings('battery_swaps', 's')}
        UNION ALL ${readings('cylinder_exchanges', 'x')}
        UNION ALL (
          SELECT c.at, c.recorded_at, c.hour_meter FROM schedule_completions c
          WHERE c.subject_id = t.id AND c.hour_meter IS NOT NULL AND ${isEffectiveRecord('schedule_completions', 'c')}
          ORDER BY c.at DESC, c.recorded_at DESC LIMIT ${limit})
        UNION ALL (
          SELECT i.at, i.recorded_at, i.hour_meter FROM truck_inspections i
          WHERE i.truck_id = t.id AND i.hour_meter IS NOT NULL ORDER BY i.at DESC, i.recorded_at DESC LIMIT ${limit})
      ) r
    ) rd ON true
    ${inspectionFacts}
    LEFT JOIN LATERAL (
      SELECT x.tested_on, x.passed FROM emissions_tests x WHERE x.truck_id = t.id AND ${isEffectiveRecord('emissions_tests', 'x')}
      ORDER BY x.tested_on DESC, x.recorded_at DESC LIMIT 1
    ) et ON t.power <> 'electric'
    WHERE ${scope('t', q.siteId, q.truckIds)}`)
  const bySubject = groupCompletions(completions)
  return rows.map(r => ({
    id: r.id, siteId: r.siteId, fleetNumber: r.fleetNumber, tagCode: r.tagCode, homeAreaId: r.homeAreaId, power: r.power,
    outOfService: r.outOfService, createdAt: dateFromMs(r.createdMs)!, registeredHours: Number(r.registeredHours),
    readings: (r.readings ?? []).map(([at, hours]) => ({ at: new Date(Number(at)), hours: Number(hours) })),
    lastEmissions: r.testedOn ? { testedOn: r.testedOn, passed: !!r.passed } : null,
    completions: bySubject.get(r.id) ?? [],
    lastReturnAt: dateFromMs(r.returnMs), lastInspectionAt: dateFromMs(r.inspectedMs),
    failedInspections: (r.failed ?? []).map(([id, atMs, userId, userName, criticalFailed]) => ({ id, at: new Date(Number(atMs)), userId, userName, criticalFailed })),
  }))
}

export async function loadChargerFactsFor(db: SqlRunner, siteId: string, ids?: readonly string[], completions: CompletionFact[] = []): Promise<ChargerFacts[]> {
  if (ids && ids.length === 0) return []
  const rows = await rowsOf<{ id: string, siteId: string, name: string, tagCode: string | null, areaId: string, outOfService: boolean, createdMs: number, inspectedMs: number | null }>(db, sql`
    SELECT ch.id, ch.site_id AS "siteId", ch.name, ${liveTag('charger', 'ch.id')} AS "tagCode", ch.area_id AS "areaId",
      ch.out_of_service AS "outOfService", ${epochMs('ch.created_at')} AS "createdMs", ${epochMs(lastPass('ch.area_id', CHARGER_ITEM_KEY))} AS "inspectedMs"
    FROM chargers ch WHERE ${scope('ch', siteId, ids)}`)
  const bySubject = groupCompletions(completions)
  return rows.map(r => ({
    id: r.id, siteId: r.siteId, name: r.name, tagCode: r.tagCode, areaId: r.areaId, outOfService: r.outOfService,
    createdAt: dateFromMs(r.createdMs)!, lastInspectedAt: dateFromMs(r.inspectedMs), completions: bySubject.get(r.id) ?? [],
  }))
}

export async function loadAreaFactsFor(db: SqlRunner, siteId: string, ids?: readonly string[], completions: CompletionFact[] = []): Promise<AreaFacts[]> {
  if (ids && ids.length === 0) return []
  const rows = await rowsOf<{
    id: string
    siteId: string
    name: string
    tagCode: string | null
    kind: AreaFacts['kind']
    archived: boolean
    createdMs: number
    dailyOn: string | null
    eyewashMs: number | null
    extinguisherMs: number | null
    coOn: string | null
    combustion: boolean
  }>(db, sql`
    SELECT a.id, a.site_id AS "siteId", a.name, ${liveTag('area', 'a.id')} AS "tagCode", a.kind, a.archived, ${epochMs('a.created_at')} AS "createdMs",
      (SELECT l.period_start::text FROM area_logs l JOIN checklist_templates t ON t.id = l.template_id
        WHERE l.area_id = a.id AND l.cadence = 'daily'
          AND (SELECT count(DISTINCT e.item_key) FROM area_log_entries e WHERE e.log_id = l.id) >= jsonb_array_length(t.items)
        ORDER BY l.period_start DESC LIMIT 1) AS "dailyOn",
      ${epochMs(lastPass('a.id', EYEWASH_ITEM_KEY))} AS "eyewashMs",
      ${epochMs(lastPass('a.id', EXTINGUISHER_ITEM_KEY))} AS "extinguisherMs",
      (SELECT max(r.taken_on)::text FROM co_readings r WHERE r.area_id = a.id AND ${isEffectiveRecord('co_readings', 'r')}) AS "coOn",
      EXISTS (SELECT 1 FROM trucks t WHERE t.site_id = a.site_id AND t.power <> 'electric' AND NOT t.out_of_service) AS combustion
    FROM areas a WHERE ${scope('a', siteId, ids)}`)
  const bySubject = groupCompletions(completions)
  return rows.map(r => ({
    id: r.id, siteId: r.siteId, name: r.name, tagCode: r.tagCode, kind: r.kind, archived: r.archived, createdAt: dateFromMs(r.createdMs)!,
    lastCompleteDailyLogOn: r.dailyOn, lastEyewashPassAt: dateFromMs(r.eyewashMs), lastExtinguisherPassAt: dateFromMs(r.extinguisherMs),
    lastCoReadingOn: r.coOn, siteRunsCombustion: !!r.combustion, completions: bySubject.get(r.id) ?? [],
  }))
}

export async function loadCylinderFactsFor(db: SqlRunner, siteId: string, ids?: readonly string[], completions: CompletionFact[] = []): Promise<CylinderFacts[]> {
  if (ids && ids.length === 0) return []
  const rows = await rowsOf<{
    id: string
    siteId: string
    serial: string
    tagCode: string | null
    areaId: string | null
    status: string
    createdMs: number
    manufactureYear: number
    manufactureMonth: number
    registeredOn: string | null
    registeredMethod: RequalificationMethod | null
    recordOn: string | null
    recordMethod: RequalificationMethod | null
  }>(db, sql`
    SELECT l.id, l.site_id AS "siteId", l.serial, ${liveTag('cylinder', 'l.id')} AS "tagCode", l.area_id AS "areaId", l.status,
      ${epochMs('l.created_at')} AS "createdMs", l.manufacture_year AS "manufactureYear", l.manufacture_month AS "manufactureMonth",
      l.last_requalified_on::text AS "registeredOn", l.last_requalification_method AS "registeredMethod",
      rq.performed_on::text AS "recordOn", rq.method AS "recordMethod"
    FROM lp_cylinders l
    LEFT JOIN LATERAL (
      SELECT r.performed_on, r.method FROM requalifications r
      WHERE r.cylinder_id = l.id AND r.passed AND ${isEffectiveRecord('requalifications', 'r')} ORDER BY r.performed_on DESC, r.recorded_at DESC LIMIT 1
    ) rq ON true
    WHERE ${scope('l', siteId, ids)}`)
  const bySubject = groupCompletions(completions)
  return rows.map((r) => {
    const record = r.recordOn && (!r.registeredOn || r.recordOn >= r.registeredOn)
    return {
      id: r.id, siteId: r.siteId, serial: r.serial, tagCode: r.tagCode, areaId: r.areaId, condemned: r.status === 'condemned', createdAt: dateFromMs(r.createdMs)!,
      manufactureYear: Number(r.manufactureYear), manufactureMonth: Number(r.manufactureMonth),
      lastRequalifiedOn: record ? r.recordOn : r.registeredOn, lastRequalificationMethod: record ? r.recordMethod : r.registeredMethod,
      completions: bySubject.get(r.id) ?? [],
    }
  })
}

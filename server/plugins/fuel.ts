import { alias } from 'drizzle-orm/pg-core'
import type { HistoryEntry, HistoryWords } from '../utils/asset-history'
import type { FuelCylinderRow, FuelTruckRow } from '../utils/fuel/site'

const tenth = (v: number) => Math.round(v * 10) / 10
const noteWords = (note: string | null | undefined): HistoryWords[] => (note ? [{ code: 'note', params: { note } }] : [])

// whether the cylinder's last refill found its tare down, with no requalification since
async function tareLossSinceRequalification(db: ReturnType<typeof useDb>, cylinderId: string) {
  const [lastRefill] = await db.select({ at: tables.cylinderRefills.at, tareFlagged: tables.cylinderRefills.tareFlagged })
    .from(tables.cylinderRefills).where(eq(tables.cylinderRefills.cylinderId, cylinderId))
    .orderBy(desc(tables.cylinderRefills.at)).limit(1)
  if (!lastRefill?.tareFlagged) return false
  const [after] = await db.select({ id: tables.requalifications.id }).from(tables.requalifications)
    .where(and(eq(tables.requalifications.cylinderId, cylinderId), gte(tables.requalifications.at, lastRefill.at))).limit(1)
  return !after
}

// Fuel-station states and events on cylinders and trucks: requalification and emissions dates,
// refills, cylinder changes, requalifications and emissions tests in the asset timelines.
export default defineNitroPlugin(() => {
  // a cylinder's site (for its requalification date on the site's today) and whether its last refill found
  // the tare down with no requalification since, read with the cylinder in the tag look-up's statement, or here
  registerAssetFacts('cylinder', 'fuel', table => sql`json_build_object(
      'site', (SELECT json_build_object('id', st.id, 'name', st.name, 'timeZone', st.time_zone, 'settings', st.settings) FROM sites st WHERE st.id = ${table}.site_id),
      'tareLoss', coalesce((SELECT r.tare_flagged AND NOT EXISTS (SELECT 1 FROM requalifications q WHERE q.cylinder_id = r.cylinder_id AND q.at >= r.at)
        FROM cylinder_refills r WHERE r.cylinder_id = ${table}.id ORDER BY r.at DESC LIMIT 1), false))`)
  registerAssetStatus('cylinder', async (row) => {
    const cylinder = row as unknown as FuelCylinderRow
    const db = useDb()
    const came = factsCameWithAsset<{ site: Parameters<typeof fuelSiteFactsFrom>[0], tareLoss: boolean }>(row, 'fuel')
    const facts = came ? fuelSiteFactsFrom(came.site) : await fuelSiteFacts(db, cylinder.siteId)
    const requal = cylinderRequalification(cylinder, facts)
    const flags: { key: string, label: string, tone: 'danger' | 'warning' | 'caution', params?: Record<string, string> }[] = []
    if (requal.status === 'overdue' && cylinder.status !== 'condemned') {
      flags.push({ key: 'requalification_overdue', label: `Requalification overdue since ${requal.dueOn}: do not fill or fit`, params: { on: String(requal.dueOn) }, tone: 'danger' })
    }
    if (came ? came.tareLoss : await tareLossSinceRequalification(db, cylinder.id)) {
      flags.push({ key: 'tare_loss', label: 'Tare weight down 5 % or more: requalify before filling', tone: 'warning' })
    }
    return { flags }
  })

  // an engine truck's last effective emissions test (its next due date from its obligation) and the cylinder
  // fitted, read with the truck in the tag look-up's statement, or here
  registerAssetFacts('truck', 'fuel', table => sql`(SELECT json_build_object(
      'emissions', ${latestEmissionsTestJson(table)},
      'cylinder', (SELECT c.serial FROM lp_cylinders c WHERE c.current_truck_id = ${table}.id LIMIT 1))
    WHERE ${table}.power <> 'electric')`)
  registerAssetStatus('truck', async (row) => {
    const truck = row as unknown as FuelTruckRow
    if (!isCombustionPower(truck.power)) return null
    const db = useDb()
    type Came = { emissions: { passed: boolean, testedOn: string, nextDueOn: string | null } | null, cylinder: string | null }
    const came = factsCameWithAsset<Came | null>(row, 'fuel')
    const last = came ? came.emissions : (await latestEmissionsTests(db, [truck.id])).get(truck.id) ?? null
    const flags: { key: string, label: string, tone: 'danger' | 'warning' | 'notice', params?: Record<string, string> }[] = []
    if (!last) flags.push({ key: 'emissions_none', label: 'No emissions test on record', tone: 'warning' })
    else if (!last.passed) flags.push({ key: 'emissions_failed', label: `Emissions test failed on ${last.testedOn}: retest by ${last.nextDueOn}`, params: { on: String(last.testedOn), by: String(last.nextDueOn) }, tone: 'danger' })
    // The truck's state names its fuel side (an out-of-service truck keeps that state).
    let state: { state: string, label: string, tone: 'neutral' | 'caution' } | undefined
    if (truck.power === 'lp_gas') {
      const [fitted] = came
        ? (came.cylinder !== null ? [{ serial: came.cylinder }] : [])
        : await db.select({ serial: tables.lpCylinders.serial }).from(tables.lpCylinders).where(eq(tables.lpCylinders.currentTruckId, truck.id))
      if (fitted) flags.push({ key: 'cylinder', label: `Cylinder ${fitted.serial}`, params: { serial: fitted.serial }, tone: 'notice' })
      state = fitted ? { state: 'cylinder_fitted', label: 'Cylinder fitted', tone: 'neutral' } : { state: 'cylinder_needed', label: 'No cylinder', tone: 'caution' }
    }
    else {
      state = { state: 'engine_in_service', label: 'In service', tone: 'neutral' }
    }
    return { ...(truck.outOfService ? {} : state), flags }
  })

  registerHistorySource('cylinder', async (id, limit): Promise<HistoryEntry[]> => {
    const db = useDb()
    const refills = await db.select({ r: tables.cylinderRefills, who: tables.users.name }).from(tables.cylinderRefills)
      .innerJoin(tables.users, eq(tables.users.id, tables.cylinderRefills.userId))
      .where(eq(tables.cylinderRefills.cylinderId, id)).orderBy(desc(tables.cylinderRefills.at)).limit(limit)
    const exchanges = await db.select({ e: tables.cylinderExchanges, who: tables.users.name, truck: tables.trucks.fleetNumber }).from(tables.cylinderExchanges)
      .innerJoin(tables.users, eq(tables.users.id, tables.cylinderExchanges.userId))
      .innerJoin(tables.trucks, eq(tables.trucks.id, tables.cylinderExchanges.truckId))
      .where(or(eq(tables.cylinderExchanges.cylinderOnId, id), eq(tables.cylinderExchanges.cylinderOffId, id)))
      .orderBy(desc(tables.cylinderExchanges.at)).limit(limit)
    const requals = await db.select({ q: tables.requalifications, who: tables.users.name }).from(tables.requalifications)
      .innerJoin(tables.users, eq(tables.users.id, tables.requalifications.userId))
      .where(eq(tables.requalifications.cylinderId, id)).orderBy(desc(tables.requalifications.at)).limit(limit)
    const [refillsBy, exchangesBy, requalsBy] = await Promise.all([
      correctedByOf(tables.cylinderRefills, refills.map(x => x.r.id)), correctedByOf(tables.cylinderExchanges, exchanges.map(x => x.e.id)),
      correctedByOf(tables.requalifications, requals.map(x => x.q.id)),
    ])
    return [
      ...refills.map(({ r, who }): HistoryEntry => recordEntry({
        id: `refill-${r.id}`,
        at: r.at,
        who,
        ...(r.refused
          ? historyLine({ code: 'refill_refused' }, storedRefusals(r).map(x => ({ code: 'refusal_reason', params: { ...x.params, refusal: x.code, said: x.message } })))
          : historyLine({ code: 'refilled', params: { added_lb: tenth(r.netAddedLb ?? 0) } }, [
              ...(r.fillLimitLb !== null ? [{ code: 'fill_limit', params: { limit_lb: tenth(r.fillLimitLb) } }] : []),
              ...(r.gallonsAt60F !== null ? [{ code: 'volume_at_60f', params: { volume_gal: r.gallonsAt60F } }] : []),
              ...noteWords(r.note),
            ])),
        tone: r.refused ? 'danger' : 'safe',
      }, 'cylinder-refill', r, refillsBy, { grossBeforeLb: r.grossBeforeLb, grossAfterLb: r.grossAfterLb, measuredTareLb: r.measuredTareLb, productSg: r.productSg }),
      ),
      ...exchanges.map(({ e, who, truck }): HistoryEntry => recordEntry({
        id: `exchange-${e.id}-${e.cylinderOnId === id ? 'on' : 'off'}`,
        at: e.at,
        who,
        ...historyLine({ code: e.cylinderOnId === id ? 'cylinder_put_on' : 'cylinder_taken_off', params: { truck } }, noteWords(e.note)),
        tone: 'notice',
      }, 'cylinder-exchange', e, exchangesBy, { cylinderOnId: e.cylinderOnId, hourMeter: e.hourMeter })),
      ...requals.map(({ q, who }): HistoryEntry => recordEntry({
        id: `requal-${q.id}`,
        at: q.at,
        who,
        ...historyLine(q.passed ? { code: 'requalified', params: { method: q.method } } : { code: 'requal_condemned' }, [
          { code: 'requal_marked', params: { on: q.performedOn, marking: q.marking || '—' } },
          ...(q.nextDueOn ? [{ code: 'next_due', params: { on: q.nextDueOn } }] : []),
          ...noteWords(q.note),
        ]),
        tone: q.passed ? 'safe' : 'danger',
      }, 'requalification', q, requalsBy, { method: q.method, marking: q.marking, passed: q.passed })),
    ]
  })

  registerHistorySource('truck', async (id, limit): Promise<HistoryEntry[]> => {
    const db = useDb()
    const on = alias(tables.lpCylinders, 'cyl_on')
    const exchanges = await db.select({ e: tables.cylinderExchanges, who: tables.users.name, onSerial: on.serial }).from(tables.cylinderExchanges)
      .innerJoin(tables.users, eq(tables.users.id, tables.cylinderExchanges.userId))
      .innerJoin(on, eq(on.id, tables.cylinderExchanges.cylinderOnId))
      .where(eq(tables.cylinderExchanges.truckId, id)).orderBy(desc(tables.cylinderExchanges.at)).limit(limit)
    const tests = await db.select({ t: tables.emissionsTests, who: tables.users.name }).from(tables.emissionsTests)
      .innerJoin(tables.users, eq(tables.users.id, tables.emissionsTests.userId))
      .where(eq(tables.emissionsTests.truckId, id)).orderBy(desc(tables.emissionsTests.at)).limit(limit)
    const [exchangesBy, testsBy] = await Promise.all([
      correctedByOf(tables.cylinderExchanges, exchanges.map(x => x.e.id)), correctedByOf(tables.emissionsTests, tests.map(x => x.t.id)),
    ])
    return [
      ...exchanges.map(({ e, who, onSerial }): HistoryEntry => recordEntry({
        id: `exchange-${e.id}`, at: e.at, who, ...historyLine({ code: 'cylinder_changed', params: { cylinder: onSerial } }, noteWords(e.note)), tone: 'notice',
      }, 'cylinder-exchange', e, exchangesBy, { cylinderOnId: e.cylinderOnId, hourMeter: e.hourMeter })),
      ...tests.map(({ t, who }): HistoryEntry => recordEntry({
        id: `emissions-${t.id}`,
        at: t.at,
        who,
        ...historyLine({ code: t.passed ? 'emissions_passed' : 'emissions_failed', params: { on: t.testedOn } }, [
          { code: 'emissions_co', params: { idle: t.coIdlePct, high: t.coHighIdlePct } },
          { code: 'tested_by', params: { name: t.testerName } },
          { code: 'next_due', params: { on: t.nextDueOn } },
          ...noteWords(t.reasons.join(' ')),
        ]),
        tone: t.passed ? 'safe' : 'danger',
      }, 'emissions-test', t, testsBy, {
        testerName: t.testerName, coIdlePct: t.coIdlePct, coHighIdlePct: t.coHighIdlePct, hcPpm: t.hcPpm, co2Pct: t.co2Pct, o2Pct: t.o2Pct,
        idleRpm: t.idleRpm, highIdleRpm: t.highIdleRpm, certificateUploadId: t.certificateUploadId,
      })),
    ]
  })
  registerHistorySource('area', async (id, limit): Promise<HistoryEntry[]> => {
    const r = tables.coReadings
    const rows = await useDb().select({ r, who: tables.users.name }).from(r).innerJoin(tables.users, eq(tables.users.id, r.userId))
      .where(eq(r.areaId, id)).orderBy(desc(r.at)).limit(limit)
    const by = await correctedByOf(r, rows.map(x => x.r.id))
    return rows.map(({ r: row, who }) => recordEntry({
      id: `co-${row.id}`, at: row.at, who,
      ...historyLine({ code: 'co_reading', params: { ppm: row.ppm, on: row.takenOn } }, [{ code: 'hours', params: { hours: row.durationHours } }, ...noteWords(row.note)]),
      tone: row.ppm > CO_LIMITS.nioshCeiling.ppm ? 'danger' : undefined,
    }, 'co-reading', row, by, { ppm: row.ppm, durationHours: row.durationHours }))
  })
})

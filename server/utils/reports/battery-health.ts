import { monthsBetween, batteryRisk, SG_SPREAD_ACT, SG_SPREAD_WARN, monthText } from '#shared/utils/report-math'
import { LANGUAGE_TAGS } from '#shared/utils/languages'
import type { ReportResponse } from '#shared/types/reports'
import { isEffectiveRecord, rowsOf, uuidArray } from '../due/effective'
import { batteryFacts, RECENT_DAYS, yearsBetween } from './battery-facts'
import { chartOf, num, numOrNull, scopeCte, siteColumn, type ReportScope } from './scope'

// Mean Ah returned per counted charge, the mean cell spread and the checks that found low cells, per month
// (and the Ah line of a few batteries), from standing records only.
async function monthlyHealth(scope: ReportScope, batteryIds: string[]) {
  const db = useDb()
  const [ah, checks] = await Promise.all([
    rowsOf<{ month: string, batteryId: string | null, ah: number }>(db, sql`
      WITH ${scopeCte(scope)}
      SELECT month, "batteryId", avg(ah)::float8 AS ah FROM (
        SELECT to_char(c.at AT TIME ZONE scope.tz, 'YYYY-MM') AS month, c.amp_hours_returned AS ah,
               CASE WHEN c.battery_id = ANY(${uuidArray(batteryIds)}) THEN c.battery_id::text END AS "batteryId"
        FROM scope JOIN charge_sessions c ON c.site_id = scope.site_id AND c.at >= scope.t0 AND c.at < scope.t1
        WHERE c.counted_cycle AND c.ended_at IS NOT NULL AND ${isEffectiveRecord('charge_sessions', 'c')}
      ) x
      GROUP BY GROUPING SETS ((month), (month, "batteryId"))
      -- the second set's group of the batteries not watched is dropped; the first set's rows are the fleet
      HAVING NOT (GROUPING("batteryId") = 0 AND "batteryId" IS NULL)`),
    rowsOf<{ month: string, spread: number | null, checks: number, lowFindings: number }>(db, sql`
      WITH ${scopeCte(scope)}
      SELECT to_char(e.at AT TIME ZONE scope.tz, 'YYYY-MM') AS month, avg(e.spread)::float8 AS spread, count(*)::int AS checks,
             count(*) FILTER (WHERE e.low_cell_count > 0)::int AS "lowFindings"
      FROM scope JOIN electrolyte_checks e ON e.site_id = scope.site_id AND e.at >= scope.t0 AND e.at < scope.t1
      WHERE ${isEffectiveRecord('electrolyte_checks', 'e')}
      GROUP BY 1`),
  ])
  return { ah, checks }
}

export async function batteryHealthReport(scope: ReportScope): Promise<ReportResponse> {
  const facts = await batteryFacts(scope)
  const fleet = facts.map((b) => {
    const capacityRatio = b.ahRecent !== null && b.ahBefore ? b.ahRecent / b.ahBefore : null
    return {
      ...b, capacityRatio,
      risk: batteryRisk({ cycles: b.cycles, ratedCycles: b.ratedCycles, weakCell: b.weakCell, lastSpread: b.lastSpread, capacityRatio }),
      age: yearsBetween(b.inServiceOn, scope.to),
    }
  }).sort((a, b) => b.risk - a.risk || b.cycles - a.cycles)
  const watched = fleet.slice(0, 4)
  const { ah, checks } = await monthlyHealth(scope, watched.map(b => b.id))
  const months = monthsBetween(scope.from, scope.to)
  const ahBy = new Map(ah.map(a => [`${a.month}|${a.batteryId ?? ''}`, a.ah]))
  const ahAt = (month: string, batteryId: string | null) => {
    const v = ahBy.get(`${month}|${batteryId ?? ''}`)
    return v === undefined ? null : Math.round(num(v))
  }
  const checkAt = new Map(checks.map(c => [c.month, c]))
  const monthRows = months.map(m => ({
    month: m, ahPerCharge: ahAt(m, null), spread: numOrNull(checkAt.get(m)?.spread), checks: num(checkAt.get(m)?.checks), lowFindings: num(checkAt.get(m)?.lowFindings),
  }))
  const monthNames = months.map(m => monthText(m, LANGUAGE_TAGS[scope.language]))
  const nearEnd = fleet.filter(b => b.cycles >= 0.8 * b.ratedCycles).length
  const { t } = scope
  return {
    kind: 'battery-health',
    title: t('report.kind.battery_health.title'),
    from: scope.from,
    to: scope.to,
    sites: scope.sites.map(s => ({ id: s.id, name: s.name })),
    figures: [
      { label: t('report.col.batteries'), value: String(fleet.length) },
      { label: t('report.health.past_80'), value: String(nearEnd) },
      { label: t('report.health.with_weak_cell'), value: String(fleet.filter(b => b.weakCell).length) },
    ],
    sections: [
      {
        key: 'fleet',
        title: t('report.health.fleet_title'),
        note: t('report.health.fleet_note', { act: SG_SPREAD_ACT.toFixed(3), days: RECENT_DAYS }),
        chart: null,
        columns: [
          { key: 'serial', label: t('report.col.battery') }, ...siteColumn(scope), { key: 'voltage', label: t('report.col.volts'), decimals: 0 },
          { key: 'cycles', label: t('report.col.cycles'), decimals: 0 }, { key: 'ratedCycles', label: t('report.col.rated'), decimals: 0 },
          { key: 'usedPct', label: t('report.col.used'), unit: '%', decimals: 0 }, { key: 'age', label: t('report.col.age'), unit: t('report.unit.years'), decimals: 1 },
          { key: 'ahRecent', label: t('report.col.ah_per_charge'), decimals: 0 }, { key: 'capacityPct', label: t('report.col.vs_before'), unit: '%', decimals: 0 },
          { key: 'lastSpread', label: t('report.col.cell_spread'), unit: 'SG', decimals: 3 }, { key: 'weakCell', label: t('report.col.weak_cell') }, { key: 'risk', label: t('report.col.risk'), decimals: 0 },
        ],
        rows: fleet.map(b => ({
          serial: b.serial, site: b.site, voltage: b.voltage, cycles: b.cycles, ratedCycles: b.ratedCycles,
          usedPct: b.ratedCycles ? (b.cycles / b.ratedCycles) * 100 : null, age: b.age, ahRecent: b.ahRecent,
          capacityPct: b.capacityRatio === null ? null : b.capacityRatio * 100, lastSpread: b.lastSpread,
          weakCell: b.weakCell ? t('report.health.yes') : '', risk: b.risk,
        })),
      },
      {
        key: 'capacity',
        title: t('report.health.capacity_title'),
        note: t('report.health.capacity_note'),
        chart: chartOf(scope, {
          kind: 'line', categories: monthNames, unit: 'Ah',
          series: [{ name: t('report.health.fleet'), data: monthRows.map(r => r.ahPerCharge) }, ...watched.map(b => ({ name: b.serial, data: months.map(m => ahAt(m, b.id)) }))],
        }),
        columns: [{ key: 'month', label: t('report.col.month'), month: true }, { key: 'ahPerCharge', label: t('report.col.fleet_ah'), decimals: 0 }, ...watched.map(b => ({ key: `b${b.id}`, label: b.serial, decimals: 0 }))],
        rows: monthRows.map(r => ({ month: r.month, ahPerCharge: r.ahPerCharge, ...Object.fromEntries(watched.map(b => [`b${b.id}`, ahAt(r.month, b.id)])) })),
      },
      {
        key: 'cells',
        title: t('report.health.cells_title'),
        note: t('report.health.cells_note', { warn: SG_SPREAD_WARN.toFixed(3), act: SG_SPREAD_ACT.toFixed(3) }),
        chart: chartOf(scope, {
          kind: 'bar', categories: monthNames, unit: t('report.unit.checks'), secondUnit: 'SG',
          series: [{ name: t('report.health.low_findings'), data: monthRows.map(r => r.lowFindings) }, { name: t('report.col.mean_spread'), type: 'line', data: monthRows.map(r => (r.spread === null ? null : Math.round(r.spread * 1000) / 1000)) }],
        }),
        columns: [{ key: 'month', label: t('report.col.month'), month: true }, { key: 'checks', label: t('report.col.checks'), decimals: 0 }, { key: 'spread', label: t('report.col.mean_spread'), unit: 'SG', decimals: 3 }, { key: 'lowFindings', label: t('report.col.finding_low'), decimals: 0 }],
        rows: monthRows.map(r => ({ month: r.month, checks: r.checks, spread: r.spread, lowFindings: r.lowFindings })),
      },
    ],
    caveats: [],
  }
}

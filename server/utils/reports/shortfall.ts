import type { ReportResponse } from '#shared/types/reports'
import { isEffectiveRecord, rowsOf } from '../due/effective'
import { chartOf, chartTop, num, scopeCte, totalsOf, type ReportScope } from './scope'

// A swap that went ahead over a "still cooling" or "not charged" refusal: a truck needed a battery and no
// ready one was there. Codes from shared/utils/battery-fit.ts.
export const SHORTFALL_CODES = ['still_cooling', 'not_charged'] as const

interface SwapGroup { grouping: 'hour' | 'area', key: string, swaps: number, shortfalls: number }

async function swapGroups(scope: ReportScope) {
  const shortfall = sql.raw(SHORTFALL_CODES.map(c => `s.overridden_checks @> '[{"code":"${c}"}]'`).join(' OR '))
  return rowsOf<SwapGroup>(useDb(), sql`
    WITH ${scopeCte(scope)},
    swaps AS (
      SELECT extract(hour FROM s.at AT TIME ZONE scope.tz)::int AS hour,
             coalesce(a.name, ${scope.t('report.shortfall.no_home_area')}) || CASE WHEN ${scope.siteIds.length > 1} THEN ' · ' || scope.site_name ELSE '' END AS area,
             coalesce(s.overridden_checks IS NOT NULL AND (${shortfall}), false) AS short
      FROM scope JOIN battery_swaps s ON s.site_id = scope.site_id AND s.at >= scope.t0 AND s.at < scope.t1
      JOIN batteries b ON b.id = s.battery_in_id
      LEFT JOIN areas a ON a.id = b.home_area_id
      WHERE ${isEffectiveRecord('battery_swaps', 's')}
    )
    SELECT 'hour' AS grouping, hour::text AS key, count(*)::int AS swaps, count(*) FILTER (WHERE short)::int AS shortfalls FROM swaps GROUP BY hour
    UNION ALL
    SELECT 'area', area, count(*)::int, count(*) FILTER (WHERE short)::int FROM swaps GROUP BY area`)
}

// Batteries in service against electric trucks, per voltage class (a truck's system voltage).
async function batteriesPerTruck(scope: ReportScope) {
  return rowsOf<{ voltage: number, trucks: number, batteries: number }>(useDb(), sql`
    WITH ${scopeCte(scope)},
    t AS (SELECT tr.system_voltage AS voltage, count(*)::int AS n FROM scope JOIN trucks tr ON tr.site_id = scope.site_id
          WHERE tr.power = 'electric' AND tr.system_voltage IS NOT NULL AND NOT tr.out_of_service GROUP BY 1),
    b AS (SELECT ba.voltage, count(*)::int AS n FROM scope JOIN batteries ba ON ba.site_id = scope.site_id WHERE NOT ba.out_of_service GROUP BY 1)
    SELECT coalesce(t.voltage, b.voltage) AS voltage, coalesce(t.n, 0) AS trucks, coalesce(b.n, 0) AS batteries
    FROM t FULL JOIN b ON b.voltage = t.voltage ORDER BY 1`)
}

/** Fewer changes than this in an hour: the chart's share line skips it (the table keeps it). */
const SHARE_LINE_MIN_SWAPS = 10

export async function shortfallReport(scope: ReportScope): Promise<ReportResponse> {
  const [groups, perTruck] = await Promise.all([swapGroups(scope), batteriesPerTruck(scope)])
  const share = (short: number, all: number) => (all > 0 ? (short / all) * 100 : null)
  const hours = Array.from({ length: 24 }, (_, h) => {
    const g = groups.find(r => r.grouping === 'hour' && Number(r.key) === h)
    return { hour: `${String(h).padStart(2, '0')}:00`, swaps: num(g?.swaps), shortfalls: num(g?.shortfalls), share: share(num(g?.shortfalls), num(g?.swaps)) }
  })
  const areas = groups.filter(r => r.grouping === 'area').map(g => ({ area: g.key, swaps: num(g.swaps), shortfalls: num(g.shortfalls), share: share(num(g.shortfalls), num(g.swaps)) }))
    .sort((a, b) => b.shortfalls - a.shortfalls)
  const worst = [...hours].sort((a, b) => b.shortfalls - a.shortfalls)[0]
  const { t } = scope
  const total = totalsOf(hours, ['swaps', 'shortfalls'])
  return {
    kind: 'shortfall',
    title: t('report.shortfall.title'),
    from: scope.from,
    to: scope.to,
    sites: scope.sites.map(s => ({ id: s.id, name: s.name })),
    figures: [
      { label: t('report.shortfall.without_ready'), value: String(total.shortfalls), detail: t('report.shortfall.of_swaps', { n: total.swaps }) },
      { label: t('report.shortfall.worst_hour'), value: worst && worst.shortfalls > 0 ? worst.hour : '—', detail: worst && worst.shortfalls > 0 ? t('report.shortfall.short_n', { n: worst.shortfalls }) : t('report.shortfall.no_shortfall') },
    ],
    sections: [
      {
        key: 'hour',
        title: t('report.shortfall.hour_title'),
        note: t('report.shortfall.hour_note', { n: SHARE_LINE_MIN_SWAPS }),
        chart: chartOf(scope, {
          kind: 'bar', categories: hours.map(h => h.hour.slice(0, 2)), unit: t('report.unit.swaps'), secondUnit: '%',
          // the share line leaves out hours with few changes: one refusal among two reads as 50 %
          series: [{ name: t('report.shortfall.series'), data: hours.map(h => h.shortfalls) }, { name: t('report.shortfall.share_pct'), type: 'line', data: hours.map(h => (h.share === null || h.swaps < SHARE_LINE_MIN_SWAPS ? null : Math.round(h.share))) }],
        }),
        columns: [{ key: 'hour', label: t('report.col.hour') }, { key: 'swaps', label: t('report.col.swaps'), decimals: 0 }, { key: 'shortfalls', label: t('report.col.short'), decimals: 0 }, { key: 'share', label: t('report.col.share'), unit: '%', decimals: 0 }],
        // 24 rows of zeros say less than "nothing recorded"
        rows: total.swaps > 0 ? hours : [],
      },
      {
        key: 'area',
        title: t('report.shortfall.area_title'),
        chart: chartOf(scope, { kind: 'bar', ...chartTop(scope), categories: areas.map(a => a.area), unit: t('report.unit.swaps'), series: [{ name: t('report.shortfall.series'), data: areas.map(a => a.shortfalls) }] }),
        columns: [{ key: 'area', label: t('report.col.area') }, { key: 'swaps', label: t('report.col.swaps'), decimals: 0 }, { key: 'shortfalls', label: t('report.col.short'), decimals: 0 }, { key: 'share', label: t('report.col.share'), unit: '%', decimals: 0 }],
        rows: areas,
      },
      {
        key: 'voltage',
        title: t('report.shortfall.voltage_title'),
        note: t('report.shortfall.voltage_note'),
        chart: null,
        columns: [{ key: 'voltage', label: t('report.col.voltage'), unit: 'V', decimals: 0 }, { key: 'trucks', label: t('report.col.trucks'), decimals: 0 }, { key: 'batteries', label: t('report.col.batteries'), decimals: 0 }, { key: 'perTruck', label: t('report.col.per_truck'), decimals: 2 }],
        rows: perTruck.map(r => ({ voltage: num(r.voltage), trucks: num(r.trucks), batteries: num(r.batteries), perTruck: num(r.trucks) > 0 ? num(r.batteries) / num(r.trucks) : null })),
      },
    ],
    caveats: [],
  }
}

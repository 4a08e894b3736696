import type { ReportResponse } from '#shared/types/reports'
import { isEffectiveRecord, rowsOf } from '../due/effective'
import { CHART_TOP, chartSvg } from './chart'
import { num, scopeCte, type ReportScope } from './scope'

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
             coalesce(a.name, 'No home area') || CASE WHEN ${scope.siteIds.length > 1} THEN ' · ' || scope.site_name ELSE '' END AS area,
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
  const total = hours.reduce((t, h) => ({ swaps: t.swaps + h.swaps, shortfalls: t.shortfalls + h.shortfalls }), { swaps: 0, shortfalls: 0 })
  return {
    kind: 'shortfall',
    title: 'Fleet sizing: shift-change shortfall',
    from: scope.from,
    to: scope.to,
    sites: scope.sites.map(s => ({ id: s.id, name: s.name })),
    figures: [
      { label: 'Swaps without a ready battery', value: String(total.shortfalls), detail: `of ${total.swaps} swaps` },
      { label: 'Worst hour', value: worst && worst.shortfalls > 0 ? worst.hour : '—', detail: worst && worst.shortfalls > 0 ? `${worst.shortfalls} short` : 'no shortfall' },
    ],
    sections: [
      {
        key: 'hour',
        title: 'By hour of day',
        note: 'A shortfall is a swap that went ahead over a "still cooling" or "not charged" refusal (a written override): no ready battery was there when a truck needed one. The hour is the site\'s local time. Refusals that were not overridden are not recorded, so this is a floor, not the whole shortfall.',
        chartSvg: chartSvg({
          kind: 'bar', categories: hours.map(h => h.hour.slice(0, 2)), unit: 'swaps', secondUnit: '%',
          series: [{ name: 'Short of a ready battery', data: hours.map(h => h.shortfalls) }, { name: 'Share of swaps (%)', type: 'line', data: hours.map(h => (h.share === null ? null : Math.round(h.share))) }],
        }),
        columns: [{ key: 'hour', label: 'Hour' }, { key: 'swaps', label: 'Swaps', decimals: 0 }, { key: 'shortfalls', label: 'Short', decimals: 0 }, { key: 'share', label: 'Share', unit: '%', decimals: 0 }],
        rows: hours,
      },
      {
        key: 'area',
        title: 'By charging area (the home area of the battery taken)',
        chartSvg: chartSvg({ kind: 'bar', top: CHART_TOP, categories: areas.map(a => a.area), unit: 'swaps', series: [{ name: 'Short of a ready battery', data: areas.map(a => a.shortfalls) }] }),
        columns: [{ key: 'area', label: 'Area' }, { key: 'swaps', label: 'Swaps', decimals: 0 }, { key: 'shortfalls', label: 'Short', decimals: 0 }, { key: 'share', label: 'Share', unit: '%', decimals: 0 }],
        rows: areas,
      },
      {
        key: 'voltage',
        title: 'Batteries per truck, by voltage class',
        note: 'Batteries and electric trucks in service now. Below 2 per truck, a truck on more than one shift waits for its battery\'s charge and cooling (common practice).',
        chartSvg: null,
        columns: [{ key: 'voltage', label: 'Voltage', unit: 'V', decimals: 0 }, { key: 'trucks', label: 'Trucks', decimals: 0 }, { key: 'batteries', label: 'Batteries', decimals: 0 }, { key: 'perTruck', label: 'Per truck', decimals: 2 }],
        rows: perTruck.map(r => ({ voltage: num(r.voltage), trucks: num(r.trucks), batteries: num(r.batteries), perTruck: num(r.trucks) > 0 ? num(r.batteries) / num(r.trucks) : null })),
      },
    ],
    caveats: [],
  }
}

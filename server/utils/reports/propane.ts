import { monthsBetween } from '#shared/utils/report-math'
import type { ReportResponse } from '#shared/types/reports'
import { PROPANE_LB_PER_GAL_60F } from '#shared/utils/lp-gas'
import { KG_PER_LB, LITRES_PER_US_GAL } from '#shared/utils/units'
import { isEffectiveRecord, rowsOf } from '../due/effective'
import { CHART_TOP, chartSvg } from './chart'
import { money, num, scopeCte, type ReportScope } from './scope'

// Standing refills in the range by month (net pounds, gallons at 60 °F as recorded, cost at the site's
// price per gallon) and the refused ones with their reasons; propane per truck from the cylinder changes:
// each change puts on the net weight of the cylinder's last standing refill before it.
async function propaneRows(scope: ReportScope) {
  const db = useDb()
  const price = sql`coalesce((st.settings->>'propanePerGal')::float8, 0)`
  return Promise.all([
    rowsOf<{ month: string, refills: number, refused: number, lb: number, gal: number, cost: number }>(db, sql`
      WITH ${scopeCte(scope)}
      SELECT to_char(r.at AT TIME ZONE scope.tz, 'YYYY-MM') AS month, count(*) FILTER (WHERE NOT r.refused)::int AS refills,
             count(*) FILTER (WHERE r.refused)::int AS refused, coalesce(sum(r.net_added_lb) FILTER (WHERE NOT r.refused), 0)::float8 AS lb,
             coalesce(sum(r.gallons_at60_f) FILTER (WHERE NOT r.refused), 0)::float8 AS gal,
             coalesce(sum(r.gallons_at60_f * ${price}) FILTER (WHERE NOT r.refused), 0)::float8 AS cost
      FROM scope JOIN sites st ON st.id = scope.site_id
      JOIN cylinder_refills r ON r.site_id = scope.site_id AND r.at >= scope.t0 AND r.at < scope.t1
      WHERE ${isEffectiveRecord('cylinder_refills', 'r')}
      GROUP BY 1`),
    rowsOf<{ reason: string, refusals: number }>(db, sql`
      WITH ${scopeCte(scope)}
      SELECT reason, count(*)::int AS refusals
      FROM scope JOIN cylinder_refills r ON r.site_id = scope.site_id AND r.at >= scope.t0 AND r.at < scope.t1
      CROSS JOIN LATERAL jsonb_array_elements_text(CASE WHEN jsonb_array_length(r.refusal_reasons) > 0 THEN r.refusal_reasons ELSE '["(no reason recorded)"]'::jsonb END) AS reason
      WHERE r.refused AND ${isEffectiveRecord('cylinder_refills', 'r')}
      GROUP BY reason ORDER BY 2 DESC, 1`),
    rowsOf<{ truck: string, changes: number, lb: number, cost: number }>(db, sql`
      WITH ${scopeCte(scope)}
      SELECT t.fleet_number || CASE WHEN ${scope.siteIds.length > 1} THEN ' · ' || scope.site_name ELSE '' END AS truck, count(*)::int AS changes,
             coalesce(sum(f.net_added_lb), 0)::float8 AS lb, coalesce(sum(f.gallons_at60_f * ${price}), 0)::float8 AS cost
      FROM scope JOIN sites st ON st.id = scope.site_id
      JOIN cylinder_exchanges x ON x.site_id = scope.site_id AND x.at >= scope.t0 AND x.at < scope.t1
      JOIN trucks t ON t.id = x.truck_id
      LEFT JOIN LATERAL (
        SELECT r.net_added_lb, r.gallons_at60_f FROM cylinder_refills r
        WHERE r.cylinder_id = x.cylinder_on_id AND r.at <= x.at AND NOT r.refused AND ${isEffectiveRecord('cylinder_refills', 'r')}
        ORDER BY r.at DESC LIMIT 1) f ON true
      WHERE ${isEffectiveRecord('cylinder_exchanges', 'x')}
      GROUP BY 1 ORDER BY 3 DESC`),
    rowsOf<{ serial: string, site: string, dueOn: string, what: string }>(db, sql`
      WITH ${scopeCte(scope)}
      SELECT c.serial, scope.site_name AS site, o.due_on::text AS "dueOn", o.what
      FROM scope JOIN obligations o ON o.site_id = scope.site_id AND o.subject_kind = 'cylinder' AND o.kind = 'cylinder_requalification'
      JOIN lp_cylinders c ON c.id = o.subject_id
      WHERE o.due_on < ${scope.to}::date + 366
      ORDER BY o.due_on, c.serial`),
  ])
}

export async function propaneReport(scope: ReportScope): Promise<ReportResponse> {
  const [months, refusals, trucks, requal] = await propaneRows(scope)
  const metric = scope.units === 'metric'
  const mass = (lb: number) => (metric ? lb * KG_PER_LB : lb)
  const volume = (gal: number) => (metric ? gal * LITRES_PER_US_GAL : gal)
  const [m, v] = metric ? ['kg', 'L'] : ['lb', 'gal']
  const cur = scope.currency
  const byMonth = new Map(months.map(r => [r.month, r]))
  const monthList = monthsBetween(scope.from, scope.to)
  const monthRows = monthList.map((mo) => {
    const r = byMonth.get(mo)
    return { month: mo, refills: num(r?.refills), refused: num(r?.refused), mass: mass(num(r?.lb)), volume: volume(num(r?.gal)), cost: num(r?.cost) }
  })
  const total = monthRows.reduce((t, r) => ({ mass: t.mass + r.mass, volume: t.volume + r.volume, cost: t.cost + r.cost, refused: t.refused + r.refused }), { mass: 0, volume: 0, cost: 0, refused: 0 })
  const priced = scope.sites.some(s => s.settings.propanePerGal > 0)
  return {
    kind: 'propane',
    title: 'Propane',
    from: scope.from,
    to: scope.to,
    sites: scope.sites.map(s => ({ id: s.id, name: s.name })),
    figures: [
      { label: 'Propane filled', value: `${Math.round(total.volume).toLocaleString('en-US')} ${v}`, detail: `${Math.round(total.mass).toLocaleString('en-US')} ${m}` },
      { label: 'Propane cost', value: priced ? money(total.cost, cur) : '—', detail: priced ? undefined : 'enter the price per gallon in Site settings' },
      { label: 'Refused refills', value: String(total.refused), detail: `${requal.length} cylinders due requalification within a year` },
    ],
    sections: [
      {
        key: 'month',
        title: 'Filled by month',
        note: `Gallons at 60 °F as worked out at each refill from the net weight at ${PROPANE_LB_PER_GAL_60F} lb per US gallon (NFPA 58 Annex / published propane property tables; ≈ 0.504 kg/L). Cost uses the site's propane price now, not the price on the day.`,
        chartSvg: chartSvg({ kind: 'bar', categories: monthList, unit: v, series: [{ name: `Propane (${v})`, data: monthRows.map(r => Math.round(r.volume)) }] }),
        columns: [
          { key: 'month', label: 'Month' }, { key: 'refills', label: 'Refills', decimals: 0 }, { key: 'mass', label: 'Net', unit: m, decimals: 0 },
          { key: 'volume', label: 'Volume', unit: v, decimals: 1 }, { key: 'cost', label: 'Cost', unit: cur, decimals: 2 }, { key: 'refused', label: 'Refused', decimals: 0 },
        ],
        rows: monthRows,
      },
      {
        key: 'truck',
        title: 'By truck',
        note: 'Each cylinder change onto a truck counts the net weight of that cylinder\'s last refill before the change.',
        chartSvg: chartSvg({ kind: 'bar', top: CHART_TOP, categories: trucks.map(t => t.truck), unit: m, series: [{ name: `Propane (${m})`, data: trucks.map(t => Math.round(mass(num(t.lb)))) }] }),
        columns: [{ key: 'truck', label: 'Truck' }, { key: 'changes', label: 'Cylinder changes', decimals: 0 }, { key: 'mass', label: 'Propane', unit: m, decimals: 0 }, { key: 'cost', label: 'Cost', unit: cur, decimals: 2 }],
        rows: trucks.map(t => ({ truck: t.truck, changes: num(t.changes), mass: mass(num(t.lb)), cost: num(t.cost) })),
      },
      {
        key: 'refused',
        title: 'Refused refills and why',
        chartSvg: null,
        columns: [{ key: 'reason', label: 'Reason' }, { key: 'refusals', label: 'Refusals', decimals: 0 }],
        rows: refusals.map(r => ({ reason: r.reason, refusals: num(r.refusals) })),
      },
      {
        key: 'requalification',
        title: 'Cylinders due for requalification within 12 months of the range\'s end',
        note: 'From the due list (49 CFR 180.209 intervals as set for the site); an out-of-date cylinder is not filled.',
        chartSvg: null,
        columns: [{ key: 'serial', label: 'Cylinder' }, { key: 'site', label: 'Site' }, { key: 'dueOn', label: 'Due' }, { key: 'what', label: 'What' }],
        rows: requal,
      },
    ],
    caveats: [],
  }
}

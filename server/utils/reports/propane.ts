import { monthsBetween, monthText } from '#shared/utils/report-math'
import { LANGUAGE_TAGS } from '#shared/utils/languages'
import type { ReportResponse } from '#shared/types/reports'
import { PROPANE_LB_PER_GAL_60F } from '#shared/utils/lp-gas'
import { KG_PER_LB, LITRES_PER_US_GAL } from '#shared/utils/units'
import { isEffectiveRecord, rowsOf } from '../due/effective'
import { chartOf, chartTop, money, num, numberText, scopeCte, siteColumn, totalsOf, type ReportScope } from './scope'
import { DUE_KIND_LABELS } from '#shared/utils/due-schedules'
import type { ReasonParams } from '#shared/utils/battery-fit'
import { mailReason } from '../mail-words'

// Standing refills in the range by month (net pounds, gallons at 60 °F as recorded, cost at the price per
// gallon kept on each refill when it was recorded, else the site's price now) and the refused ones with their reasons; propane per truck from the cylinder changes:
// each change puts on the net weight of the cylinder's last standing refill before it.
async function propaneRows(scope: ReportScope) {
  const db = useDb()
  const priceNow = sql`coalesce((st.settings->>'propanePerGal')::float8, 0)`
  return Promise.all([
    rowsOf<{ month: string, refills: number, refused: number, lb: number, gal: number, cost: number, pricedNow: number }>(db, sql`
      WITH ${scopeCte(scope)}
      SELECT to_char(r.at AT TIME ZONE scope.tz, 'YYYY-MM') AS month, count(*) FILTER (WHERE NOT r.refused)::int AS refills,
             count(*) FILTER (WHERE r.refused)::int AS refused, coalesce(sum(r.net_added_lb) FILTER (WHERE NOT r.refused), 0)::float8 AS lb,
             coalesce(sum(r.gallons_at60_f) FILTER (WHERE NOT r.refused), 0)::float8 AS gal,
             coalesce(sum(r.gallons_at60_f * coalesce(r.price_per_gal, ${priceNow})) FILTER (WHERE NOT r.refused), 0)::float8 AS cost,
             count(*) FILTER (WHERE NOT r.refused AND r.price_per_gal IS NULL)::int AS "pricedNow"
      FROM scope JOIN sites st ON st.id = scope.site_id
      JOIN cylinder_refills r ON r.site_id = scope.site_id AND r.at >= scope.t0 AND r.at < scope.t1
      WHERE ${isEffectiveRecord('cylinder_refills', 'r')}
      GROUP BY 1`),
    // each reason with its codes where they were kept (refusal_words, in the same order), for the reader's words
    rowsOf<{ reason: string, words: { code: string, params?: ReasonParams } | null, refusals: number }>(db, sql`
      WITH ${scopeCte(scope)}
      SELECT e.reason, r.refusal_words -> (e.n::int - 1) AS words, count(*)::int AS refusals
      FROM scope JOIN cylinder_refills r ON r.site_id = scope.site_id AND r.at >= scope.t0 AND r.at < scope.t1
      CROSS JOIN LATERAL jsonb_array_elements_text(CASE WHEN jsonb_array_length(r.refusal_reasons) > 0 THEN r.refusal_reasons ELSE jsonb_build_array(${scope.t('report.no_reason')}::text) END)
        WITH ORDINALITY AS e(reason, n)
      WHERE r.refused AND ${isEffectiveRecord('cylinder_refills', 'r')}
      GROUP BY 1, 2 ORDER BY 3 DESC, 1`),
    rowsOf<{ truck: string, changes: number, lb: number, cost: number }>(db, sql`
      WITH ${scopeCte(scope)}
      SELECT t.fleet_number || CASE WHEN ${scope.siteIds.length > 1} THEN ' · ' || scope.site_name ELSE '' END AS truck, count(*)::int AS changes,
             coalesce(sum(f.net_added_lb), 0)::float8 AS lb, coalesce(sum(f.gallons_at60_f * coalesce(f.price_per_gal, ${priceNow})), 0)::float8 AS cost
      FROM scope JOIN sites st ON st.id = scope.site_id
      JOIN cylinder_exchanges x ON x.site_id = scope.site_id AND x.at >= scope.t0 AND x.at < scope.t1
      JOIN trucks t ON t.id = x.truck_id
      LEFT JOIN LATERAL (
        SELECT r.net_added_lb, r.gallons_at60_f, r.price_per_gal FROM cylinder_refills r
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
  const { t, language } = scope
  const byMonth = new Map(months.map(r => [r.month, r]))
  const monthList = monthsBetween(scope.from, scope.to)
  const monthRows = monthList.map((mo) => {
    const r = byMonth.get(mo)
    return { month: mo, refills: num(r?.refills), refused: num(r?.refused), mass: mass(num(r?.lb)), volume: volume(num(r?.gal)), cost: num(r?.cost) }
  })
  const total = totalsOf(monthRows, ['mass', 'volume', 'cost', 'refused'])
  const priced = total.cost > 0 || scope.sites.some(s => s.settings.propanePerGal > 0)
  const pricedNow = months.reduce((s, r) => s + num(r.pricedNow), 0)
  return {
    kind: 'propane',
    title: t('report.kind.propane.title'),
    from: scope.from,
    to: scope.to,
    sites: scope.sites.map(s => ({ id: s.id, name: s.name })),
    figures: [
      { label: t('report.propane.filled'), value: `${numberText(Math.round(total.volume), language)} ${v}`, detail: `${numberText(Math.round(total.mass), language)} ${m}` },
      { label: t('report.propane.cost'), value: priced ? money(total.cost, cur, language) : '—', detail: priced ? undefined : t('report.propane.no_price') },
      { label: t('report.propane.refused'), value: String(total.refused), detail: t('report.propane.requal_due', { n: requal.length }) },
    ],
    sections: [
      {
        key: 'month',
        title: t('report.propane.by_month'),
        note: t('report.propane.month_note', { lb_per_gal: PROPANE_LB_PER_GAL_60F }),
        chart: chartOf(scope, { kind: 'bar', categories: monthList.map(m => monthText(m, LANGUAGE_TAGS[scope.language])), unit: v, series: [{ name: t('report.propane.series', { unit: v }), data: monthRows.map(r => Math.round(r.volume)) }] }),
        columns: [
          { key: 'month', label: t('report.col.month'), month: true }, { key: 'refills', label: t('report.col.refills'), decimals: 0 }, { key: 'mass', label: t('report.col.net'), unit: m, decimals: 0 },
          { key: 'volume', label: t('report.col.volume'), unit: v, decimals: 1 }, { key: 'cost', label: t('report.col.cost'), unit: cur, decimals: 2 }, { key: 'refused', label: t('report.col.refused'), decimals: 0 },
        ],
        rows: monthRows,
      },
      {
        key: 'truck',
        title: t('report.propane.by_truck'),
        note: t('report.propane.truck_note'),
        chart: chartOf(scope, { kind: 'bar', ...chartTop(scope), categories: trucks.map(r => r.truck), unit: m, series: [{ name: t('report.propane.series', { unit: m }), data: trucks.map(r => Math.round(mass(num(r.lb)))) }] }),
        columns: [{ key: 'truck', label: t('report.col.truck') }, { key: 'changes', label: t('report.col.changes'), decimals: 0 }, { key: 'mass', label: t('report.col.propane'), unit: m, decimals: 0 }, { key: 'cost', label: t('report.col.cost'), unit: cur, decimals: 2 }],
        rows: trucks.map(r => ({ truck: r.truck, changes: num(r.changes), mass: mass(num(r.lb)), cost: num(r.cost) })),
      },
      {
        key: 'refused',
        title: t('report.propane.refused_title'),
        chart: null,
        columns: [{ key: 'reason', label: t('report.col.reason') }, { key: 'refusals', label: t('report.col.refusals'), decimals: 0 }],
        rows: refusals.map(r => ({ reason: r.words ? mailReason(t, { ...r.words, message: r.reason }, scope.units) : r.reason, refusals: num(r.refusals) })),
      },
      {
        key: 'requalification',
        title: t('report.propane.requal_title'),
        note: t('report.propane.requal_note'),
        chart: null,
        columns: [{ key: 'serial', label: t('report.col.cylinder') }, ...siteColumn(scope), { key: 'dueOn', label: t('report.col.due'), date: true }, { key: 'what', label: t('report.col.what') }],
        // the task's name in the reader's words (it is the built-in one here)
        rows: requal.map(r => ({ ...r, what: r.what === DUE_KIND_LABELS.cylinder_requalification ? t('due.kind.cylinder_requalification') : r.what })),
      },
    ],
    caveats: pricedNow > 0 ? [t('report.propane.priced_now', { n: pricedNow })] : [],
  }
}

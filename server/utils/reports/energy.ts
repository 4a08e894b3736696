import type { ReportResponse } from '#shared/types/reports'
import { daysInRange } from '#shared/utils/area-checklists'
import { hoursOnChargePerDay, monthsBetween, monthText } from '#shared/utils/report-math'
import { LANGUAGE_TAGS } from '#shared/utils/languages'
import { rowsOf } from '../due/effective'
import { offPeakSaving } from '#shared/utils/tariff'
import { chartOf, chartTop, money, num, numberText, scopeCte, totalsOf, type ReportScope } from './scope'
import { peakSplit } from './tariff-split'
import { keptChargeMonths, keptChargeRows, closedChargesOf } from './charge-months'

// report.energy.convention: kWh drawn from the grid = Ah returned × the battery's nominal volts ÷ 1,000 ÷ the
// charger's efficiency, worked out when the charge ended (shared/utils/charging.ts); cost = that kWh × the site's
// tariff then. A charge counts in the month it started; a corrected charge counts once, as corrected.

interface ChargeGroup { key: string, label: string, area: string | null, charges: number, kwh: number, cost: number, hours: number }

// Closed, standing charge sessions in the range, grouped by month, by charging area and by charger: one
// statement over charge_sessions' (site_id, at) index; the month is the site's own. The whole months in
// `kept` come from their kept rows (charge-months.ts), the rest of the range from the records.
async function chargeGroups(scope: ReportScope, kept: string[]) {
  const rows = await rowsOf<{ grouping: string, key: string, label: string, area: string | null, charges: number, kwh: number, cost: number, hours: number }>(useDb(), sql`
    WITH ${scopeCte(scope)},
    charges AS (
      SELECT c.charger_id, to_char(c.at AT TIME ZONE scope.tz, 'YYYY-MM') AS month, 1 AS n, c.grid_kwh, c.energy_cost,
             EXTRACT(EPOCH FROM (LEAST(c.ended_at, scope.t1) - c.at)) / 3600 AS hours
      FROM ${closedChargesOf(kept)}
      ${kept.length ? sql`UNION ALL ${keptChargeRows(scope, kept)}` : sql``}
    ),
    by_charger AS (
      SELECT charger_id, sum(n)::int AS charges, coalesce(sum(grid_kwh), 0)::float8 AS kwh,
             coalesce(sum(energy_cost), 0)::float8 AS cost, coalesce(sum(hours), 0)::float8 AS hours
      FROM charges GROUP BY charger_id
    )
    SELECT 'month' AS grouping, month AS key, month AS label, NULL AS area, sum(n)::int AS charges,
           coalesce(sum(grid_kwh), 0)::float8 AS kwh, coalesce(sum(energy_cost), 0)::float8 AS cost, coalesce(sum(hours), 0)::float8 AS hours
    FROM charges GROUP BY month
    UNION ALL
    SELECT 'charger', ch.id::text, ch.name || CASE WHEN ${scope.siteIds.length > 1} THEN ' · ' || st.name ELSE '' END, a.name, b.charges, b.kwh, b.cost, b.hours
    FROM by_charger b JOIN chargers ch ON ch.id = b.charger_id JOIN areas a ON a.id = ch.area_id JOIN sites st ON st.id = ch.site_id
    ORDER BY 1, 3`)
  const typed = rows.map(r => ({ ...r, charges: num(r.charges), kwh: num(r.kwh), cost: num(r.cost), hours: num(r.hours) }))
  const months = typed.filter(r => r.grouping === 'month') as ChargeGroup[]
  const chargers = typed.filter(r => r.grouping === 'charger') as ChargeGroup[]
  const areas = new Map<string, ChargeGroup>()
  for (const c of chargers) {
    const area = areas.get(c.area ?? '') ?? { key: c.area ?? '', label: c.area ?? '', area: c.area, charges: 0, kwh: 0, cost: 0, hours: 0 }
    area.charges += c.charges
    area.kwh += c.kwh
    area.cost += c.cost
    area.hours += c.hours
    areas.set(area.key, area)
  }
  return { months, chargers, areas: [...areas.values()].sort((a, b) => b.kwh - a.kwh) }
}

// `withPeak: false` leaves out the time-of-use split (the facilities home's figures do not show it).
export async function energyReport(scope: ReportScope, withPeak = true): Promise<ReportResponse> {
  const kept = await keptChargeMonths(scope)
  const [{ months, chargers, areas }, peak] = await Promise.all([chargeGroups(scope, kept), withPeak ? peakSplit(scope, kept) : []])
  const byMonth = new Map(months.map(m => [m.key, m]))
  const monthList = monthsBetween(scope.from, scope.to)
  const monthRows = monthList.map((m) => {
    const g = byMonth.get(m)
    return { month: m, charges: g?.charges ?? 0, kwh: g?.kwh ?? 0, cost: g?.cost ?? 0, kwhPerCharge: g && g.charges ? g.kwh / g.charges : null }
  })
  const days = daysInRange(scope.from, scope.to)
  const total = totalsOf(monthRows, ['kwh', 'cost', 'charges'])
  const cur = scope.currency
  const { t, language } = scope
  const kwhText = (v: number) => `${numberText(Math.round(v), language)} kWh`
  const report: ReportResponse = {
    kind: 'energy',
    title: t('report.kind.energy.title'),
    from: scope.from,
    to: scope.to,
    sites: scope.sites.map(s => ({ id: s.id, name: s.name })),
    figures: [
      { label: t('report.energy.drawn'), value: kwhText(total.kwh), detail: t('report.energy.charges', { n: total.charges }) },
      { label: t('report.energy.cost'), value: money(total.cost, cur, language), detail: total.kwh > 0 ? t('report.energy.per_kwh', { price: money(total.cost / total.kwh, cur, language) }) : undefined },
      { label: t('report.energy.mean_month'), value: kwhText(total.kwh / Math.max(monthList.length, 1)), detail: t('report.energy.over_months', { n: monthList.length }) },
    ],
    sections: [
      {
        key: 'month',
        title: t('report.energy.by_month'),
        note: t('report.energy.convention'),
        chart: chartOf(scope, {
          kind: 'bar', categories: monthList.map(m => monthText(m, LANGUAGE_TAGS[scope.language])), unit: 'kWh', secondUnit: cur || t('report.unit.cost'),
          series: [{ name: 'kWh', data: monthRows.map(r => Math.round(r.kwh)) }, { name: `${t('report.col.cost')}${cur ? ` (${cur})` : ''}`, type: 'line', data: monthRows.map(r => Math.round(r.cost * 100) / 100) }],
        }),
        columns: [
          { key: 'month', label: t('report.col.month'), month: true }, { key: 'charges', label: t('report.col.charges'), decimals: 0 }, { key: 'kwh', label: t('report.col.energy'), unit: 'kWh', decimals: 0 },
          { key: 'cost', label: t('report.col.cost'), unit: cur, decimals: 2 }, { key: 'kwhPerCharge', label: t('report.col.per_charge'), unit: 'kWh', decimals: 1 },
        ],
        rows: monthRows,
      },
      {
        key: 'area',
        title: t('report.energy.by_area'),
        chart: chartOf(scope, { kind: 'bar', ...chartTop(scope), categories: areas.map(a => a.label), unit: 'kWh', series: [{ name: 'kWh', data: areas.map(a => Math.round(a.kwh)) }] }),
        columns: [{ key: 'area', label: t('report.col.charging_area') }, { key: 'charges', label: t('report.col.charges'), decimals: 0 }, { key: 'kwh', label: t('report.col.energy'), unit: 'kWh', decimals: 0 }, { key: 'cost', label: t('report.col.cost'), unit: cur, decimals: 2 }],
        rows: areas.map(a => ({ area: a.label, charges: a.charges, kwh: a.kwh, cost: a.cost })),
      },
      {
        key: 'charger',
        title: t('report.energy.by_charger'),
        note: t('report.energy.charger_note', { days }),
        chart: chartOf(scope, { kind: 'bar', ...chartTop(scope), categories: chargers.map(c => c.label), unit: t('report.unit.h_day'), series: [{ name: t('report.energy.hours_per_day'), data: chargers.map(c => Math.round(hoursOnChargePerDay(c.hours, days) * 10) / 10) }] }),
        columns: [
          { key: 'charger', label: t('report.col.charger') }, { key: 'area', label: t('report.col.area') }, { key: 'charges', label: t('report.col.charges'), decimals: 0 },
          { key: 'kwh', label: t('report.col.energy'), unit: 'kWh', decimals: 0 }, { key: 'cost', label: t('report.col.cost'), unit: cur, decimals: 2 },
          { key: 'hoursPerDay', label: t('report.col.on_charge'), unit: t('report.unit.h_day'), decimals: 1 },
        ],
        rows: chargers.map(c => ({ charger: c.label, area: c.area, charges: c.charges, kwh: c.kwh, cost: c.cost, hoursPerDay: hoursOnChargePerDay(c.hours, days) })),
      },
    ],
    caveats: peak.length === 0 ? [t('report.energy.one_tariff')] : peak.length < scope.sites.length ? [t('report.energy.some_one_tariff')] : [],
  }
  if (peak.length > 0) addPeakSplit(report, scope, peak)
  return report
}

// The share of kWh drawn in peak windows and what drawing it off-peak would have saved, per site with windows.
function addPeakSplit(report: ReportResponse, scope: ReportScope, peak: Awaited<ReturnType<typeof peakSplit>>) {
  const { t, language } = scope
  const rows = peak.map(p => ({
    site: p.site, kwh: p.kwh, peakKwh: p.peakKwh, peakShare: p.kwh > 0 ? (p.peakKwh / p.kwh) * 100 : null,
    peakPrice: p.peakPerKwh, offPeakPrice: p.offPeakPerKwh, saving: offPeakSaving(p.peakKwh, p.peakPerKwh, p.offPeakPerKwh),
  }))
  const { kwh, peakKwh, saving } = totalsOf(rows, ['kwh', 'peakKwh', 'saving'])
  const kwhText = (v: number) => numberText(Math.round(v), language)
  report.figures.push(
    { label: t('report.energy.peak_share'), value: kwh > 0 ? `${Math.round((peakKwh / kwh) * 100)} %` : '—', detail: t('report.energy.peak_detail', { kwh: kwhText(peakKwh), all: kwhText(kwh) }) },
    { label: t('report.energy.saving'), value: money(saving, scope.currency, language), detail: t('report.energy.saving_detail') },
  )
  const cur = scope.currency
  report.sections.push({
    key: 'peak',
    title: t('report.energy.peak_title'),
    note: t('report.energy.peak_note'),
    chart: null,
    columns: [
      { key: 'site', label: t('report.col.site') }, { key: 'kwh', label: t('report.col.energy'), unit: 'kWh', decimals: 0 },
      { key: 'peakKwh', label: t('report.col.peak_kwh'), unit: 'kWh', decimals: 0 }, { key: 'peakShare', label: t('report.col.peak_share'), unit: '%', decimals: 0 },
      { key: 'peakPrice', label: t('report.col.peak_price'), unit: cur, decimals: 3 }, { key: 'offPeakPrice', label: t('report.col.off_peak_price'), unit: cur, decimals: 3 },
      { key: 'saving', label: t('report.col.saving'), unit: cur, decimals: 2 },
    ],
    rows,
  })
}

import type { ReportResponse } from '#shared/types/reports'
import { beyondYears, cyclesPerDay, FORECAST_HORIZON_YEARS, nextQuarters, quarterOf, ratedCyclesReachedOn } from '#shared/utils/report-math'
import { batteryFacts, RECENT_DAYS } from './battery-facts'
import { chartOf, dayText, money, siteColumn, totalsOf, type ReportScope } from './scope'

/** Each battery's forecast: the day it reaches its rated cycles at its own recent rate. */
export function replacementForecast(scope: ReportScope, facts: Awaited<ReturnType<typeof batteryFacts>>) {
  return facts.map((b) => {
    const perDay = cyclesPerDay(b.recentCycles, RECENT_DAYS)
    const reachesOn = ratedCyclesReachedOn(scope.to, b.cycles, b.ratedCycles, perDay)
    return { ...b, perDay, reachesOn, quarter: reachesOn ? quarterOf(reachesOn) : null }
  }).sort((a, b) => (a.reachesOn ?? '9999').localeCompare(b.reachesOn ?? '9999'))
}

export async function replacementReport(scope: ReportScope): Promise<ReportResponse> {
  const forecast = replacementForecast(scope, await batteryFacts(scope))
  const quarters = nextQuarters(scope.to, 4)
  const byQuarter = quarters.map((q) => {
    const due = forecast.filter(b => b.quarter !== null && (b.quarter === q || (q === quarters[0] && b.quarter < q)))
    return { quarter: q, batteries: due.length, cost: due.reduce((s, b) => s + (b.replacementPrice ?? 0), 0), unpriced: due.filter(b => b.replacementPrice === null).length }
  })
  const year = totalsOf(byQuarter, ['batteries', 'cost', 'unpriced'])
  const cur = scope.currency
  const { t, language } = scope
  return {
    kind: 'replacement',
    title: t('report.kind.replacement.title'),
    from: scope.from,
    to: scope.to,
    sites: scope.sites.map(s => ({ id: s.id, name: s.name })),
    figures: [
      { label: t('report.replacement.due_year'), value: String(year.batteries), detail: t('report.replacement.from_day', { day: dayText(scope.to, scope.language) }) },
      { label: t('report.replacement.their_cost'), value: money(year.cost, cur, language), detail: year.unpriced ? t('report.replacement.unpriced', { n: year.unpriced }) : undefined },
      { label: t('report.replacement.due_in', { quarter: quarters[0]! }), value: String(byQuarter[0]?.batteries ?? 0) },
    ],
    sections: [
      {
        key: 'quarter',
        title: t('report.replacement.quarter_title'),
        note: t('report.replacement.quarter_note', { days: RECENT_DAYS, day: dayText(scope.to, scope.language) }),
        chart: chartOf(scope, {
          kind: 'bar', categories: quarters, unit: t('report.unit.batteries'), secondUnit: cur || t('report.unit.cost'),
          series: [{ name: t('report.col.batteries'), data: byQuarter.map(q => q.batteries) }, { name: `${t('report.col.cost')}${cur ? ` (${cur})` : ''}`, type: 'line', data: byQuarter.map(q => Math.round(q.cost)) }],
        }),
        columns: [{ key: 'quarter', label: t('report.col.quarter') }, { key: 'batteries', label: t('report.col.batteries'), decimals: 0 }, { key: 'cost', label: t('report.col.cost'), unit: cur, decimals: 2 }, { key: 'unpriced', label: t('report.col.without_price'), decimals: 0 }],
        rows: byQuarter,
      },
      {
        key: 'battery',
        title: t('report.replacement.battery_title'),
        note: t('report.replacement.battery_note', { n: FORECAST_HORIZON_YEARS }),
        chart: null,
        columns: [
          { key: 'serial', label: t('report.col.battery') }, ...siteColumn(scope), { key: 'cycles', label: t('report.col.cycles'), decimals: 0 }, { key: 'ratedCycles', label: t('report.col.rated'), decimals: 0 },
          { key: 'perWeek', label: t('report.col.recent_rate'), unit: t('report.unit.cycles_week'), decimals: 1 }, { key: 'reachesOn', label: t('report.col.reaches_rated'), date: true }, { key: 'price', label: t('report.col.price'), unit: cur, decimals: 2 },
        ],
        // a day past the horizon reads as "over 10 years" (the rows stay in the order of their days)
        rows: forecast.map(b => ({
          serial: b.serial, site: b.site, cycles: b.cycles, ratedCycles: b.ratedCycles, perWeek: b.perDay * 7, price: b.replacementPrice,
          reachesOn: b.reachesOn && beyondYears(scope.to, b.reachesOn, FORECAST_HORIZON_YEARS) ? t('report.replacement.over_years', { n: FORECAST_HORIZON_YEARS }) : b.reachesOn,
        })),
      },
    ],
    caveats: [],
  }
}

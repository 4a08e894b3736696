import type { ReportResponse } from '#shared/types/reports'
import { cyclesPerDay, nextQuarters, quarterOf, ratedCyclesReachedOn } from '#shared/utils/report-math'
import { batteryFacts, RECENT_DAYS } from './battery-facts'
import { chartSvg } from './chart'
import { money, type ReportScope } from './scope'

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
  const year = byQuarter.reduce((t, q) => ({ batteries: t.batteries + q.batteries, cost: t.cost + q.cost, unpriced: t.unpriced + q.unpriced }), { batteries: 0, cost: 0, unpriced: 0 })
  const cur = scope.currency
  return {
    kind: 'replacement',
    title: 'Replacement forecast',
    from: scope.from,
    to: scope.to,
    sites: scope.sites.map(s => ({ id: s.id, name: s.name })),
    figures: [
      { label: 'Due in the next 12 months', value: String(year.batteries), detail: `from ${scope.to}` },
      { label: 'Their replacement cost', value: money(year.cost, cur), detail: year.unpriced ? `${year.unpriced} without a price` : undefined },
      { label: `Due in ${quarters[0]}`, value: String(byQuarter[0]?.batteries ?? 0) },
    ],
    sections: [
      {
        key: 'quarter',
        title: 'Batteries and cost due, by quarter',
        note: `A battery is due when it reaches its rated cycles at its own rate over the ${RECENT_DAYS} days before ${scope.to} (counted cycles ÷ ${RECENT_DAYS}); one already past them counts in the first quarter. Cost adds the replacement price entered on each battery. A forecast only: the maker's capacity test decides.`,
        chartSvg: chartSvg({
          kind: 'bar', categories: quarters, unit: 'batteries', secondUnit: cur || 'cost',
          series: [{ name: 'Batteries', data: byQuarter.map(q => q.batteries) }, { name: `Cost${cur ? ` (${cur})` : ''}`, type: 'line', data: byQuarter.map(q => Math.round(q.cost)) }],
        }),
        columns: [{ key: 'quarter', label: 'Quarter' }, { key: 'batteries', label: 'Batteries', decimals: 0 }, { key: 'cost', label: 'Cost', unit: cur, decimals: 2 }, { key: 'unpriced', label: 'Without a price', decimals: 0 }],
        rows: byQuarter,
      },
      {
        key: 'battery',
        title: 'Each battery, soonest first',
        note: 'No date: no counted cycles in the recent window, so no rate to forecast from.',
        chartSvg: null,
        columns: [
          { key: 'serial', label: 'Battery' }, { key: 'site', label: 'Site' }, { key: 'cycles', label: 'Cycles', decimals: 0 }, { key: 'ratedCycles', label: 'Rated', decimals: 0 },
          { key: 'perWeek', label: 'Recent rate', unit: 'cycles/week', decimals: 1 }, { key: 'reachesOn', label: 'Reaches rated' }, { key: 'price', label: 'Price', unit: cur, decimals: 2 },
        ],
        rows: forecast.map(b => ({ serial: b.serial, site: b.site, cycles: b.cycles, ratedCycles: b.ratedCycles, perWeek: b.perDay * 7, reachesOn: b.reachesOn, price: b.replacementPrice })),
      },
    ],
    caveats: [],
  }
}

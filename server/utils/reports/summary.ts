import type { FacilitiesSummary } from '#shared/types/reports'
import { changeWords } from '#shared/utils/report-math'
import { energyReport } from './energy'
import { replacementForecast } from './replacement'
import { batteryFacts } from './battery-facts'
import { shortfallReport } from './shortfall'
import { money, type ReportScope } from './scope'

/** The first day of the month before `today`'s, YYYY-MM-DD. */
export function startOfLastMonth(today: string): string {
  const y = Number(today.slice(0, 4))
  const m = Number(today.slice(5, 7))
  return m === 1 ? `${y - 1}-12-01` : `${y}-${String(m - 1).padStart(2, '0')}-01`
}

// The few figures the facilities lead opens on: this month's energy and cost against last month's (to the
// same day is not attempted: last month is whole), batteries due for replacement this quarter, and the
// hour of day most often short of a ready battery this month. Each links to its report.
export async function facilitiesSummary(scope: ReportScope): Promise<FacilitiesSummary> {
  const today = scope.to
  const month = today.slice(0, 7)
  const site = scope.siteIds.length === 1 ? scope.siteIds[0]! : 'all'
  const link = (kind: string, from: string) => `/reports/${kind}?site=${site}&from=${from}&to=${today}`
  const [energy, facts, shortfall] = await Promise.all([
    energyReport({ ...scope, from: startOfLastMonth(today) }),
    batteryFacts(scope),
    shortfallReport({ ...scope, from: `${month}-01` }),
  ])
  const months = energy.sections[0]!.rows
  const now = months.find(r => r.month === month)
  const before = months.find(r => r.month !== month)
  const kwh = Number(now?.kwh ?? 0)
  const forecast = replacementForecast(scope, facts)
  const quarterEnd = (() => {
    const q = Math.ceil(Number(today.slice(5, 7)) / 3)
    const end = new Date(Date.UTC(Number(today.slice(0, 4)), q * 3, 0))
    return end.toISOString().slice(0, 10)
  })()
  const dueThisQuarter = forecast.filter(b => b.reachesOn !== null && b.reachesOn <= quarterEnd)
  const hours = shortfall.sections[0]!.rows
  const worst = [...hours].sort((a, b) => Number(b.shortfalls) - Number(a.shortfalls))[0]
  return {
    month,
    figures: [
      { label: 'Energy this month', value: `${Math.round(kwh).toLocaleString('en-US')} kWh`, detail: changeWords(kwh, Number(before?.kwh ?? 0)), to: link('energy', startOfLastMonth(today)) },
      { label: 'Energy cost this month', value: money(Number(now?.cost ?? 0), scope.currency), detail: changeWords(Number(now?.cost ?? 0), Number(before?.cost ?? 0)), to: link('energy', startOfLastMonth(today)) },
      { label: 'Batteries due for replacement this quarter', value: String(dueThisQuarter.length), detail: money(dueThisQuarter.reduce((s, b) => s + (b.replacementPrice ?? 0), 0), scope.currency), to: link('replacement', `${month}-01`) },
      {
        label: 'Worst shortfall hour this month',
        value: worst && Number(worst.shortfalls) > 0 ? String(worst.hour) : '—',
        detail: worst && Number(worst.shortfalls) > 0 ? `${worst.shortfalls} swaps short of a ready battery` : 'no swap short of a ready battery',
        to: link('shortfall', `${month}-01`),
      },
    ],
  }
}

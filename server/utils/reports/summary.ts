import type { FacilitiesSummary } from '#shared/types/reports'
import { changeWords, sameDaysLastMonth, type ChangeWords } from '#shared/utils/report-math'
import { energyReport } from './energy'
import { replacementForecast } from './replacement'
import { batteryFacts } from './battery-facts'
import { shortfallReport } from './shortfall'
import { dayText, money, numberText, type ReportScope } from './scope'

// The few figures the facilities lead opens on: this month's energy and cost so far against the same days
// of last month, batteries due for replacement this quarter, and the
// hour of day most often short of a ready battery this month. Each links to its report.
export async function facilitiesSummary(scope: ReportScope): Promise<FacilitiesSummary> {
  const today = scope.to
  const month = today.slice(0, 7)
  const site = scope.siteIds.length === 1 ? scope.siteIds[0]! : 'all'
  const link = (kind: string, from: string) => `/reports/${kind}?site=${site}&from=${from}&to=${today}`
  const lastMonth = sameDaysLastMonth(today)
  const [energy, energyBefore, facts, shortfall] = await Promise.all([
    energyReport({ ...scope, from: `${month}-01` }, false),
    energyReport({ ...scope, ...lastMonth }, false),
    batteryFacts(scope),
    shortfallReport({ ...scope, from: `${month}-01` }),
  ])
  const sum = (report: typeof energy, key: 'kwh' | 'cost') => report.sections[0]!.rows.reduce((s, r) => s + Number(r[key] ?? 0), 0)
  const kwh = sum(energy, 'kwh')
  const cost = sum(energy, 'cost')
  const { t, language } = scope
  const versus = t('report.summary.versus', { from: dayText(lastMonth.from, language), to: dayText(lastMonth.to, language) })
  const words: ChangeWords = { pct: (pct, what) => t('report.change.pct', { pct, what }), nothing: what => t('report.change.nothing', { what }) }
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
      { label: t('report.summary.energy'), value: `${numberText(Math.round(kwh), language)} kWh`, detail: changeWords(kwh, sum(energyBefore, 'kwh'), versus, words), to: link('energy', lastMonth.from) },
      { label: t('report.summary.cost'), value: money(cost, scope.currency, language), detail: changeWords(cost, sum(energyBefore, 'cost'), versus, words), to: link('energy', lastMonth.from) },
      { label: t('report.summary.due_quarter'), value: String(dueThisQuarter.length), detail: money(dueThisQuarter.reduce((s, b) => s + (b.replacementPrice ?? 0), 0), scope.currency, language), to: link('replacement', `${month}-01`) },
      {
        label: t('report.summary.worst_hour'),
        value: worst && Number(worst.shortfalls) > 0 ? String(worst.hour) : '—',
        detail: worst && Number(worst.shortfalls) > 0 ? t('report.summary.short_swaps', { n: Number(worst.shortfalls) }) : t('report.summary.no_short'),
        to: link('shortfall', `${month}-01`),
      },
    ],
  }
}

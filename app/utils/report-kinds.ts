import type { ReportKind } from '#shared/types/reports'
import type { Ability } from '#shared/utils/abilities'

export interface ReportKindInfo {
  kind: ReportKind
  title: string
  blurb: string
  /** the route's ability (shared/utils/abilities.ts) */
  ability: Ability
}

export const REPORT_KIND_INFO: ReportKindInfo[] = [
  { kind: 'energy', title: 'Energy and cost', blurb: 'kWh and cost by month, charging area and charger; hours on charge per day.', ability: 'report.fleet' },
  { kind: 'battery-health', title: 'Battery health', blurb: 'Cycles against rated, Ah per charge over time, cell spread; the fleet by risk.', ability: 'report.fleet' },
  { kind: 'replacement', title: 'Replacement forecast', blurb: 'When each battery reaches its rated cycles, and the cost by quarter.', ability: 'report.fleet' },
  { kind: 'shortfall', title: 'Shift-change shortfall', blurb: 'Swaps short of a ready battery by hour and area; batteries per truck.', ability: 'report.fleet' },
  { kind: 'propane', title: 'Propane', blurb: 'Pounds and gallons by month and truck, cost, refused refills, requalifications due.', ability: 'report.fleet' },
  { kind: 'compliance', title: 'Compliance', blurb: 'Emissions pass rate, indoor CO averages, area-log completion, evaluations due.', ability: 'report.view' },
]

export function reportKindInfo(kind: string): ReportKindInfo | undefined {
  return REPORT_KIND_INFO.find(k => k.kind === kind)
}

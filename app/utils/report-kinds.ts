import type { ReportKind } from '#shared/types/reports'
import type { Ability } from '#shared/utils/abilities'

export interface ReportKindInfo {
  kind: ReportKind
  /** its words: report.kind.<key>.title and .blurb in i18n/locales */
  key: string
  /** the route's ability (shared/utils/abilities.ts) */
  ability: Ability
}

export const REPORT_KIND_INFO: ReportKindInfo[] = [
  { kind: 'energy', key: 'energy', ability: 'report.fleet' },
  { kind: 'battery-health', key: 'battery_health', ability: 'report.fleet' },
  { kind: 'replacement', key: 'replacement', ability: 'report.fleet' },
  { kind: 'shortfall', key: 'shortfall', ability: 'report.fleet' },
  { kind: 'propane', key: 'propane', ability: 'report.fleet' },
  { kind: 'compliance', key: 'compliance', ability: 'report.view' },
]

export function reportKindInfo(kind: string): ReportKindInfo | undefined {
  return REPORT_KIND_INFO.find(k => k.kind === kind)
}

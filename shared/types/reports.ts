// What every report route answers (server/utils/reports/, /api/reports/<kind>): a few headline figures,
// then sections, each a chart (its numbers, drawn in the browser; or none) over the table it was drawn from.
import type { ChartData } from '../utils/report-chart'

export const REPORT_KINDS = ['energy', 'battery-health', 'replacement', 'shortfall', 'propane', 'compliance'] as const
export type ReportKind = typeof REPORT_KINDS[number]

export type ReportCell = string | number | null

export interface ReportColumn {
  key: string
  label: string
  /** shown after numbers in the table head ("kWh", "$", "%") */
  unit?: string
  /** numbers are right-aligned and rounded to this many decimals */
  decimals?: number
  /** the cells are months ('2026-03', as the CSV keeps them), shown as the reader's language names them ("Mar 2026") */
  month?: boolean
  /** the cells are days ('2026-03-31', as the CSV keeps them), shown as the reader's language writes a date */
  date?: boolean
}

export interface ReportSection {
  key: string
  title: string
  /** how a figure is worked out, shown beside it (a convention, a constant and its source) */
  note?: string
  chart: ChartData | null
  columns: ReportColumn[]
  rows: Record<string, ReportCell>[]
}

export interface ReportFigure {
  label: string
  value: string
  /** the comparison or the context, in words ("+12 % on last month") */
  detail?: string
}

export interface ReportResponse {
  kind: ReportKind
  title: string
  from: string
  to: string
  sites: { id: string, name: string }[]
  figures: ReportFigure[]
  sections: ReportSection[]
  /** what the report leaves out, said once */
  caveats: string[]
}

export interface FacilitiesSummary {
  month: string
  figures: (ReportFigure & { to: string })[]
}

import type { H3Event } from 'h3'
import type { SQL } from 'drizzle-orm'
import type { ReportCell, ReportColumn, ReportResponse } from '#shared/types/reports'
import type { Ability } from '#shared/utils/abilities'
import { reportQuerySchema, type ReportQuery } from '#shared/utils/report-schemas'
import { parseSiteSettings, type SiteSettings } from '#shared/utils/site-settings'
import type { UnitSystem } from '#shared/utils/units'
import { LANGUAGE_TAGS, type Language } from '#shared/utils/languages'
import { mailDay, mailWords, type MailT } from '../mail-words'
import { readerLanguage } from '../reader-language'
import { rowsOf, uuidArray } from '../due/effective'
import { CHART_TOP, chartData, type ChartData, type ChartSpec } from '#shared/utils/report-chart'
import { keptNumberFormat } from '#shared/utils/intl-formats'
import { localDate } from '#shared/utils/due-dates'

export interface ReportSite { id: string, name: string, timeZone: string, unitSystem: UnitSystem, settings: SiteSettings }

/** What a report is asked for: the sites (only those where the person holds the ability), the range. */
export interface ReportScope {
  sites: ReportSite[]
  siteIds: string[]
  from: string
  to: string
  /** the sites' shared unit system; US customary when they differ */
  units: UnitSystem
  /** the sites' shared currency; blank when they differ */
  currency: string
  /** the reader's language, and its words (i18n/locales, report.*) */
  language: Language
  t: MailT
  /** false for a CSV answer: it carries no charts */
  charts?: boolean
}

// ?siteId=<one site> checks the ability there (404 outside the person's sites, 403 without the role);
// ?siteId=all takes every site of the person's where they hold it, and is refused when there is none.
export async function reportScope(event: H3Event, ability: Ability, query: ReportQuery): Promise<ReportScope> {
  let siteIds: string[]
  const actor = await requireActor(event)
  if (query.siteId === 'all') {
    siteIds = sitesWhere(actor, ability)
    if (siteIds.length === 0) throw forbidden(ability, 'any_site')
  }
  else {
    await requireAbility(event, ability, query.siteId)
    siteIds = [query.siteId]
  }
  const rows = await rowsOf<{ id: string, name: string, timeZone: string, unitSystem: UnitSystem, settings: unknown }>(useDb(), sql`
    SELECT id, name, time_zone AS "timeZone", unit_system AS "unitSystem", settings FROM sites WHERE id = ANY(${uuidArray(siteIds)}) ORDER BY name`)
  const sites = rows.map(r => ({ ...r, settings: parseSiteSettings(r.settings) }))
  const units = sites.every(s => s.unitSystem === 'metric') ? 'metric' : 'us'
  const currencies = new Set(sites.map(s => s.settings.currency))
  const language = await readerLanguage(event, actor.user.id, query.lang)
  return {
    sites, siteIds: sites.map(s => s.id), from: query.from, to: query.to, units, currency: currencies.size === 1 ? [...currencies][0]! : '',
    language, t: mailWords(language, { groupCounts: true }),
  }
}

/** Today at the scope's sites: the latest of their calendar days (sites in several time zones reach a day at different
 * instants; a range ending on the latest covers every site up to now, as each site's range is read in its own zone). */
export function scopeToday(scope: Pick<ReportScope, 'sites'>, now = new Date()): string {
  return scope.sites.map(s => localDate(now, s.timeZone)).sort().at(-1) ?? localDate(now, 'UTC')
}

// `scope` as a CTE: each site with the range's start and end as instants in the site's own time zone, so a
// record is counted in the site's day and month, and each event table is read through its (site_id, at) index.
export function scopeCte(scope: ReportScope): SQL {
  return sql`scope AS (
    SELECT s.id AS site_id, s.name AS site_name, s.time_zone AS tz,
           (${scope.from}::date)::timestamp AT TIME ZONE s.time_zone AS t0,
           (${scope.to}::date + 1)::timestamp AT TIME ZONE s.time_zone AS t1
    FROM sites s WHERE s.id = ANY(${uuidArray(scope.siteIds)}))`
}

/** A number in the reader's way of writing it, with this many decimals. */
export function numberText(value: number, language: Language, decimals = 0): string {
  return keptNumberFormat(LANGUAGE_TAGS[language], { minimumFractionDigits: decimals, maximumFractionDigits: decimals }).format(value)
}

/** A calendar day ('2026-11-03') as the reader's language writes it, medium ("Nov 3, 2026", "3 nov 2026"). */
export function dayText(day: string, language: Language): string {
  return mailDay(language)(day)
}

/** Money with the sites' currency code ("1,234.50 USD"), or the bare number across currencies. */
export function money(value: number, currency: string, language: Language = 'en'): string {
  const n = numberText(value, language, 2)
  return currency ? `${n} ${currency}` : n
}

export const num = (v: unknown): number => (v === null || v === undefined ? 0 : Number(v))
export const numOrNull = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v))

/** A section's table as CSV (the first section unless `section` names another); 404 for an unknown one. */
export function reportCsv(event: H3Event, report: ReportResponse, section?: string) {
  const picked = section ? report.sections.find(s => s.key === section) : report.sections[0]
  if (!picked) throw codedError(404, 'no_such_report_section', `This report has no section "${section}".`, { params: { section: section ?? '' } })
  const fields = picked.columns.map(c => (c.unit ? `${c.label} (${c.unit})` : c.label))
  const rows = picked.rows.map(r => picked.columns.map((c): ReportCell => r[c.key] ?? ''))
  const sitePart = report.sites.length === 1 ? report.sites[0]!.name.toLowerCase().replace(/[^a-z0-9]+/g, '-') : 'all-sites'
  return sendCsv(event, `${report.kind}-${picked.key}-${sitePart}-${report.from}-${report.to}.csv`, csvText(fields, rows))
}

// Every report route: the query, the scope (and with it the ability check), the report, JSON or CSV.
export async function serveReport(event: H3Event, ability: Ability, build: (scope: ReportScope) => Promise<ReportResponse>) {
  const query = validateQuery(event, reportQuerySchema)
  const csv = query.format === 'csv'
  const scope = await reportScope(event, ability, query)
  const report = await build({ ...scope, charts: !csv })
  return csv ? reportCsv(event, report, query.section) : report
}

/** A section's chart as the numbers the browser draws, or none when the answer is CSV or there is nothing to draw. */
export function chartOf(scope: ReportScope, spec: ChartSpec): ChartData | null {
  return scope.charts === false ? null : chartData(spec)
}

/** A chart of many things cut to its CHART_TOP highest, saying so in the reader's words. */
export function chartTop(scope: ReportScope) {
  return { top: CHART_TOP, topNote: (n: number, all: number) => scope.t('report.chart_top', { n, all: numberText(all, scope.language) }) }
}

/** The sums of some numeric columns over a section's rows (the totals a report's figures are drawn from). */
export function totalsOf<T extends object, K extends keyof T>(rows: readonly T[], keys: readonly K[]): Record<K, number> {
  const totals = Object.fromEntries(keys.map(k => [k, 0])) as Record<K, number>
  for (const row of rows) for (const k of keys) totals[k] += Number(row[k] ?? 0)
  return totals
}

/** The Site column of a table, only when the report covers more than one site (on a phone it is width wasted). */
export function siteColumn(scope: ReportScope): ReportColumn[] {
  return scope.sites.length > 1 ? [{ key: 'site', label: scope.t('report.col.site') }] : []
}

import { monthsBetween, monthText } from '#shared/utils/report-math'
import { LANGUAGE_TAGS } from '#shared/utils/languages'
import type { ReportResponse } from '#shared/types/reports'
import { CO_LIMITS } from '#shared/utils/co-exposure'
import { daysInRange } from '#shared/utils/area-checklists'
import { checklistItemName } from '#shared/utils/follow-up-words'
import { isEffectiveRecord, rowsOf } from '../due/effective'
import { chartOf, chartTop, num, numOrNull, scopeCte, siteColumn, totalsOf, type ReportScope } from './scope'

const siteSuffix = (scope: ReportScope) => sql`CASE WHEN ${scope.siteIds.length > 1} THEN ' · ' || scope.site_name ELSE '' END`

// Emissions tests by month (a retest is a test of a truck whose previous standing test failed), the daily
// 8-hour TWA of CO per area (Σ ppm × hours ÷ 8, 29 CFR 1910.1000(d)(1)(i)), daily area-log completion and
// failed items, and operator evaluations due.
async function complianceRows(scope: ReportScope) {
  const db = useDb()
  return Promise.all([
    rowsOf<{ month: string, tests: number, passed: number, retests: number }>(db, sql`
      WITH ${scopeCte(scope)},
      tests AS (
        SELECT e.truck_id, e.tested_on, e.passed,
               lag(e.passed) OVER (PARTITION BY e.truck_id ORDER BY e.tested_on, e.at) AS previous_passed
        FROM scope JOIN emissions_tests e ON e.site_id = scope.site_id AND e.tested_on <= ${scope.to}::date
        WHERE ${isEffectiveRecord('emissions_tests', 'e')}
      )
      SELECT to_char(tested_on, 'YYYY-MM') AS month, count(*)::int AS tests, count(*) FILTER (WHERE passed)::int AS passed,
             count(*) FILTER (WHERE previous_passed = false)::int AS retests
      FROM tests WHERE tested_on >= ${scope.from}::date GROUP BY 1`),
    rowsOf<{ area: string, days: number, meanTwa: number, maxTwa: number, overSite: number, overPel: number }>(db, sql`
      WITH ${scopeCte(scope)},
      daily AS (
        SELECT c.area_id, c.taken_on, sum(c.ppm * c.duration_hours) / 8 AS twa,
               max(coalesce((st.settings->>'coSiteLimitPpm')::float8, ${CO_LIMITS.nioshRel.ppm})) AS site_limit
        FROM scope JOIN sites st ON st.id = scope.site_id
        JOIN co_readings c ON c.site_id = scope.site_id AND c.taken_on BETWEEN ${scope.from}::date AND ${scope.to}::date
        WHERE ${isEffectiveRecord('co_readings', 'c')}
        GROUP BY 1, 2
      )
      SELECT a.name || ${siteSuffix(scope)} AS area, count(*)::int AS days, avg(d.twa)::float8 AS "meanTwa", max(d.twa)::float8 AS "maxTwa",
             count(*) FILTER (WHERE d.twa > d.site_limit)::int AS "overSite", count(*) FILTER (WHERE d.twa > ${CO_LIMITS.oshaPel.ppm})::int AS "overPel"
      FROM daily d JOIN areas a ON a.id = d.area_id JOIN scope ON scope.site_id = a.site_id
      GROUP BY 1 ORDER BY 4 DESC`),
    rowsOf<{ area: string, logs: number, signed: number, failed: number }>(db, sql`
      WITH ${scopeCte(scope)}
      SELECT a.name || ${siteSuffix(scope)} AS area, count(DISTINCT l.period_start)::int AS logs,
             count(DISTINCT l.period_start) FILTER (WHERE l.signed_at IS NOT NULL)::int AS signed,
             count(e.id) FILTER (WHERE e.result = 'fail')::int AS failed
      FROM scope JOIN areas a ON a.site_id = scope.site_id AND NOT a.archived
      LEFT JOIN area_logs l ON l.area_id = a.id AND l.cadence = 'daily' AND l.period_start BETWEEN ${scope.from}::date AND ${scope.to}::date
        AND EXISTS (SELECT 1 FROM area_log_entries x WHERE x.log_id = l.id)
      LEFT JOIN area_log_entries e ON e.log_id = l.id AND ${isEffectiveRecord('area_log_entries', 'e')}
      GROUP BY 1 ORDER BY 1`),
    rowsOf<{ item: string, failed: number }>(db, sql`
      WITH ${scopeCte(scope)}
      SELECT coalesce(item.label, e.item_key) AS item, count(*)::int AS failed
      FROM scope JOIN area_log_entries e ON e.site_id = scope.site_id AND e.at >= scope.t0 AND e.at < scope.t1
      JOIN area_logs l ON l.id = e.log_id JOIN checklist_templates t ON t.id = l.template_id
      LEFT JOIN LATERAL (SELECT i->>'label' AS label FROM jsonb_array_elements(t.items) i WHERE i->>'key' = e.item_key LIMIT 1) item ON true
      WHERE e.result = 'fail' AND ${isEffectiveRecord('area_log_entries', 'e')}
      GROUP BY 1 ORDER BY 2 DESC, 1`),
    rowsOf<{ person: string, site: string, dueOn: string }>(db, sql`
      WITH ${scopeCte(scope)}
      SELECT o.label AS person, scope.site_name AS site, o.due_on::text AS "dueOn"
      FROM scope JOIN obligations o ON o.site_id = scope.site_id AND o.kind = 'operator_evaluation'
      WHERE o.due_on < ${scope.to}::date + 91 ORDER BY o.due_on, o.label`),
  ])
}

export async function complianceReport(scope: ReportScope): Promise<ReportResponse> {
  const [emissions, co, logs, failedItems, evaluations] = await complianceRows(scope)
  const months = monthsBetween(scope.from, scope.to)
  const byMonth = new Map(emissions.map(e => [e.month, e]))
  const monthRows = months.map((m) => {
    const e = byMonth.get(m)
    const tests = num(e?.tests)
    return { month: m, tests, passed: num(e?.passed), passRate: tests ? (num(e?.passed) / tests) * 100 : null, retests: num(e?.retests) }
  })
  const tests = totalsOf(monthRows, ['tests', 'passed'])
  const days = daysInRange(scope.from, scope.to)
  const { t } = scope
  const logRows = logs.map(l => ({ area: l.area, logs: num(l.logs), completion: (num(l.logs) / days) * 100, signed: num(l.signed), failed: num(l.failed) }))
  return {
    kind: 'compliance',
    title: t('report.kind.compliance.title'),
    from: scope.from,
    to: scope.to,
    sites: scope.sites.map(s => ({ id: s.id, name: s.name })),
    figures: [
      { label: t('report.compliance.pass_rate'), value: tests.tests ? `${Math.round((tests.passed / tests.tests) * 100)} %` : '—', detail: t('report.compliance.tests', { n: tests.tests }) },
      { label: t('report.compliance.co_days'), value: String(co.reduce((s, a) => s + num(a.overSite), 0)), detail: t('report.compliance.measured', { n: co.length }) },
      { label: t('report.compliance.failed_items'), value: String(failedItems.reduce((s, i) => s + num(i.failed), 0)), detail: t('report.compliance.evaluations_due', { n: evaluations.length }) },
    ],
    sections: [
      {
        key: 'emissions',
        title: t('report.compliance.emissions_title'),
        note: t('report.compliance.emissions_note'),
        chart: chartOf(scope, {
          kind: 'bar', categories: months.map(m => monthText(m, LANGUAGE_TAGS[scope.language])), unit: t('report.unit.tests'), secondUnit: '%',
          series: [{ name: t('report.col.tests'), data: monthRows.map(r => r.tests) }, { name: t('report.compliance.pass_rate_pct'), type: 'line', data: monthRows.map(r => (r.passRate === null ? null : Math.round(r.passRate))) }],
        }),
        columns: [{ key: 'month', label: t('report.col.month'), month: true }, { key: 'tests', label: t('report.col.tests'), decimals: 0 }, { key: 'passed', label: t('report.col.passed'), decimals: 0 }, { key: 'passRate', label: t('report.col.pass_rate'), unit: '%', decimals: 0 }, { key: 'retests', label: t('report.col.retests'), decimals: 0 }],
        rows: monthRows,
      },
      {
        key: 'co',
        title: t('report.compliance.co_title'),
        note: t('report.compliance.co_note', { site_ppm: CO_LIMITS.nioshRel.ppm, site_source: CO_LIMITS.nioshRel.source, pel_ppm: CO_LIMITS.oshaPel.ppm, pel_source: CO_LIMITS.oshaPel.source }),
        chart: chartOf(scope, { kind: 'bar', ...chartTop(scope), categories: co.map(a => a.area), unit: 'ppm', series: [{ name: t('report.compliance.mean_twa'), data: co.map(a => Math.round(num(a.meanTwa) * 10) / 10) }, { name: t('report.compliance.highest_twa'), data: co.map(a => Math.round(num(a.maxTwa) * 10) / 10) }] }),
        columns: [
          { key: 'area', label: t('report.col.area') }, { key: 'days', label: t('report.col.days_measured'), decimals: 0 }, { key: 'meanTwa', label: t('report.col.mean_twa'), unit: 'ppm', decimals: 1 },
          { key: 'maxTwa', label: t('report.col.highest_twa'), unit: 'ppm', decimals: 1 }, { key: 'overSite', label: t('report.col.days_over_site'), decimals: 0 }, { key: 'overPel', label: t('report.col.days_over_pel', { ppm: CO_LIMITS.oshaPel.ppm }), decimals: 0 },
        ],
        rows: co.map(a => ({ area: a.area, days: num(a.days), meanTwa: numOrNull(a.meanTwa), maxTwa: numOrNull(a.maxTwa), overSite: num(a.overSite), overPel: num(a.overPel) })),
      },
      {
        key: 'logs',
        title: t('report.compliance.logs_title'),
        note: t('report.compliance.logs_note', { days }),
        chart: chartOf(scope, { kind: 'bar', ...chartTop(scope), categories: logRows.map(l => l.area), unit: '%', series: [{ name: `${t('report.col.completion')} (%)`, data: logRows.map(l => Math.round(l.completion)) }] }),
        columns: [{ key: 'area', label: t('report.col.area') }, { key: 'logs', label: t('report.col.days_logged'), decimals: 0 }, { key: 'completion', label: t('report.col.completion'), unit: '%', decimals: 0 }, { key: 'signed', label: t('report.col.signed'), decimals: 0 }, { key: 'failed', label: t('report.col.failed_items'), decimals: 0 }],
        rows: logRows,
      },
      {
        key: 'failed-items',
        title: t('report.compliance.failed_items'),
        chart: null,
        columns: [{ key: 'item', label: t('report.col.item') }, { key: 'failed', label: t('report.col.times_failed'), decimals: 0 }],
        // a default item still worded as shipped in the reader's words; a lead's wording as written
        rows: failedItems.map(i => ({ item: checklistItemName(i.item, { t, has: key => t(key) !== key }), failed: num(i.failed) })),
      },
      {
        key: 'evaluations',
        title: t('report.compliance.evaluations_title'),
        note: t('report.compliance.evaluations_note'),
        chart: null,
        columns: [{ key: 'person', label: t('report.col.operator') }, ...siteColumn(scope), { key: 'dueOn', label: t('report.col.due'), date: true }],
        rows: evaluations,
      },
    ],
    caveats: [],
  }
}

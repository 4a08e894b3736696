import { correctionText, type PackWords } from '#shared/utils/audit-pack'
import { INCIDENT_KINDS } from '#shared/utils/incidents'
import { QUALIFICATION_KINDS } from '#shared/utils/admin-schemas'
import { RETRAINING_REASONS } from '#shared/utils/truck-inspection'
import { REQUAL_METHOD_LABELS } from '#shared/utils/asset-schemas'
import { packCorrectionColumns, packInRange, packSiteTime, type PackCorrectableRow } from './sql'
import type { FitReason } from '#shared/utils/battery-fit'
import { mailReason } from '../mail-words'

// The audit pack's sections: per table, one statement scoped to the site and the range (read through a
// cursor, a batch at a time), the columns of the PDF and how a row reads. The CSV of a table carries the
// same columns, plus the record ids that pair an original with its correction.

/* eslint-disable @typescript-eslint/no-explicit-any -- rows come from hand-written SQL with the aliases below */
type Row = Record<string, any>

/** A column as the PDF draws it: its words and its share of the width. */
export interface PackColumn { label: string, width: number }
/** A column as a table declares it: audit_pack.pdf.col.<key>. */
export interface PackColumnKey { key: string, width: number }
export interface PackTable {
  /** file name of its CSV in the ZIP */
  file: string
  /** audit_pack.pdf.table.<title> */
  title: string
  columns: PackColumnKey[]
  sql: string
  cells: (r: Row, t: PackWords) => string[]
  /** rows are event records with corrections (struck through when replaced) */
  corrections: boolean
}
/** key: audit_pack.pdf.section.<key> is its heading; intro: audit_pack.pdf.intro.<each> */
export interface PackSection { key: string, intro: string[], tables: PackTable[] }

const col = (key: string, width = 1): PackColumnKey => ({ key, width })
const yesNo = (v: boolean, t: PackWords) => t(`audit_pack.pdf.word.${v ? 'pass' : 'fail'}`)
const list = (v: unknown) => (Array.isArray(v) ? v.join('; ') : '')
const RESULT: Record<string, string> = { pass: 'pass', fail: 'fail', not_applicable: 'na' }
const CORRECTION_COLUMN = col('correction', 2.4)
const corrected = (r: Row, t: PackWords) => correctionText(r as PackCorrectableRow, t)
const word = (t: PackWords, key: string, params?: Record<string, string | number>) => t(`audit_pack.pdf.word.${key}`, params)
/** a closed code in the reader's words (`<group>.<code>` in the locale files); the code itself when it is not one of `codes` */
const coded = (t: PackWords, group: string, codes: readonly string[], code: string) => (codes.includes(code) ? t(`${group}.${code}`) : code)
const CADENCES = ['daily', 'weekly'] as const

const logs = packCorrectionColumns('area_log_entries')
const areaLogs: PackTable = {
  file: 'area-logs.csv',
  title: 'area_logs',
  columns: [col('period', 0.9), col('area', 1.2), col('item', 2), col('result', 0.6), col('recorded', 1.6), col('signed', 1.6), CORRECTION_COLUMN],
  corrections: true,
  sql: `SELECT ${logs.select}, l.period_start::text AS "period", l.cadence::text AS "cadence", a.name AS "area",
      COALESCE((SELECT i->>'label' FROM jsonb_array_elements(tpl.items) i WHERE i->>'key' = t.item_key LIMIT 1), t.item_key) AS "item",
      t.result::text AS "result", t.note AS "note", su.name AS "signedBy", ${packSiteTime('l.signed_at')} AS "signedAt"
    FROM area_logs l JOIN area_log_entries t ON t.log_id = l.id JOIN areas a ON a.id = l.area_id
      JOIN checklist_templates tpl ON tpl.id = l.template_id LEFT JOIN users su ON su.id = l.signed_by ${logs.join}
    WHERE l.site_id = $1 AND l.period_start BETWEEN $2::date AND $3::date
    ORDER BY l.period_start, a.name, l.id, t.item_key, t.recorded_at, t.id`,
  cells: (r, t) => [
    `${r.period} (${coded(t, 'audit_pack.pdf.cadence', CADENCES, r.cadence)})`, r.area, r.note ? `${r.item} — ${r.note}` : r.item, RESULT[r.result] ? word(t, RESULT[r.result]!) : r.result,
    `${r.recordedBy}, ${r.recordedAt}`, r.signedBy ? `${r.signedBy}, ${r.signedAt}` : word(t, 'not_signed'), corrected(r, t),
  ],
}

const emissions = packCorrectionColumns('emissions_tests')
export const packEmissionsTests: PackTable = {
  file: 'emissions-tests.csv',
  title: 'emissions',
  columns: [col('tested', 0.8), col('truck', 0.8), col('tester', 1.3), col('co_idle', 1), col('hc_ppm', 0.6), col('result', 1.4), col('next_due', 0.8), col('certificate', 1.5), CORRECTION_COLUMN],
  corrections: true,
  sql: `SELECT ${emissions.select}, t.tested_on::text AS "testedOn", tr.fleet_number AS "truck", t.tester_name AS "tester",
      t.co_idle_pct AS "coIdle", t.co_high_idle_pct AS "coHighIdle", t.hc_ppm AS "hc", t.passed AS "passed", t.reasons AS "reasons",
      t.next_due_on::text AS "nextDueOn", up.display_name AS "certificate", up.storage_key AS "certificateKey"
    FROM emissions_tests t JOIN trucks tr ON tr.id = t.truck_id LEFT JOIN uploads up ON up.id = t.certificate_upload_id ${emissions.join}
    WHERE t.site_id = $1 AND t.tested_on BETWEEN $2::date AND $3::date
    ORDER BY t.tested_on, tr.fleet_number, t.recorded_at, t.id`,
  cells: (r, t) => [
    r.testedOn, r.truck, r.tester, `${r.coIdle} / ${r.coHighIdle}`, r.hc === null ? '' : String(r.hc),
    [yesNo(r.passed, t), list(r.reasons)].filter(Boolean).join(': '), r.nextDueOn, r.certificate ?? word(t, 'none_uploaded'), corrected(r, t),
  ],
}

const requal = packCorrectionColumns('requalifications')
const requalifications: PackTable = {
  file: 'requalifications.csv',
  title: 'requalifications',
  columns: [col('performed', 0.8), col('cylinder', 1), col('method', 1.1), col('marking', 1), col('result', 0.6), col('next_due', 0.8), col('recorded', 1.5), CORRECTION_COLUMN],
  corrections: true,
  sql: `SELECT ${requal.select}, t.performed_on::text AS "performedOn", cy.serial AS "cylinder", t.method::text AS "method",
      t.marking AS "marking", t.passed AS "passed", t.next_due_on::text AS "nextDueOn"
    FROM requalifications t JOIN lp_cylinders cy ON cy.id = t.cylinder_id ${requal.join}
    WHERE t.site_id = $1 AND t.performed_on BETWEEN $2::date AND $3::date
    ORDER BY t.performed_on, cy.serial, t.recorded_at, t.id`,
  cells: (r, t) => [
    r.performedOn, r.cylinder, r.method in REQUAL_METHOD_LABELS ? t(`requalify.method_${r.method}`) : r.method, r.marking,
    yesNo(r.passed, t), r.nextDueOn ?? '', `${r.recordedBy}, ${r.recordedAt}`, corrected(r, t),
  ],
}

const refills = packCorrectionColumns('cylinder_refills')
// The reasons in the pack's language where their codes were kept (numbers as stored, in lb), else as stored; the
// failed pre-fill checks by their names, not their keys.
const refusalText = (r: Row, t: PackWords) => {
  const said = Array.isArray(r.reasons) ? (r.reasons as string[]) : []
  const words = Array.isArray(r.words) ? (r.words as { code: string, params?: FitReason['params'] }[]) : []
  return said.map((message, i) => (words[i] ? mailReason(t, { ...words[i]!, message }, 'us') : message)).join('; ')
}
const failedChecks = (failed: unknown, t: PackWords) => (typeof failed === 'string' && failed
  ? failed.split('; ').map(k => (t(`refill.item.${k}`) !== `refill.item.${k}` ? t(`refill.item.${k}`) : k)).join('; ')
  : '')
const refusedRefills: PackTable = {
  file: 'refused-refills.csv',
  title: 'refused',
  columns: [col('when', 0.9), col('cylinder', 0.9), col('why_refused', 3), col('failed_checks', 1.4), col('by', 1), CORRECTION_COLUMN],
  corrections: true,
  sql: `SELECT ${refills.select}, ${packSiteTime('t.at')} AS "at", cy.serial AS "cylinder", t.refusal_reasons AS "reasons", t.refusal_words AS "words",
      (SELECT string_agg(k, '; ' ORDER BY k) FROM jsonb_each_text(t.inspection) AS i(k, v) WHERE v = 'fail') AS "failed"
    FROM cylinder_refills t JOIN lp_cylinders cy ON cy.id = t.cylinder_id ${refills.join}
    WHERE t.site_id = $1 AND t.refused AND ${packInRange('t.at')}
    ORDER BY t.at, t.id`,
  cells: (r, t) => [r.at, r.cylinder, refusalText(r, t), failedChecks(r.failed, t), r.recordedBy, corrected(r, t)],
}

const co = packCorrectionColumns('co_readings')
export const packCoReadings: PackTable = {
  file: 'co-readings.csv',
  title: 'co_readings',
  columns: [col('day', 0.8), col('area', 1.3), col('co_ppm', 0.6), col('hours', 0.6), col('note', 1.6), col('recorded', 1.5), CORRECTION_COLUMN],
  corrections: true,
  sql: `SELECT ${co.select}, t.taken_on::text AS "day", a.name AS "area", t.ppm AS "ppm", t.duration_hours AS "hours", t.note AS "note"
    FROM co_readings t JOIN areas a ON a.id = t.area_id ${co.join}
    WHERE t.site_id = $1 AND t.taken_on BETWEEN $2::date AND $3::date
    ORDER BY a.name, t.taken_on, t.at, t.recorded_at, t.id`,
  cells: (r, t) => [r.day, r.area, String(r.ppm), String(r.hours), r.note, `${r.recordedBy}, ${r.recordedAt}`, corrected(r, t)],
}

/** The derived table after the CO readings (rows made by CoTwaGrouper, not by SQL). */
export const CO_TWA_TABLE = {
  file: 'co-twa.csv',
  title: 'co_twa',
  columns: [col('day', 0.8), col('area', 1.3), col('readings', 0.6), col('hours_sampled', 0.7), col('twa_ppm', 0.7), col('peak_ppm', 0.6), col('check', 2)],
}

const qualifications: PackTable = {
  file: 'qualifications.csv',
  title: 'qualifications',
  columns: [col('person', 1.4), col('qualification', 1.2), col('trained', 0.8), col('evaluated', 0.8), col('expires', 0.8), col('status_at_end', 1.2), col('notes', 2)],
  corrections: false,
  sql: `SELECT q.id AS "id", u.name AS "person", q.kind::text AS "kind", q.trained_on::text AS "trainedOn",
      q.evaluated_on::text AS "evaluatedOn", q.expires_on::text AS "expiresOn", q.expires_on >= $3::date AS "current", q.notes AS "notes"
    FROM qualifications q JOIN users u ON u.id = q.user_id
    WHERE q.user_id IN (SELECT m.user_id FROM memberships m WHERE m.site_id = $1)
      AND q.trained_on <= $3::date AND q.expires_on >= $2::date
    ORDER BY u.name, q.kind, q.trained_on, q.id`,
  cells: (r, t) => [
    r.person, coded(t, 'people.qualification', QUALIFICATION_KINDS, r.kind), r.trainedOn, r.evaluatedOn ?? word(t, 'not_evaluated'),
    r.expiresOn, r.current ? word(t, 'current') : word(t, 'expired', { day: r.expiresOn }), r.notes,
  ],
}

const retraining: PackTable = {
  file: 'retraining-triggers.csv',
  title: 'retraining',
  columns: [col('day', 0.8), col('operator', 1.3), col('truck_class', 0.7), col('reason', 3), col('recorded', 1.5)],
  corrections: false,
  sql: `SELECT t.id AS "id", t.happened_on::text AS "day", p.name AS "person", t.truck_class AS "truckClass", t.reason AS "reason",
      u.name AS "recordedBy", ${packSiteTime('t.recorded_at')} AS "recordedAt"
    FROM retraining_triggers t JOIN users p ON p.id = t.person_id JOIN users u ON u.id = t.user_id
    WHERE t.site_id = $1 AND t.happened_on BETWEEN $2::date AND $3::date
    ORDER BY t.happened_on, p.name, t.id`,
  cells: (r, t) => [r.day, r.person, r.truckClass === null ? '' : String(r.truckClass), coded(t, 'people.retraining_reason', RETRAINING_REASONS, r.reason), `${r.recordedBy}, ${r.recordedAt}`],
}

const incidents: PackTable = {
  file: 'incidents.csv',
  title: 'incidents',
  columns: [col('when', 0.9), col('kind', 0.9), col('where', 1), col('what_happened', 2.4), col('done_at_once', 1.6), col('reported_by', 1), col('follow_up', 1.2)],
  corrections: false,
  sql: `SELECT t.id AS "id", ${packSiteTime('t.at')} AS "at", t.kind::text AS "kind", a.name AS "area", t.description AS "description",
      t.immediate_actions AS "actions", u.name AS "reportedBy",
      (SELECT ${packSiteTime('f.closed_at')} FROM follow_ups f WHERE f.source = 'incident' AND f.source_id = t.id ORDER BY f.created_at LIMIT 1) AS "followUpClosedAt",
      EXISTS (SELECT 1 FROM follow_ups f WHERE f.source = 'incident' AND f.source_id = t.id) AS "hasFollowUp"
    FROM incidents t JOIN users u ON u.id = t.user_id LEFT JOIN areas a ON a.id = t.area_id
    WHERE t.site_id = $1 AND ${packInRange('t.at')}
    ORDER BY t.at, t.id`,
  cells: (r, t) => [
    r.at, coded(t, 'incident.kind', INCIDENT_KINDS, r.kind), r.area ?? '', r.description, r.actions, r.reportedBy,
    !r.hasFollowUp ? word(t, 'none') : r.followUpClosedAt ? word(t, 'closed_at', { at: r.followUpClosedAt }) : word(t, 'open'),
  ],
}

const followUps: PackTable = {
  file: 'follow-ups.csv',
  title: 'follow_ups',
  columns: [col('opened', 0.8), col('from', 0.8), col('what', 2.6), col('owner', 1), col('due', 0.8), col('closed', 1.6), col('closing_note', 1.8)],
  corrections: false,
  sql: `SELECT f.id AS "id", f.opened_on::text AS "openedOn", f.source AS "source", f.title AS "title", o.name AS "owner",
      f.due_on::text AS "dueOn", ${packSiteTime('f.closed_at')} AS "closedAt", cb.name AS "closedBy", f.closing_note AS "note"
    FROM follow_ups f LEFT JOIN users o ON o.id = f.owner_user_id LEFT JOIN users cb ON cb.id = f.closed_by
    WHERE f.site_id = $1 AND f.opened_on BETWEEN $2::date AND $3::date
    ORDER BY f.opened_on, f.created_at, f.id`,
  cells: (r, t) => [
    r.openedOn, word(t, r.source === 'incident' ? 'incident' : 'checklist'), r.title, r.owner ?? '', r.dueOn ?? '',
    r.closedAt ? `${r.closedBy ?? ''}, ${r.closedAt}` : word(t, 'open'), r.note ?? '',
  ],
}

// The checks a swap went ahead despite, in the pack's language where their codes were kept (numbers as stored;
// mailReason keeps the recorded words of a check without a known code).
const setAside = (checks: unknown, t: PackWords) => (Array.isArray(checks) ? (checks as FitReason[]).map(c => mailReason(t, c, 'us')).join('; ') : '')
const swapOv = packCorrectionColumns('battery_swaps')
const swapOverrides: PackTable = {
  file: 'swap-overrides.csv',
  title: 'swap_overrides',
  columns: [col('when', 0.9), col('truck', 0.7), col('battery_in', 0.9), col('battery_out', 0.9), col('set_aside', 2.2), col('reason', 2), col('by', 1), CORRECTION_COLUMN],
  corrections: true,
  sql: `SELECT ${swapOv.select}, ${packSiteTime('t.at')} AS "at", tr.fleet_number AS "truck", bi.serial AS "batteryIn", bo.serial AS "batteryOut",
      t.overridden_checks AS "checks", t.override_reason AS "reason"
    FROM battery_swaps t JOIN trucks tr ON tr.id = t.truck_id JOIN batteries bi ON bi.id = t.battery_in_id
      LEFT JOIN batteries bo ON bo.id = t.battery_out_id ${swapOv.join}
    WHERE t.site_id = $1 AND t.overridden_checks IS NOT NULL AND ${packInRange('t.at')}
    ORDER BY t.at, t.id`,
  cells: (r, t) => [r.at, r.truck, r.batteryIn, r.batteryOut ?? '', setAside(r.checks, t), r.reason ?? word(t, 'warning_only'), r.recordedBy, corrected(r, t)],
}

const chargeOv = packCorrectionColumns('charge_sessions')
const chargeOverrides: PackTable = {
  file: 'charge-overrides.csv',
  title: 'charge_overrides',
  columns: [col('when', 0.9), col('battery', 0.9), col('charger', 0.9), col('set_aside', 1.6), col('reason', 2.4), col('by', 1), CORRECTION_COLUMN],
  corrections: true,
  sql: `SELECT ${chargeOv.select}, ${packSiteTime('t.at')} AS "at", b.serial AS "battery", ch.name AS "charger", t.override_reason AS "reason"
    FROM charge_sessions t JOIN batteries b ON b.id = t.battery_id JOIN chargers ch ON ch.id = t.charger_id ${chargeOv.join}
    WHERE t.site_id = $1 AND t.override_reason IS NOT NULL AND ${packInRange('t.at')}
    ORDER BY t.at, t.id`,
  cells: (r, t) => [r.at, r.battery, r.charger, word(t, 'charger_mismatch'), r.reason, r.recordedBy, corrected(r, t)],
}

export const PACK_SECTIONS: PackSection[] = [
  { key: 'logs', intro: ['logs'], tables: [areaLogs] },
  { key: 'emissions', intro: ['emissions'], tables: [packEmissionsTests] },
  { key: 'requalifications', intro: [], tables: [requalifications] },
  { key: 'refused', intro: ['refused'], tables: [refusedRefills] },
  { key: 'co', intro: ['co_twa', 'co_limits'], tables: [packCoReadings] },
  { key: 'training', intro: ['training'], tables: [qualifications, retraining] },
  { key: 'incidents', intro: [], tables: [incidents, followUps] },
  { key: 'overrides', intro: ['overrides'], tables: [swapOverrides, chargeOverrides] },
]

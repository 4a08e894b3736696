import { correctionText } from '#shared/utils/audit-pack'
import { INCIDENT_KIND_LABELS, type IncidentKind } from '#shared/utils/incidents'
import { QUALIFICATION_LABELS } from '#shared/utils/admin-schemas'
import { REQUAL_METHOD_LABELS } from '#shared/utils/asset-schemas'
import { packCorrectionColumns, packInRange, packSiteTime, type PackCorrectableRow } from './sql'

// The audit pack's sections: per table, one statement scoped to the site and the range (read through a
// cursor, a batch at a time), the columns of the PDF and how a row reads. The CSV of a table carries the
// same columns, plus the record ids that pair an original with its correction.

/* eslint-disable @typescript-eslint/no-explicit-any -- rows come from hand-written SQL with the aliases below */
type Row = Record<string, any>

export interface PackColumn { label: string, width: number }
export interface PackTable {
  /** file name of its CSV in the ZIP */
  file: string
  title: string
  columns: PackColumn[]
  sql: string
  cells: (r: Row) => string[]
  /** rows are event records with corrections (struck through when replaced) */
  corrections: boolean
}
export interface PackSection { key: string, title: string, intro: string[], tables: PackTable[] }

const col = (label: string, width = 1): PackColumn => ({ label, width })
const yesNo = (v: boolean) => (v ? 'Pass' : 'Fail')
const list = (v: unknown) => (Array.isArray(v) ? v.join('; ') : '')
const RESULT: Record<string, string> = { pass: 'Pass', fail: 'Fail', not_applicable: 'N/A' }
const CORRECTION_COLUMN = col('Correction', 2.4)
const corrected = (r: Row) => correctionText(r as PackCorrectableRow)

const logs = packCorrectionColumns('area_log_entries')
const areaLogs: PackTable = {
  file: 'area-logs.csv',
  title: 'Area log entries',
  columns: [col('Period', 0.9), col('Area', 1.2), col('Item', 2), col('Result', 0.6), col('Recorded', 1.6), col('Signed', 1.6), CORRECTION_COLUMN],
  corrections: true,
  sql: `SELECT ${logs.select}, l.period_start::text AS "period", l.cadence::text AS "cadence", a.name AS "area",
      COALESCE((SELECT i->>'label' FROM jsonb_array_elements(tpl.items) i WHERE i->>'key' = t.item_key LIMIT 1), t.item_key) AS "item",
      t.result::text AS "result", t.note AS "note", su.name AS "signedBy", ${packSiteTime('l.signed_at')} AS "signedAt"
    FROM area_logs l JOIN area_log_entries t ON t.log_id = l.id JOIN areas a ON a.id = l.area_id
      JOIN checklist_templates tpl ON tpl.id = l.template_id LEFT JOIN users su ON su.id = l.signed_by ${logs.join}
    WHERE l.site_id = $1 AND l.period_start BETWEEN $2::date AND $3::date
    ORDER BY l.period_start, a.name, l.id, t.item_key, t.recorded_at, t.id`,
  cells: r => [
    `${r.period} (${r.cadence})`, r.area, r.note ? `${r.item} — ${r.note}` : r.item, RESULT[r.result] ?? r.result,
    `${r.recordedBy}, ${r.recordedAt}`, r.signedBy ? `${r.signedBy}, ${r.signedAt}` : 'Not signed', corrected(r),
  ],
}

const emissions = packCorrectionColumns('emissions_tests')
export const packEmissionsTests: PackTable = {
  file: 'emissions-tests.csv',
  title: 'Emissions tests',
  columns: [col('Tested', 0.8), col('Truck', 0.8), col('Tester', 1.3), col('CO idle / high idle %', 1), col('HC ppm', 0.6), col('Result', 1.4), col('Next due', 0.8), col('Certificate', 1.5), CORRECTION_COLUMN],
  corrections: true,
  sql: `SELECT ${emissions.select}, t.tested_on::text AS "testedOn", tr.fleet_number AS "truck", t.tester_name AS "tester",
      t.co_idle_pct AS "coIdle", t.co_high_idle_pct AS "coHighIdle", t.hc_ppm AS "hc", t.passed AS "passed", t.reasons AS "reasons",
      t.next_due_on::text AS "nextDueOn", up.display_name AS "certificate", up.storage_key AS "certificateKey"
    FROM emissions_tests t JOIN trucks tr ON tr.id = t.truck_id LEFT JOIN uploads up ON up.id = t.certificate_upload_id ${emissions.join}
    WHERE t.site_id = $1 AND t.tested_on BETWEEN $2::date AND $3::date
    ORDER BY t.tested_on, tr.fleet_number, t.recorded_at, t.id`,
  cells: r => [
    r.testedOn, r.truck, r.tester, `${r.coIdle} / ${r.coHighIdle}`, r.hc === null ? '' : String(r.hc),
    [yesNo(r.passed), list(r.reasons)].filter(Boolean).join(': '), r.nextDueOn, r.certificate ?? 'None uploaded', corrected(r),
  ],
}

const requal = packCorrectionColumns('requalifications')
const requalifications: PackTable = {
  file: 'requalifications.csv',
  title: 'Cylinder requalifications (49 CFR 180.209)',
  columns: [col('Performed', 0.8), col('Cylinder', 1), col('Method', 1.1), col('Marking', 1), col('Result', 0.6), col('Next due', 0.8), col('Recorded', 1.5), CORRECTION_COLUMN],
  corrections: true,
  sql: `SELECT ${requal.select}, t.performed_on::text AS "performedOn", cy.serial AS "cylinder", t.method::text AS "method",
      t.marking AS "marking", t.passed AS "passed", t.next_due_on::text AS "nextDueOn"
    FROM requalifications t JOIN lp_cylinders cy ON cy.id = t.cylinder_id ${requal.join}
    WHERE t.site_id = $1 AND t.performed_on BETWEEN $2::date AND $3::date
    ORDER BY t.performed_on, cy.serial, t.recorded_at, t.id`,
  cells: r => [
    r.performedOn, r.cylinder, REQUAL_METHOD_LABELS[r.method as keyof typeof REQUAL_METHOD_LABELS] ?? r.method, r.marking,
    yesNo(r.passed), r.nextDueOn ?? '', `${r.recordedBy}, ${r.recordedAt}`, corrected(r),
  ],
}

const refills = packCorrectionColumns('cylinder_refills')
const refusedRefills: PackTable = {
  file: 'refused-refills.csv',
  title: 'Refused refills',
  columns: [col('When', 0.9), col('Cylinder', 0.9), col('Why it was refused', 3), col('Failed checks', 1.4), col('By', 1), CORRECTION_COLUMN],
  corrections: true,
  sql: `SELECT ${refills.select}, ${packSiteTime('t.at')} AS "at", cy.serial AS "cylinder", t.refusal_reasons AS "reasons",
      (SELECT string_agg(k, '; ' ORDER BY k) FROM jsonb_each_text(t.inspection) AS i(k, v) WHERE v = 'fail') AS "failed"
    FROM cylinder_refills t JOIN lp_cylinders cy ON cy.id = t.cylinder_id ${refills.join}
    WHERE t.site_id = $1 AND t.refused AND ${packInRange('t.at')}
    ORDER BY t.at, t.id`,
  cells: r => [r.at, r.cylinder, list(r.reasons), r.failed ?? '', r.recordedBy, corrected(r)],
}

const co = packCorrectionColumns('co_readings')
export const packCoReadings: PackTable = {
  file: 'co-readings.csv',
  title: 'CO readings',
  columns: [col('Day', 0.8), col('Area', 1.3), col('CO ppm', 0.6), col('Hours', 0.6), col('Note', 1.6), col('Recorded', 1.5), CORRECTION_COLUMN],
  corrections: true,
  sql: `SELECT ${co.select}, t.taken_on::text AS "day", a.name AS "area", t.ppm AS "ppm", t.duration_hours AS "hours", t.note AS "note"
    FROM co_readings t JOIN areas a ON a.id = t.area_id ${co.join}
    WHERE t.site_id = $1 AND t.taken_on BETWEEN $2::date AND $3::date
    ORDER BY a.name, t.taken_on, t.at, t.recorded_at, t.id`,
  cells: r => [r.day, r.area, String(r.ppm), String(r.hours), r.note, `${r.recordedBy}, ${r.recordedAt}`, corrected(r)],
}

/** The derived table after the CO readings (rows made by CoTwaGrouper, not by SQL). */
export const CO_TWA_TABLE = {
  file: 'co-twa.csv',
  title: '8-hour time-weighted average by area and day',
  columns: [col('Day', 0.8), col('Area', 1.3), col('Readings', 0.6), col('Hours sampled', 0.7), col('8-h TWA ppm', 0.7), col('Peak ppm', 0.6), col('Check', 2)],
}

const qualifications: PackTable = {
  file: 'qualifications.csv',
  title: 'Training and evaluations held during the range',
  columns: [col('Person', 1.4), col('Qualification', 1.2), col('Trained', 0.8), col('Evaluated', 0.8), col('Expires', 0.8), col('At the end of the range', 1.2), col('Notes', 2)],
  corrections: false,
  sql: `SELECT q.id AS "id", u.name AS "person", q.kind::text AS "kind", q.trained_on::text AS "trainedOn",
      q.evaluated_on::text AS "evaluatedOn", q.expires_on::text AS "expiresOn", q.expires_on >= $3::date AS "current", q.notes AS "notes"
    FROM qualifications q JOIN users u ON u.id = q.user_id
    WHERE q.user_id IN (SELECT m.user_id FROM memberships m WHERE m.site_id = $1)
      AND q.trained_on <= $3::date AND q.expires_on >= $2::date
    ORDER BY u.name, q.kind, q.trained_on, q.id`,
  cells: r => [
    r.person, QUALIFICATION_LABELS[r.kind as keyof typeof QUALIFICATION_LABELS] ?? r.kind, r.trainedOn, r.evaluatedOn ?? 'Not evaluated',
    r.expiresOn, r.current ? 'Current' : `Expired ${r.expiresOn}`, r.notes,
  ],
}

const retraining: PackTable = {
  file: 'retraining-triggers.csv',
  title: 'Events that called for retraining (29 CFR 1910.178(l)(4)(ii))',
  columns: [col('Day', 0.8), col('Operator', 1.3), col('Truck class', 0.7), col('Reason', 3), col('Recorded', 1.5)],
  corrections: false,
  sql: `SELECT t.id AS "id", t.happened_on::text AS "day", p.name AS "person", t.truck_class AS "truckClass", t.reason AS "reason",
      u.name AS "recordedBy", ${packSiteTime('t.recorded_at')} AS "recordedAt"
    FROM retraining_triggers t JOIN users p ON p.id = t.person_id JOIN users u ON u.id = t.user_id
    WHERE t.site_id = $1 AND t.happened_on BETWEEN $2::date AND $3::date
    ORDER BY t.happened_on, p.name, t.id`,
  cells: r => [r.day, r.person, r.truckClass === null ? '' : String(r.truckClass), r.reason, `${r.recordedBy}, ${r.recordedAt}`],
}

const incidents: PackTable = {
  file: 'incidents.csv',
  title: 'Incidents',
  columns: [col('When', 0.9), col('Kind', 0.9), col('Where', 1), col('What happened', 2.4), col('Done at once', 1.6), col('Reported by', 1), col('Follow-up', 1.2)],
  corrections: false,
  sql: `SELECT t.id AS "id", ${packSiteTime('t.at')} AS "at", t.kind::text AS "kind", a.name AS "area", t.description AS "description",
      t.immediate_actions AS "actions", u.name AS "reportedBy",
      (SELECT CASE WHEN f.closed_at IS NULL THEN 'Open' ELSE 'Closed ' || ${packSiteTime('f.closed_at')} END
        FROM follow_ups f WHERE f.source = 'incident' AND f.source_id = t.id ORDER BY f.created_at LIMIT 1) AS "followUp"
    FROM incidents t JOIN users u ON u.id = t.user_id LEFT JOIN areas a ON a.id = t.area_id
    WHERE t.site_id = $1 AND ${packInRange('t.at')}
    ORDER BY t.at, t.id`,
  cells: r => [r.at, INCIDENT_KIND_LABELS[r.kind as IncidentKind] ?? r.kind, r.area ?? '', r.description, r.actions, r.reportedBy, r.followUp ?? 'None'],
}

const followUps: PackTable = {
  file: 'follow-ups.csv',
  title: 'Follow-ups opened in the range (failed checklist items and incidents)',
  columns: [col('Opened', 0.8), col('From', 0.8), col('What', 2.6), col('Owner', 1), col('Due', 0.8), col('Closed', 1.6), col('Closing note', 1.8)],
  corrections: false,
  sql: `SELECT f.id AS "id", f.opened_on::text AS "openedOn", f.source AS "source", f.title AS "title", o.name AS "owner",
      f.due_on::text AS "dueOn", ${packSiteTime('f.closed_at')} AS "closedAt", cb.name AS "closedBy", f.closing_note AS "note"
    FROM follow_ups f LEFT JOIN users o ON o.id = f.owner_user_id LEFT JOIN users cb ON cb.id = f.closed_by
    WHERE f.site_id = $1 AND f.opened_on BETWEEN $2::date AND $3::date
    ORDER BY f.opened_on, f.created_at, f.id`,
  cells: r => [
    r.openedOn, r.source === 'incident' ? 'Incident' : 'Checklist', r.title, r.owner ?? '', r.dueOn ?? '',
    r.closedAt ? `${r.closedBy ?? ''}, ${r.closedAt}` : 'Open', r.note ?? '',
  ],
}

export const PACK_SECTIONS: PackSection[] = [
  { key: 'logs', title: 'Area logs', intro: ['Every checklist entry of the range, with who recorded it and who signed the log. Signed logs are locked; a correction is a new entry naming the one it replaces.'], tables: [areaLogs] },
  { key: 'emissions', title: 'Emissions tests', intro: ['Exhaust emissions tests of combustion trucks; the certificates listed here are in the ZIP under certificates/.'], tables: [packEmissionsTests] },
  { key: 'requalifications', title: 'Cylinder requalifications', intro: [], tables: [requalifications] },
  { key: 'refused', title: 'Refused refills', intro: ['Refill attempts the pre-fill check refused, and why. A refused cylinder was not filled.'], tables: [refusedRefills] },
  { key: 'co', title: 'Indoor CO readings', intro: [
    'Readings, then each area\'s 8-hour time-weighted average per day: E = (C1·T1 + C2·T2 + … + Cn·Tn) / 8 h (29 CFR 1910.1000(d)(1)(i)); hours not sampled count as zero.',
    'Limits: OSHA PEL 50 ppm 8-h TWA (29 CFR 1910.1000 Table Z-1) and the site\'s own limit. An aid for the record; it defers to a licensed industrial hygienist and local codes.',
  ], tables: [packCoReadings] },
  { key: 'training', title: 'Training, evaluations and retraining', intro: ['Qualifications of the site\'s people that were in force at some point of the range (operators are re-evaluated at least every three years, 29 CFR 1910.178(l)(4)(iii)).'], tables: [qualifications, retraining] },
  { key: 'incidents', title: 'Incidents and follow-ups', intro: [], tables: [incidents, followUps] },
]

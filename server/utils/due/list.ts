import { sql, type SQL } from 'drizzle-orm'
import { codedError } from '../validation'
import type { Role } from '../../../shared/types/auth'
import type { DueGroup, DueItem, DueListReply } from '../../../shared/types/due'
import type { ObligationState } from '../../../shared/utils/due-dates'
import { DUE_KIND_LABELS, obligationActionPath, type DueKind, type DueSubject, type DueSubjectKind } from '../../../shared/utils/due-schedules'
import type { DueQuery } from '../../../shared/utils/schedule-schemas'
import { rowsOf, type SqlRunner } from './effective'

// The due list, read from the obligations read model: the page, the counts and the site in one statement.
// The state of each obligation is the rule module's obligationStateAt, restated in SQL so the page can be
// sorted and cut in the database (tests/e2e/due-state-sql.test.ts compares the two).

/** How far back a completed obligation still shows as Done. */
export const DONE_WINDOW_DAYS = 7

export type Obligation = DueItem
export type DueList = DueListReply

export interface DueOptions {
  /** obligations whose responsible role is one of these (null: every role) */
  roles: readonly Role[] | null
  /** also those about or owned by this person, whatever their role */
  personId: string | null
  states: readonly ObligationState[]
  kinds: readonly DueKind[] | null
  /** only the obligations of this lead-added schedule (one of the due page's groups) */
  scheduleId?: string | null
  sort: DueQuery['sort']
  limit: number
}

export const OPEN_STATES: ObligationState[] = ['overdue', 'due_soon', 'upcoming']

/** obligationStateAt (shared/utils/due-rules.ts) in SQL, for a row `o` of obligations on `today` (a date, or an SQL date). */
export function obligationStateSql(on: string | SQL, o = 'o'): SQL {
  const c = (name: string) => sql.raw(`${o}.${name}`)
  const today = typeof on === 'string' ? sql`${on}::date` : on
  return sql`CASE
    WHEN ${c('due_on')} IS NULL THEN CASE WHEN ${c('due_at_count')} IS NOT NULL AND ${c('count_now')} IS NOT NULL AND ${c('due_at_count')} - ${c('count_now')} <= 0 THEN 'due_soon' ELSE 'upcoming' END
    WHEN ${c('due_on')} < ${today} THEN 'overdue'
    WHEN ${c('due_on')} <= ${today} + ${c('due_soon_days')} THEN 'due_soon'
    ELSE 'upcoming' END`
}

const ORDER: Record<DueQuery['sort'], SQL> = {
  due: sql`state_rank, shown_due NULLS LAST, label, id`,
  kind: sql`what, state_rank, shown_due NULLS LAST, label, id`,
  subject: sql`label, state_rank, shown_due NULLS LAST, id`,
  role: sql`responsible_role, state_rank, shown_due NULLS LAST, label, id`,
}

interface Row {
  id: string
  kind: DueKind
  scheduleId: string | null
  ruleKey: string
  what: string
  subjectKind: DueSubjectKind
  subjectId: string
  label: string
  tagCode: string | null
  areaId: string | null
  areaName: string | null
  personId: string | null
  periodStart: string | null
  labelWords: DueSubject['labelWords']
  shownDue: string | null
  shownState: ObligationState
  lastDoneOn: string | null
  remaining: number | null
  detail: string | null
  detailWords: DueItem['detailWords']
  responsibleRole: Role
}

// The rows shown for one filter, as the CTEs `o` and `shown` of a statement: open obligations in the
// asked states, and those done in the last week. `today` is the site's today as SQL. Only the columns
// the counts and the orders need: the page reads the rest of its rows' columns by id (a site's every
// obligation carried whole through both CTEs cost PostgreSQL a third of the due list's time).
function shownRows(siteId: string, today: SQL, opts: DueOptions): SQL {
  const open = opts.states.filter(s => s !== 'done')
  const wantDone = opts.states.includes('done')
  const scope = opts.roles === null
    ? sql`true`
    : sql`(ob.responsible_role::text = ANY(${`{${opts.roles.join(',')}}`}::text[])
        ${opts.personId ? sql`OR (ob.person_id = ${opts.personId} AND ob.kind IN ('operator_evaluation', 'follow_up'))` : sql``})`
  const kinds = opts.kinds ? sql`AND ob.kind = ANY(${`{${opts.kinds.join(',')}}`}::text[])` : sql``
  const schedule = opts.scheduleId ? sql`AND ob.schedule_id = ${opts.scheduleId}` : sql``
  return sql`
    o AS (
      SELECT ob.id, ob.kind, ob.schedule_id, ob.what, ob.label, ob.due_on, ob.last_done_on, ob.responsible_role,
        ${obligationStateSql(today, 'ob')} AS state FROM obligations ob
      WHERE ob.site_id = ${siteId} AND ${scope} ${kinds} ${schedule}
    ),
    shown AS (
      SELECT o.*, o.state AS shown_state, o.due_on AS shown_due FROM o WHERE o.state = ANY(${`{${open.join(',')}}`}::text[])
      ${wantDone ? sql`UNION ALL SELECT o.*, 'done', o.last_done_on FROM o WHERE o.last_done_on >= ${today} - ${DONE_WINDOW_DAYS}::int` : sql``}
    )`
}

// The due list of one site: the page in the asked order, the counts by state, the site, in one statement
// (the site's today is worked out from its time zone there, so nothing waits for a first answer).
export async function readDueList(db: SqlRunner, siteId: string, opts: DueOptions, now = new Date()): Promise<DueList> {
  const started = Date.now()
  // the schedules its leads added that the list's roles answer for (the Task filter offers each by its title)
  const forRoles = opts.roles === null ? sql`` : sql`AND c.responsible_role::text = ANY(${`{${opts.roles.join(',')}}`}::text[])`
  const limit = Math.min(opts.limit, 1_000_000)
  const today = sql`(SELECT k.today FROM k)`
  // a built-in kind is one group; each lead-added schedule is a group of its own, under its title
  const counts = sql`SELECT kind, CASE WHEN kind = 'custom' THEN schedule_id END AS "scheduleId", min(CASE WHEN kind = 'custom' THEN what END) AS title,
        shown_state AS state, count(*)::int AS n
      FROM shown s GROUP BY 1, 2, 4`
  const page = sql`SELECT p.id, p.kind, p.schedule_id AS "scheduleId", p.rule_key AS "ruleKey", p.what, p.subject_kind AS "subjectKind", p.subject_id AS "subjectId",
        p.label, p.tag_code AS "tagCode", p.area_id AS "areaId", a.name AS "areaName", p.person_id AS "personId", p.period_start::text AS "periodStart",
        CASE WHEN p.subject_kind = 'follow_up' THEN (SELECT fu.title_words FROM follow_ups fu WHERE fu.id = p.subject_id) END AS "labelWords", q.shown_due::text AS "shownDue", q.shown_state AS "shownState", p.last_done_on::text AS "lastDoneOn",
        CASE WHEN p.due_at_count IS NOT NULL AND p.count_now IS NOT NULL THEN round((p.due_at_count - p.count_now)::numeric, 1)::float8 END AS remaining,
        p.detail, p.detail_words AS "detailWords", p.responsible_role AS "responsibleRole"
      FROM (
        SELECT s.id AS shown_id, s.shown_state, s.shown_due, CASE s.shown_state WHEN 'overdue' THEN 0 WHEN 'due_soon' THEN 1 WHEN 'upcoming' THEN 2 ELSE 3 END AS state_rank
        FROM shown s ORDER BY ${ORDER[opts.sort]} LIMIT ${limit}
      ) q
      JOIN obligations p ON p.id = q.shown_id
      LEFT JOIN areas a ON a.id = p.area_id
      ORDER BY ${ORDER[opts.sort]}`
  const [row] = await rowsOf<{ id: string, name: string, timeZone: string, today: string, schedules: DueListReply['schedules'], counted: GroupCount[], rows: Row[] | null }>(db, sql`
    WITH k AS (SELECT (to_timestamp(${now.getTime()}::float8 / 1000) AT TIME ZONE st.time_zone)::date AS today FROM sites st WHERE st.id = ${siteId}),
    ${shownRows(siteId, today, opts)}
    SELECT s.id, s.name, s.time_zone AS "timeZone", (SELECT k.today::text FROM k) AS today,
      (SELECT coalesce(json_agg(json_build_object('id', c.id, 'title', c.title) ORDER BY c.title, c.id), '[]'::json)
        FROM schedules c WHERE c.site_id = s.id AND c.kind = 'custom' AND c.active ${forRoles}) AS schedules,
      (SELECT coalesce(json_agg(g), '[]'::json) FROM (${counts}) g) AS counted,
      ${limit === 0 ? sql`NULL::json` : sql`(SELECT json_agg(r) FROM (${page}) r)`} AS rows
    FROM sites s WHERE s.id = ${siteId}`)
  if (!row) throw codedError(404, 'no_such_site', 'No such site.')
  const { schedules, counted, rows, today: day, ...site } = row
  const byState: Record<ObligationState, number> = { overdue: 0, due_soon: 0, upcoming: 0, done: 0 }
  for (const c of counted) byState[c.state] += Number(c.n)
  return {
    site,
    today: day,
    items: (rows ?? []).map(toObligation),
    counts: byState,
    groups: dueGroups(counted),
    schedules,
    total: byState.overdue + byState.due_soon + byState.upcoming + byState.done,
    meta: { queries: 1, ms: Date.now() - started },
  }
}

const STATE_ORDER: ObligationState[] = ['overdue', 'due_soon', 'upcoming', 'done']

/** Obligations counted by kind, lead-added schedule (null for a built-in kind) and state. */
export interface GroupCount { kind: DueKind, scheduleId?: string | null, title?: string | null, state: ObligationState, n: number }

/**
 * Counts as groups: one per built-in kind and one per lead-added schedule, named by its title; the worst
 * state first, then the most in it, then by name.
 */
export function dueGroups(counted: readonly GroupCount[]): DueGroup[] {
  const byKey = new Map<string, DueGroup>()
  for (const c of counted) {
    const scheduleId = c.kind === 'custom' ? c.scheduleId ?? null : null
    const key = scheduleId ? `custom:${scheduleId}` : c.kind
    const g = byKey.get(key) ?? {
      key, kind: c.kind, scheduleId, label: (scheduleId && c.title) || DUE_KIND_LABELS[c.kind],
      counts: { overdue: 0, due_soon: 0, upcoming: 0, done: 0 }, worst: 'done', total: 0,
    }
    g.counts[c.state] += Number(c.n)
    g.total += Number(c.n)
    byKey.set(key, g)
  }
  const groups = [...byKey.values()]
  for (const g of groups) g.worst = STATE_ORDER.find(st => g.counts[st] > 0) ?? 'done'
  const rank = (g: DueGroup) => STATE_ORDER.indexOf(g.worst)
  return groups.sort((a, b) => rank(a) - rank(b) || b.counts[b.worst] - a.counts[a.worst] || a.label.localeCompare(b.label))
}

function toObligation(r: Row): Obligation {
  const subject: DueSubject = { kind: r.subjectKind, id: r.subjectId, label: r.label, tagCode: r.tagCode, areaId: r.areaId, periodStart: r.periodStart, ...(r.labelWords ? { labelWords: r.labelWords } : {}) }
  const key = `${r.ruleKey}:${r.subjectId}`
  return {
    id: r.shownState === 'done' ? `${key}:done` : key,
    kind: r.kind,
    scheduleId: r.scheduleId,
    what: r.what,
    subject,
    areaName: r.areaName,
    personId: r.personId,
    dueOn: r.shownDue,
    state: r.shownState,
    lastDoneOn: r.lastDoneOn,
    remaining: r.remaining === null ? null : Number(r.remaining),
    detail: r.detail,
    detailWords: r.detailWords ?? null,
    responsibleRole: r.responsibleRole,
    action: obligationActionPath(r.kind, subject, r.scheduleId),
  }
}

export interface SubjectObligation {
  kind: DueKind
  scheduleId: string | null
  what: string
  dueOn: string | null
  state: Exclude<ObligationState, 'done'>
  remaining: number | null
  detail: string | null
  detailWords: DueItem['detailWords']
  lastDoneOn: string | null
  action: { label: string, to: string }
}

export type SubjectRow = Row & { state: Exclude<ObligationState, 'done'>, dueOn: string | null }

// One subject's obligations in their state on the site's today; `siteId` and `subjectId` are SQL (a value,
// or a column of an enclosing statement).
const subjectRowsSql = (siteId: SQL, subjectKind: DueSubjectKind, subjectId: SQL) => sql`
    SELECT o.kind, o.schedule_id AS "scheduleId", o.what, o.due_on::text AS "dueOn", ${obligationStateSql(sql`(now() AT TIME ZONE st.time_zone)::date`)} AS state,
      o.area_id AS "areaId", o.period_start::text AS "periodStart", o.last_done_on::text AS "lastDoneOn", o.detail, o.detail_words AS "detailWords",
      CASE WHEN o.due_at_count IS NOT NULL AND o.count_now IS NOT NULL THEN round((o.due_at_count - o.count_now)::numeric, 1)::float8 END AS remaining
    FROM obligations o JOIN sites st ON st.id = o.site_id
    WHERE o.site_id = ${siteId} AND o.subject_id = ${subjectId} AND o.subject_kind = ${subjectKind}
    ORDER BY o.due_on NULLS LAST, o.what`

/**
 * One subject's obligations as a JSON column of another statement (the battery room reads a battery's
 * status and what is due on it in one); read them with subjectObligations.
 */
export const subjectObligationsJson = (siteId: SQL, subjectKind: DueSubjectKind, subjectId: SQL) =>
  sql`(SELECT coalesce(json_agg(x), '[]') FROM (${subjectRowsSql(siteId, subjectKind, subjectId)}) x)`

/** The rows of obligationsOfSubject or subjectObligationsJson as the tag page and asset pages list them. */
export function subjectObligations(rows: readonly SubjectRow[], subject: Pick<DueSubject, 'kind' | 'id' | 'label' | 'tagCode'>): SubjectObligation[] {
  return rows.map(r => ({
    kind: r.kind, scheduleId: r.scheduleId, what: r.what, dueOn: r.dueOn, state: r.state, remaining: r.remaining === null ? null : Number(r.remaining),
    detail: r.detail, detailWords: r.detailWords ?? null, lastDoneOn: r.lastDoneOn,
    action: obligationActionPath(r.kind, { ...subject, areaId: r.areaId, periodStart: r.periodStart }, r.scheduleId),
  }))
}

/** An asset's due items as its status lists them (asset-status.ts). */
export const statusDueItems = (items: readonly SubjectObligation[]) =>
  items.map(o => ({ what: o.what, kind: o.kind, dueOn: o.dueOn, state: o.state, detail: o.detail, detailWords: o.detailWords, action: o.action }))

/** What is due on one subject (the tag page and the asset pages), soonest first, in its state on the site's today. */
export async function obligationsOfSubject(db: SqlRunner, siteId: string, subject: Pick<DueSubject, 'kind' | 'id' | 'label' | 'tagCode'>): Promise<SubjectObligation[]> {
  return subjectObligations(await rowsOf<SubjectRow>(db, subjectRowsSql(sql`${siteId}`, subject.kind, sql`${subject.id}`)), subject)
}

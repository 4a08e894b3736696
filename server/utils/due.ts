import { sql, type SQL } from 'drizzle-orm'
import type { Role } from '#shared/types/auth'
import type { ObligationState } from '#shared/utils/due-dates'
import {
  DUE_KIND_SUBJECTS, defaultSchedules, effectiveSchedules, obligationActionPath,
  type DueKind, type DueQuery, type DueSubject, type DueSubjectKind, type ScheduleDefinition, type StoredSchedule,
} from '#shared/utils/due-schedules'
import { CHARGER_ITEM_KEY, EXTINGUISHER_ITEM_KEY, EYEWASH_ITEM_KEY } from '#shared/utils/area-checklists'
import { siteSettingsSchema, type SiteSettings } from '#shared/utils/site-settings'
import type { DbOrTx } from './db'
import type { H3Event } from 'h3'
import type { Actor } from './auth'

/** How far back a completed obligation still shows as Done. */
export const DONE_WINDOW_DAYS = 7

export interface Obligation {
  id: string
  kind: DueKind
  what: string
  subject: DueSubject
  areaName: string | null
  personId: string | null
  dueOn: string | null
  state: ObligationState
  lastDoneOn: string | null
  remaining: number | null
  detail: string | null
  responsibleRole: Role
  action: { label: string, to: string }
}

export interface DueSite {
  id: string
  name: string
  timeZone: string
  settings: SiteSettings
  today: string
}

export interface DueList {
  site: { id: string, name: string, timeZone: string }
  today: string
  items: Obligation[]
  counts: Record<ObligationState, number>
  total: number
  meta: { queries: number, ms: number }
}

/** Counts the statements one due-list computation runs, so its cost stays visible and bounded. */
export class DueQueryCounter {
  count = 0
  async run<T>(db: DbOrTx, query: SQL): Promise<T[]> {
    this.count += 1
    return (await db.execute(query)) as unknown as T[]
  }
}

export async function loadDueSite(db: DbOrTx, siteId: string, counter = new DueQueryCounter()): Promise<DueSite> {
  const [site] = await counter.run<{ id: string, name: string, timeZone: string, settings: unknown }>(db, sql`
    SELECT id, name, time_zone AS "timeZone", settings FROM sites WHERE id = ${siteId}`)
  if (!site) throw createError({ statusCode: 404, message: 'No such site.' })
  const parsed = siteSettingsSchema.safeParse(site.settings ?? {})
  const settings = parsed.success ? parsed.data : siteSettingsSchema.parse({})
  return { id: site.id, name: site.name, timeZone: site.timeZone, settings, today: localDate(new Date(), site.timeZone) }
}

// The site's schedules: the defaults from its settings, each replaced by its own stored row.
export async function siteSchedules(db: DbOrTx, site: DueSite, counter = new DueQueryCounter()): Promise<ScheduleDefinition[]> {
  const stored = await counter.run<StoredSchedule>(db, sql`
    SELECT kind, title, applies_to AS "appliesTo", rule, every, every_unit AS "everyUnit", within_days AS "withinDays",
      due_soon_days AS "dueSoonDays", responsible_role AS "responsibleRole", source, active
    FROM schedules WHERE site_id = ${site.id}`)
  return effectiveSchedules(defaultSchedules(site.settings), stored)
}

interface ObligationRow {
  subject_kind: DueSubjectKind
  subject_id: string
  label: string
  tag_code: string | null
  area_id: string | null
  area_name: string | null
  person_id: string | null
  period_start: string | null
  due_on: string | null
  last_done_on: string | null
  remaining: number | null
  detail: string | null
  state: Exclude<ObligationState, 'done'>
}

const MAKE_INTERVAL_ARG: Record<string, string> = { day: 'days', week: 'weeks', month: 'months', year: 'years' }

/** `base` plus the schedule's interval, as a date; month ends clamp as PostgreSQL's interval arithmetic does. */
function plusInterval(base: SQL, s: ScheduleDefinition): SQL {
  const arg = MAKE_INTERVAL_ARG[s.everyUnit ?? 'day'] ?? 'days'
  return sql`((${base}) + make_interval(${sql.raw(arg)} => ${s.every ?? 1}::int))::date`
}

interface KindContext {
  site: DueSite
  schedule: ScheduleDefinition
  /** only obligations about or owned by this person */
  personId: string | null
}

const local = (tz: string, column: SQL) => sql`((${column}) AT TIME ZONE ${tz})::date`
const liveTag = (kind: string, idColumn: SQL) =>
  sql`(SELECT code FROM tags WHERE tags.asset_kind = ${kind} AND tags.asset_id = ${idColumn} AND tags.retired_at IS NULL)`

// The latest passing, uncorrected entry of one checklist item, per area of the site: each area's logs
// are walked newest first (index on area_id, period_start) and the walk stops at the first pass.
const lastPassByArea = (siteId: string, itemKey: string) => sql`(
  SELECT a2.id AS area_id, lp.at FROM areas a2
  LEFT JOIN LATERAL (
    SELECT e.at FROM area_logs l
    JOIN area_log_entries e ON e.log_id = l.id AND e.item_key = ${itemKey} AND e.result = 'pass'
    WHERE l.area_id = a2.id AND NOT EXISTS (SELECT 1 FROM area_log_entries c2 WHERE c2.corrects_id = e.id)
    ORDER BY l.period_start DESC, e.at DESC LIMIT 1
  ) lp ON true
  WHERE a2.site_id = ${siteId})`

// One statement per obligation kind: each returns every subject at the site with its due date.
function kindQuery(kind: DueKind, { site, schedule: s, personId }: KindContext): SQL | null {
  const tz = site.timeZone
  const siteId = site.id
  switch (kind) {
    case 'battery_watering':
    case 'battery_equalize': {
      const lastDone = kind === 'battery_watering'
        ? sql`SELECT max(e.at) AS at FROM electrolyte_checks e WHERE e.battery_id = b.id AND e.water_added_gal > 0`
        : sql`SELECT c.ended_at AS at FROM charge_sessions c WHERE c.battery_id = b.id AND c.equalize AND c.outcome = 'complete' ORDER BY c.at DESC LIMIT 1`
      const every = s.every ?? 1
      // a charge that ended after the last watering started at most a day or so before it: the bound on
      // c.at lets the (battery_id, at) index skip the battery's older sessions
      const since = sql`c.battery_id = b.id AND c.at > COALESCE(w.at, '-infinity'::timestamptz) - interval '3 days'
        AND c.ended_at IS NOT NULL AND c.ended_at > COALESCE(w.at, '-infinity'::timestamptz)`
      return sql`
        SELECT 'battery' AS subject_kind, b.id AS subject_id, b.serial AS label, ${liveTag('battery', sql`b.id`)} AS tag_code,
          b.home_area_id AS area_id, NULL::text AS area_name, NULL::uuid AS person_id, NULL::date AS period_start,
          LEAST(
            (COALESCE(${local(tz, sql`w.at`)}, b.in_service_on, ${local(tz, sql`b.created_at`)}) + ${s.withinDays}::int),
            ${local(tz, sql`r.ended_at`)}
          ) AS due_on,
          ${local(tz, sql`w.at`)} AS last_done_on,
          (${every}::int - cnt.n) AS remaining,
          cnt.n || ' of ' || ${every}::int || ${kind === 'battery_watering' ? ' charges since watering' : ' charges since equalize'} AS detail
        FROM batteries b
        LEFT JOIN LATERAL (${lastDone}) w ON true
        LEFT JOIN LATERAL (SELECT count(*)::int AS n FROM charge_sessions c WHERE ${since}) cnt ON true
        LEFT JOIN LATERAL (SELECT c.ended_at FROM charge_sessions c WHERE ${since} ORDER BY c.ended_at OFFSET ${every - 1}::int LIMIT 1) r ON true
        WHERE b.site_id = ${siteId} AND b.chemistry = 'flooded_lead_acid' AND NOT b.out_of_service`
    }
    case 'electrolyte_full_check':
      return sql`
        SELECT 'battery' AS subject_kind, b.id AS subject_id, b.serial AS label, ${liveTag('battery', sql`b.id`)} AS tag_code,
          b.home_area_id AS area_id, NULL::text AS area_name, NULL::uuid AS person_id, NULL::date AS period_start,
          ${plusInterval(sql`COALESCE(${local(tz, sql`w.at`)}, b.in_service_on, ${local(tz, sql`b.created_at`)})`, s)} AS due_on,
          ${local(tz, sql`w.at`)} AS last_done_on, NULL::int AS remaining, NULL::text AS detail
        FROM batteries b
        LEFT JOIN LATERAL (SELECT max(e.at) AS at FROM electrolyte_checks e WHERE e.battery_id = b.id AND e.scope = 'every_cell') w ON true
        WHERE b.site_id = ${siteId} AND b.chemistry = 'flooded_lead_acid' AND NOT b.out_of_service`
    case 'charger_inspection':
      return sql`
        SELECT 'charger' AS subject_kind, ch.id AS subject_id, ch.name AS label, ${liveTag('charger', sql`ch.id`)} AS tag_code,
          ch.area_id AS area_id, a.name AS area_name, NULL::uuid AS person_id, NULL::date AS period_start,
          ${plusInterval(sql`COALESCE(${local(tz, sql`w.at`)}, ${local(tz, sql`ch.created_at`)})`, s)} AS due_on,
          ${local(tz, sql`w.at`)} AS last_done_on, NULL::int AS remaining, NULL::text AS detail
        FROM chargers ch JOIN areas a ON a.id = ch.area_id
        LEFT JOIN ${lastPassByArea(siteId, CHARGER_ITEM_KEY)} w ON w.area_id = ch.area_id
        WHERE ch.site_id = ${siteId} AND NOT ch.out_of_service`
    case 'eyewash_activation':
    case 'extinguisher_visual': {
      const item = kind === 'eyewash_activation' ? EYEWASH_ITEM_KEY : EXTINGUISHER_ITEM_KEY
      const kindFilter = kind === 'eyewash_activation' ? sql`AND a.kind = 'charging_area'` : sql``
      return sql`
        SELECT 'area' AS subject_kind, a.id AS subject_id, a.name AS label, ${liveTag('area', sql`a.id`)} AS tag_code,
          a.id AS area_id, a.name AS area_name, NULL::uuid AS person_id, NULL::date AS period_start,
          ${plusInterval(sql`COALESCE(${local(tz, sql`w.at`)}, ${local(tz, sql`a.created_at`)})`, s)} AS due_on,
          ${local(tz, sql`w.at`)} AS last_done_on, NULL::int AS remaining, NULL::text AS detail
        FROM areas a
        LEFT JOIN ${lastPassByArea(siteId, item)} w ON w.area_id = a.id
        WHERE a.site_id = ${siteId} AND NOT a.archived ${kindFilter}`
    }
    case 'area_checklist':
      return sql`
        SELECT 'area' AS subject_kind, a.id AS subject_id, a.name AS label, ${liveTag('area', sql`a.id`)} AS tag_code,
          a.id AS area_id, a.name AS area_name, NULL::uuid AS person_id, NULL::date AS period_start,
          ${plusInterval(sql`COALESCE(ld.d, ${local(tz, sql`a.created_at`)} - 1)`, s)} AS due_on,
          ld.d AS last_done_on, NULL::int AS remaining, NULL::text AS detail
        FROM areas a
        LEFT JOIN LATERAL (
          -- newest first, stopping at the first complete daily log
          SELECT l.period_start AS d FROM area_logs l JOIN checklist_templates t ON t.id = l.template_id
          WHERE l.area_id = a.id AND l.cadence = 'daily'
            AND (SELECT count(DISTINCT e.item_key) FROM area_log_entries e WHERE e.log_id = l.id) >= jsonb_array_length(t.items)
          ORDER BY l.period_start DESC LIMIT 1
        ) ld ON true
        WHERE a.site_id = ${siteId} AND NOT a.archived`
    case 'log_review':
      return sql`
        SELECT 'log' AS subject_kind, l.id AS subject_id, a.name || ' · ' || to_char(l.period_start, 'YYYY-MM-DD') AS label, NULL::text AS tag_code,
          l.area_id AS area_id, a.name AS area_name, NULL::uuid AS person_id, l.period_start AS period_start,
          (l.period_start + CASE WHEN l.cadence = 'weekly' THEN 7 ELSE ${s.every ?? 1}::int END) AS due_on,
          NULL::date AS last_done_on, NULL::int AS remaining,
          (SELECT CASE WHEN count(*) FILTER (WHERE e.result = 'fail') > 0 THEN count(*) FILTER (WHERE e.result = 'fail') || ' failed item(s)' END
             FROM area_log_entries e WHERE e.log_id = l.id) AS detail
        FROM area_logs l JOIN areas a ON a.id = l.area_id
        WHERE l.site_id = ${siteId} AND l.signed_at IS NULL AND EXISTS (SELECT 1 FROM area_log_entries e WHERE e.log_id = l.id)`
    case 'follow_up':
      return sql`
        SELECT 'follow_up' AS subject_kind, f.id AS subject_id, f.title AS label, NULL::text AS tag_code,
          NULL::uuid AS area_id, NULL::text AS area_name, f.owner_user_id AS person_id, NULL::date AS period_start,
          COALESCE(f.due_on, ${plusInterval(local(tz, sql`f.created_at`), s)}) AS due_on,
          NULL::date AS last_done_on, NULL::int AS remaining, u.name AS detail
        FROM follow_ups f LEFT JOIN users u ON u.id = f.owner_user_id
        WHERE f.site_id = ${siteId} AND f.closed_at IS NULL ${personId ? sql`AND f.owner_user_id = ${personId}` : sql``}`
    case 'emissions_test':
      return sql`
        SELECT 'truck' AS subject_kind, t.id AS subject_id, t.fleet_number AS label, ${liveTag('truck', sql`t.id`)} AS tag_code,
          t.home_area_id AS area_id, NULL::text AS area_name, NULL::uuid AS person_id, NULL::date AS period_start,
          COALESCE(et.next_due_on, ${local(tz, sql`t.created_at`)} - 1) AS due_on,
          et.tested_on AS last_done_on, NULL::int AS remaining,
          CASE WHEN et.tested_on IS NULL THEN 'No test on record' WHEN NOT et.passed THEN 'Retest after a failed test' END AS detail
        FROM trucks t
        LEFT JOIN LATERAL (
          SELECT x.next_due_on, x.tested_on, x.passed FROM emissions_tests x WHERE x.truck_id = t.id
          ORDER BY x.tested_on DESC, x.recorded_at DESC LIMIT 1
        ) et ON true
        WHERE t.site_id = ${siteId} AND t.power <> 'electric' AND NOT t.out_of_service`
    case 'co_monitoring':
      return sql`
        SELECT 'area' AS subject_kind, a.id AS subject_id, a.name AS label, ${liveTag('area', sql`a.id`)} AS tag_code,
          a.id AS area_id, a.name AS area_name, NULL::uuid AS person_id, NULL::date AS period_start,
          ${plusInterval(sql`COALESCE(co.d, ${local(tz, sql`a.created_at`)})`, s)} AS due_on,
          co.d AS last_done_on, NULL::int AS remaining, NULL::text AS detail
        FROM areas a
        LEFT JOIN LATERAL (SELECT max(r.taken_on) AS d FROM co_readings r WHERE r.area_id = a.id) co ON true
        WHERE a.site_id = ${siteId} AND NOT a.archived
          AND EXISTS (SELECT 1 FROM trucks t WHERE t.site_id = a.site_id AND t.power <> 'electric' AND NOT t.out_of_service)`
    case 'cylinder_requalification': {
      // 49 CFR 180.209: to the end of the stamped month, 12 years after manufacture, then by method.
      const st = site.settings
      return sql`
        SELECT 'cylinder' AS subject_kind, l.id AS subject_id, l.serial AS label, ${liveTag('cylinder', sql`l.id`)} AS tag_code,
          l.area_id AS area_id, NULL::text AS area_name, NULL::uuid AS person_id, NULL::date AS period_start,
          CASE WHEN l.last_requalified_on IS NOT NULL AND l.last_requalification_method IS NOT NULL
            THEN (date_trunc('month', l.last_requalified_on) + make_interval(years => CASE l.last_requalification_method
              WHEN 'water_jacket' THEN ${st.requalYearsWaterJacket}::int WHEN 'proof_pressure' THEN ${st.requalYearsProofPressure}::int
              ELSE ${st.requalYearsExternalVisual}::int END) + interval '1 month' - interval '1 day')::date
            ELSE (make_date(l.manufacture_year + 12, l.manufacture_month, 1) + interval '1 month' - interval '1 day')::date
          END AS due_on,
          l.last_requalified_on AS last_done_on, NULL::int AS remaining,
          'Stamped ' || lpad(l.manufacture_month::text, 2, '0') || '-' || l.manufacture_year AS detail
        FROM lp_cylinders l
        WHERE l.site_id = ${siteId} AND l.status <> 'condemned'`
    }
    case 'operator_evaluation':
      return sql`
        SELECT 'person' AS subject_kind, u.id AS subject_id, u.name AS label, NULL::text AS tag_code,
          NULL::uuid AS area_id, NULL::text AS area_name, u.id AS person_id, NULL::date AS period_start,
          COALESCE(q.due, ${local(tz, sql`m.created_at`)}) AS due_on, q.evaluated AS last_done_on, NULL::int AS remaining,
          CASE WHEN q.due IS NULL THEN 'No truck evaluation on record' END AS detail
        FROM memberships m JOIN users u ON u.id = m.user_id
        LEFT JOIN LATERAL (
          SELECT min(LEAST(x.expires_on, ${plusInterval(sql`x.evaluated_on`, s)})) AS due, max(x.evaluated_on) AS evaluated
          FROM (
            SELECT DISTINCT ON (qq.kind) qq.kind, qq.expires_on, qq.evaluated_on FROM qualifications qq
            WHERE qq.user_id = u.id AND qq.kind::text LIKE 'truck_class_%'
            ORDER BY qq.kind, COALESCE(qq.evaluated_on, qq.trained_on) DESC
          ) x
        ) q ON true
        WHERE m.site_id = ${siteId} AND m.role = 'operator' AND u.active ${personId ? sql`AND u.id = ${personId}` : sql``}`
  }
}

function withState(base: SQL, ctx: KindContext, states: readonly ObligationState[]): SQL {
  const today = ctx.site.today
  const open = states.filter(s => s !== 'done')
  const wantDone = states.includes('done')
  const openList = open.length ? sql.join(open.map(s => sql`${s}`), sql`, `) : sql`NULL`
  return sql`
    SELECT * FROM (
      SELECT o.*, CASE
        WHEN o.due_on IS NULL THEN CASE WHEN o.remaining <= 0 THEN 'due_soon' ELSE 'upcoming' END
        WHEN o.due_on < ${today}::date THEN 'overdue'
        WHEN o.due_on <= ${today}::date + ${ctx.schedule.dueSoonDays}::int THEN 'due_soon'
        ELSE 'upcoming' END AS state
      FROM (${base}) o
    ) s
    WHERE s.state IN (${openList}) ${wantDone ? sql`OR s.last_done_on >= ${today}::date - ${DONE_WINDOW_DAYS}::int` : sql``}`
}

const STATE_RANK: Record<ObligationState, number> = { overdue: 0, due_soon: 1, upcoming: 2, done: 3 }

export interface DueOptions {
  /** obligations whose responsible role is one of these (null: every role) */
  roles: readonly Role[] | null
  /** also those about or owned by this person, whatever their role */
  personId: string | null
  states: readonly ObligationState[]
  kinds: readonly DueKind[] | null
  sort: DueQuery['sort']
  limit: number
}

export const OPEN_STATES: ObligationState[] = ['overdue', 'due_soon', 'upcoming']

// The due list of one site: one statement for the site, one for its schedules, then at most one per
// obligation kind, whatever the number of assets.
export async function computeDueList(db: DbOrTx, siteId: string, opts: DueOptions): Promise<DueList> {
  const started = Date.now()
  const counter = new DueQueryCounter()
  const site = await loadDueSite(db, siteId, counter)
  const schedules = await siteSchedules(db, site, counter)
  const items: Obligation[] = []
  for (const schedule of schedules) {
    if (!schedule.active) continue
    if (opts.kinds && !opts.kinds.includes(schedule.kind)) continue
    const responsible = opts.roles === null || opts.roles.includes(schedule.responsibleRole)
    const personal = !responsible && opts.personId && DUE_KIND_SUBJECTS[schedule.kind] !== 'log'
      && (schedule.kind === 'operator_evaluation' || schedule.kind === 'follow_up')
    if (!responsible && !personal) continue
    const ctx: KindContext = { site, schedule, personId: responsible ? null : opts.personId }
    const query = kindQuery(schedule.kind, ctx)
    if (!query) continue
    const rows = await counter.run<ObligationRow>(db, withState(query, ctx, opts.states))
    for (const r of rows) items.push(...toObligations(schedule, r, opts.states))
  }
  sortObligations(items, opts.sort)
  const counts: Record<ObligationState, number> = { overdue: 0, due_soon: 0, upcoming: 0, done: 0 }
  for (const o of items) counts[o.state] += 1
  return {
    site: { id: site.id, name: site.name, timeZone: site.timeZone },
    today: site.today,
    items: items.slice(0, opts.limit),
    counts,
    total: items.length,
    meta: { queries: counter.count, ms: Date.now() - started },
  }
}

const asDate = (v: unknown): string | null => (v === null || v === undefined ? null : v instanceof Date ? v.toISOString().slice(0, 10) : String(v).slice(0, 10))

function toObligations(schedule: ScheduleDefinition, r: ObligationRow, states: readonly ObligationState[]): Obligation[] {
  const subject: DueSubject = { kind: r.subject_kind, id: r.subject_id, label: r.label, tagCode: r.tag_code, areaId: r.area_id, periodStart: asDate(r.period_start) }
  const base = {
    kind: schedule.kind,
    what: schedule.title,
    subject,
    areaName: r.area_name,
    personId: r.person_id,
    lastDoneOn: asDate(r.last_done_on),
    remaining: r.remaining === null ? null : Number(r.remaining),
    detail: r.detail,
    responsibleRole: schedule.responsibleRole,
    action: obligationActionPath(schedule.kind, subject),
  }
  const out: Obligation[] = []
  if (states.includes(r.state)) out.push({ ...base, id: `${schedule.kind}:${r.subject_id}`, dueOn: asDate(r.due_on), state: r.state })
  if (states.includes('done') && base.lastDoneOn) out.push({ ...base, id: `${schedule.kind}:${r.subject_id}:done`, dueOn: base.lastDoneOn, state: 'done' })
  return out
}

function sortObligations(items: Obligation[], sort: DueQuery['sort']) {
  const byDue = (a: Obligation, b: Obligation) => STATE_RANK[a.state] - STATE_RANK[b.state] || (a.dueOn ?? '9999').localeCompare(b.dueOn ?? '9999') || a.subject.label.localeCompare(b.subject.label)
  const compare: Record<DueQuery['sort'], (a: Obligation, b: Obligation) => number> = {
    due: byDue,
    kind: (a, b) => a.what.localeCompare(b.what) || byDue(a, b),
    subject: (a, b) => a.subject.label.localeCompare(b.subject.label, undefined, { numeric: true }) || byDue(a, b),
    role: (a, b) => a.responsibleRole.localeCompare(b.responsibleRole) || byDue(a, b),
  }
  items.sort(compare[sort])
}

// Which obligations a user asks for: their own roles by default; a lead may ask for any role or all.
export function dueScopeFor(actor: Actor, siteId: string, role: DueQuery['role']): { roles: Role[] | null, personId: string } {
  const held = rolesAt(actor, siteId)
  const lead = actorCan(actor, 'due.view-all', siteId)
  if (role === 'all') {
    if (!lead) throw createError({ statusCode: 403, message: refusalFor('due.view-all') })
    return { roles: null, personId: actor.user.id }
  }
  if (role) {
    if (!lead && !held.includes(role)) throw createError({ statusCode: 403, message: `You do not hold the ${ROLE_LABELS[role]} role here.` })
    return { roles: [role], personId: actor.user.id }
  }
  return { roles: held, personId: actor.user.id }
}

// A site's due list changes with its records (the site revision) and with the date; one computation of
// the whole list per filter serves every request for half a minute, and each request takes its page.
const DUE_CACHE_MS = 30_000

/** The due list the API answers: computed once per site revision and filter, then cut to `opts.limit`. */
export async function cachedDueList(actor: Actor, siteId: string, opts: DueOptions): Promise<DueList> {
  const { limit, ...filter } = opts
  const key = `due:${JSON.stringify(filter)}`
  const whole = await cachedForSite(actor, siteId, key, DUE_CACHE_MS,
    () => computeDueList(useDb(), siteId, { ...filter, limit: Number.MAX_SAFE_INTEGER }), list => 1024 + list.items.length * 700)
  return { ...whole, items: whole.items.slice(0, limit) }
}

/** The due list as the API sends it: the page serialised once per site revision, filter and length. */
export function cachedDueListJson(event: H3Event, actor: Actor, siteId: string, opts: DueOptions): Promise<Buffer> {
  return cachedJsonForSite(event, actor, siteId, `due:${JSON.stringify(opts)}`, DUE_CACHE_MS, () => cachedDueList(actor, siteId, opts))
}

export function dueOptionsFrom(query: DueQuery, scope: { roles: Role[] | null, personId: string }): DueOptions {
  return { roles: scope.roles, personId: scope.personId, states: query.state ?? OPEN_STATES, kinds: query.kind ?? null, sort: query.sort, limit: query.limit }
}

export const DUE_CSV_COLUMNS = ['state', 'dueOn', 'what', 'subject', 'tagCode', 'area', 'responsibleRole', 'lastDoneOn', 'detail'] as const

export function dueCsvRows(items: Obligation[]) {
  return items.map(o => [OBLIGATION_STATE_LABELS[o.state], o.dueOn ?? '', o.what, o.subject.label, o.subject.tagCode ?? '', o.areaName ?? '', ROLE_LABELS[o.responsibleRole], o.lastDoneOn ?? '', o.detail ?? ''])
}

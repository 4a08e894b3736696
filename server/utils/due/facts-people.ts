import { sql } from 'drizzle-orm'
import type { CompletionFact } from '../../../shared/utils/derived-custom'
import type { FollowUpFacts, LogFacts, OperatorFacts, SiteFacts } from '../../../shared/utils/derived-subjects'
import { isEffectiveRecord, epochMs, rowsOf, dateFromMs, uuidArray, type SqlRunner } from './effective'
import { groupCompletions } from './facts-battery'

// Facts of operators (evaluations), area logs awaiting a signature, follow-ups, the site itself, and the
// completion records of lead-added schedules.

export async function loadOperatorFactsFor(db: SqlRunner, siteId: string, userIds?: readonly string[]): Promise<OperatorFacts[]> {
  if (userIds && userIds.length === 0) return []
  const rows = await rowsOf<{ userId: string, name: string, memberMs: number, quals: [string, string | null][] | null, retrainOn: string | null, retrainReason: string | null }>(db, sql`
    SELECT u.id AS "userId", u.name, ${epochMs('m.created_at')} AS "memberMs", q.list AS quals,
      (SELECT r.happened_on::text FROM retraining_triggers r WHERE r.person_id = u.id ORDER BY r.happened_on DESC, r.recorded_at DESC LIMIT 1) AS "retrainOn",
      (SELECT r.reason FROM retraining_triggers r WHERE r.person_id = u.id ORDER BY r.happened_on DESC, r.recorded_at DESC LIMIT 1) AS "retrainReason"
    FROM memberships m JOIN users u ON u.id = m.user_id
    LEFT JOIN LATERAL (
      SELECT json_agg(json_build_array(x.expires_on::text, x.evaluated_on::text)) AS list FROM (
        SELECT DISTINCT ON (qq.kind) qq.expires_on, qq.evaluated_on FROM qualifications qq
        WHERE qq.user_id = u.id AND qq.kind::text LIKE 'truck_class_%'
        ORDER BY qq.kind, COALESCE(qq.evaluated_on, qq.trained_on) DESC, qq.created_at DESC
      ) x
    ) q ON true
    WHERE m.site_id = ${siteId} AND m.role = 'operator' AND u.active ${userIds ? sql`AND u.id = ANY(${uuidArray(userIds)})` : sql``}`)
  return rows.map(r => ({
    userId: r.userId, siteId, name: r.name, memberSince: dateFromMs(r.memberMs)!,
    truckQualifications: (r.quals ?? []).map(([expiresOn, evaluatedOn]) => ({ expiresOn, evaluatedOn })),
    retraining: r.retrainOn ? { happenedOn: r.retrainOn, reason: r.retrainReason ?? '' } : null,
  }))
}

/** Logs with entries and no signature (all of the site's, or these ones whatever their state). */
export async function loadLogFactsFor(db: SqlRunner, siteId: string, logIds?: readonly string[]): Promise<LogFacts[]> {
  if (logIds && logIds.length === 0) return []
  const rows = await rowsOf<Omit<LogFacts, 'siteId'> & { entryCount: number, failedCount: number }>(db, sql`
    SELECT l.id, l.area_id AS "areaId", a.name AS "areaName", l.period_start::text AS "periodStart", l.cadence, l.signed_at IS NOT NULL AS signed,
      (SELECT count(*)::int FROM area_log_entries e WHERE e.log_id = l.id) AS "entryCount",
      (SELECT count(*)::int FROM area_log_entries e WHERE e.log_id = l.id AND e.result = 'fail' AND ${isEffectiveRecord('area_log_entries', 'e')}) AS "failedCount"
    FROM area_logs l JOIN areas a ON a.id = l.area_id
    WHERE l.site_id = ${siteId} ${logIds
      ? sql`AND l.id = ANY(${uuidArray(logIds)})`
      : sql`AND l.signed_at IS NULL AND EXISTS (SELECT 1 FROM area_log_entries e WHERE e.log_id = l.id)`}`)
  return rows.map(r => ({ ...r, siteId, entryCount: Number(r.entryCount), failedCount: Number(r.failedCount) }))
}

/** Open follow-ups of the site (or these ones whatever their state). */
export async function loadFollowUpFactsFor(db: SqlRunner, siteId: string, ids?: readonly string[]): Promise<FollowUpFacts[]> {
  if (ids && ids.length === 0) return []
  const rows = await rowsOf<Omit<FollowUpFacts, 'siteId'>>(db, sql`
    SELECT f.id, f.title, f.owner_user_id AS "ownerUserId", u.name AS "ownerName", f.due_on::text AS "dueOn", f.opened_on::text AS "openedOn",
      f.closed_at IS NOT NULL AS closed
    FROM follow_ups f LEFT JOIN users u ON u.id = f.owner_user_id
    WHERE f.site_id = ${siteId} ${ids ? sql`AND f.id = ANY(${uuidArray(ids)})` : sql`AND f.closed_at IS NULL`}`)
  return rows.map(r => ({ ...r, siteId }))
}

export async function loadSiteFacts(db: SqlRunner, siteId: string, completions: CompletionFact[] = []): Promise<SiteFacts[]> {
  const rows = await rowsOf<{ id: string, name: string, createdMs: number }>(db, sql`
    SELECT s.id, s.name, ${epochMs('s.created_at')} AS "createdMs" FROM sites s WHERE s.id = ${siteId}`)
  const bySubject = groupCompletions(completions)
  return rows.map(r => ({ id: r.id, siteId, name: r.name, createdAt: dateFromMs(r.createdMs)!, completions: bySubject.get(r.id) ?? [] }))
}

/** Effective completion records of the site's lead-added schedules (for these subjects, or all). */
export async function loadCompletionFacts(db: SqlRunner, siteId: string, subjectIds?: readonly string[]): Promise<CompletionFact[]> {
  if (subjectIds && subjectIds.length === 0) return []
  const rows = await rowsOf<{ scheduleId: string, subjectId: string, doneOn: string, atMs: number, hourMeter: number | null }>(db, sql`
    SELECT c.schedule_id AS "scheduleId", c.subject_id AS "subjectId", c.done_on::text AS "doneOn", ${epochMs('c.at')} AS "atMs", c.hour_meter AS "hourMeter"
    FROM schedule_completions c
    WHERE c.site_id = ${siteId} AND ${isEffectiveRecord('schedule_completions', 'c')} ${subjectIds ? sql`AND c.subject_id = ANY(${uuidArray(subjectIds)})` : sql``}`)
  return rows.map(r => ({ scheduleId: r.scheduleId, subjectId: r.subjectId, doneOn: r.doneOn, at: new Date(Number(r.atMs)), hourMeter: r.hourMeter === null ? null : Number(r.hourMeter) }))
}

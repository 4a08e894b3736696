import { sql } from 'drizzle-orm'
import { codedError } from '../validation'
import { defaultSchedules, effectiveSchedules, type ScheduleDefinition, type StoredSchedule } from '../../../shared/utils/due-schedules'
import { parseSiteSettings, type SiteSettings } from '../../../shared/utils/site-settings'
import { localDate } from '../../../shared/utils/due-dates'
import { epochMs, rowsOf, dateFromMs, type SqlRunner } from './effective'

// What the rules need to know about a site: its time zone, its policy settings and its schedules.

export interface SiteContext {
  id: string
  name: string
  timeZone: string
  createdAt: Date
  settings: SiteSettings
  schedules: ScheduleDefinition[]
}

export async function loadSiteSchedules(db: SqlRunner, siteId: string): Promise<ScheduleDefinition[]> {
  const stored = await rowsOf<StoredSchedule & { createdMs: number }>(db, sql`
    SELECT id, kind, title, applies_to AS "appliesTo", subject_kind AS "subjectKind", rule, every, every_unit AS "everyUnit",
      within_days AS "withinDays", after_fail_days AS "afterFailDays", due_soon_days AS "dueSoonDays",
      responsible_role AS "responsibleRole", source, active, ${epochMs('created_at')} AS "createdMs"
    FROM schedules WHERE site_id = ${siteId}`)
  return effectiveSchedules(defaultSchedules(), stored.map(s => ({ ...s, createdAt: dateFromMs(s.createdMs) })))
}

export async function loadSiteContext(db: SqlRunner, siteId: string): Promise<SiteContext> {
  const [[site], schedules] = await Promise.all([
    rowsOf<{ id: string, name: string, timeZone: string, settings: unknown, createdMs: number }>(db, sql`
      SELECT id, name, time_zone AS "timeZone", settings, ${epochMs('created_at')} AS "createdMs" FROM sites WHERE id = ${siteId}`),
    loadSiteSchedules(db, siteId),
  ])
  if (!site) throw new Error(`no site ${siteId}`)
  return { id: site.id, name: site.name, timeZone: site.timeZone, createdAt: dateFromMs(site.createdMs)!, settings: parseSiteSettings(site.settings), schedules }
}

/** Today's date at the site. */
export const siteToday = (ctx: Pick<SiteContext, 'timeZone'>, now = new Date()) => localDate(now, ctx.timeZone)

/** A site's name, time zone, settings and today (404 for an unknown site). */
export async function loadDueSite(db: SqlRunner, siteId: string) {
  const [site] = await rowsOf<{ id: string, name: string, timeZone: string, settings: unknown }>(db, sql`
    SELECT id, name, time_zone AS "timeZone", settings FROM sites WHERE id = ${siteId}`)
  if (!site) throw codedError(404, 'no_such_site', 'No such site.')
  return { id: site.id, name: site.name, timeZone: site.timeZone, settings: parseSiteSettings(site.settings), today: localDate(new Date(), site.timeZone) }
}

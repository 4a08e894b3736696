import dayjs from 'dayjs'
import utc from 'dayjs/plugin/utc.js'
import timezone from 'dayjs/plugin/timezone.js'
import type { CompletionInput } from '#shared/utils/schedule-schemas'
import type { Actor } from '../auth'
import { recomputeSubjects } from './rules'

dayjs.extend(utc)
dayjs.extend(timezone)

// "Record it done" for a schedule a lead added: an append-only completion record (the day, a note, an
// optional certificate, a truck's hour meter), and the subject's obligations recomputed with it.

export type CustomScheduleRow = typeof tables.schedules.$inferSelect

/** A lead-added schedule at one of the user's sites; anything else is 404. */
export async function findCustomSchedule(actor: Actor, id: string): Promise<CustomScheduleRow> {
  const s = tables.schedules
  const [row] = actor.siteIds.length
    ? await useDb().select().from(s).where(and(eq(s.id, id), eq(s.kind, 'custom'), inArray(s.siteId, actor.siteIds)))
    : []
  if (!row) throw codedError(404, 'no_such_schedule', 'No such schedule.')
  return row
}

const SUBJECT_TABLES = {
  area: tables.areas, charger: tables.chargers, truck: tables.trucks, battery: tables.batteries, cylinder: tables.lpCylinders,
} as const

/** The schedule's subjects at its site, as the form offers them (with the open obligation of each). */
export async function scheduleSubjects(schedule: CustomScheduleRow) {
  const o = tables.obligations
  return useDb().select({ id: o.subjectId, label: o.label, tagCode: o.tagCode, dueOn: o.dueOn, lastDoneOn: o.lastDoneOn, detail: o.detail })
    .from(o).where(and(eq(o.siteId, schedule.siteId), eq(o.ruleKey, `custom:${schedule.id}`))).orderBy(asc(o.dueOn), asc(o.label))
}

async function subjectAtSite(schedule: CustomScheduleRow, subjectId: string): Promise<boolean> {
  if (schedule.subjectKind === 'site') return subjectId === schedule.siteId
  const table = SUBJECT_TABLES[schedule.subjectKind as keyof typeof SUBJECT_TABLES]
  if (!table) return false
  const [row] = await useDb().select({ id: table.id }).from(table).where(and(eq(table.id, subjectId), eq(table.siteId, schedule.siteId)))
  return !!row
}

export async function recordCompletion(actor: Actor, schedule: CustomScheduleRow, input: CompletionInput) {
  const db = useDb()
  const c = tables.scheduleCompletions
  if (input.idempotencyKey) {
    const [earlier] = await db.select().from(c).where(eq(c.idempotencyKey, input.idempotencyKey))
    if (earlier) {
      if (earlier.userId !== actor.user.id || earlier.scheduleId !== schedule.id) throw codedError(409, 'retry_key_taken', 'That retry key belongs to another record; reload the form.')
      return { item: earlier, replayed: true }
    }
  }
  if (!await subjectAtSite(schedule, input.subjectId)) throw badField('subjectId', 'schedule_subject_missing', `Pick one of the schedule's ${schedule.subjectKind === 'site' ? 'site' : `${schedule.subjectKind}s`} at this site.`)
  const [site] = await db.select({ timeZone: tables.sites.timeZone }).from(tables.sites).where(eq(tables.sites.id, schedule.siteId))
  const tz = site?.timeZone ?? 'UTC'
  const today = localDate(new Date(), tz)
  if (input.doneOn > today) throw badField('doneOn', 'day_not_yet', 'That day has not come yet.')
  if (input.hourMeter !== null && schedule.subjectKind !== 'truck') throw badField('hourMeter', 'hour_meter_trucks_only', 'Only trucks have an hour meter.')
  if (input.certificateUploadId) {
    const [upload] = await db.select({ id: tables.uploads.id }).from(tables.uploads)
      .where(and(eq(tables.uploads.id, input.certificateUploadId), eq(tables.uploads.siteId, schedule.siteId)))
    if (!upload) throw badField('certificateUploadId', 'certificate_missing', 'Upload the certificate again.')
  }
  // done today: now; an earlier day: the end of that day at the site (its hour-meter reading sorts there)
  const at = input.doneOn === today ? new Date() : dayjs.tz(`${input.doneOn}T23:59:59`, tz).toDate()
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(c).values({
      siteId: schedule.siteId, userId: actor.user.id, at, idempotencyKey: input.idempotencyKey ?? null, note: input.note,
      scheduleId: schedule.id, subjectKind: schedule.subjectKind ?? 'site', subjectId: input.subjectId, doneOn: input.doneOn,
      hourMeter: input.hourMeter, certificateUploadId: input.certificateUploadId,
    }).returning()
    await writeAudit(tx, { actor, siteId: schedule.siteId, action: 'complete', entity: 'schedule_completion', entityId: row!.id, after: row, note: schedule.title })
    await recomputeSubjects(tx, schedule.siteId, [{ kind: (schedule.subjectKind ?? 'site') as 'site', id: input.subjectId }])
    return { item: row!, replayed: false }
  })
}

import { localDate } from '#shared/utils/due-dates'
import { truckAuthorisationReason, type AuthorisationReason, type ClassQualification, type RetrainingCall } from '#shared/utils/truck-authorisation'
import type { RetrainingReason } from '#shared/utils/truck-inspection'
import type { DbOrTx } from '../db'
import type { Actor } from '../auth'

type TruckRow = Pick<typeof tables.trucks.$inferSelect, 'siteId' | 'truckClass' | 'fleetNumber'>

/** Why this person may not take the truck today, as a coded reason (null when they may); see truck-authorisation.ts. */
export async function truckAuthorisationFor(db: DbOrTx, userId: string, truck: TruckRow, today: string): Promise<AuthorisationReason | null> {
  const q = tables.qualifications
  const r = tables.retrainingTriggers
  const kind = `truck_class_${truck.truckClass}` as typeof q.$inferSelect.kind
  const [[qual], [call]] = await Promise.all([
    db.select({ trainedOn: q.trainedOn, evaluatedOn: q.evaluatedOn, expiresOn: q.expiresOn }).from(q)
      .where(and(eq(q.userId, userId), eq(q.kind, kind)))
      .orderBy(desc(sql`COALESCE(${q.evaluatedOn}, ${q.trainedOn})`), desc(q.createdAt)).limit(1),
    db.select({ happenedOn: r.happenedOn, reason: r.reason }).from(r)
      .where(and(eq(r.personId, userId), or(isNull(r.truckClass), eq(r.truckClass, truck.truckClass))))
      .orderBy(desc(r.happenedOn), desc(r.recordedAt)).limit(1),
  ])
  return truckAuthorisationReason(truck.truckClass, (qual as ClassQualification | undefined) ?? null, call ? { happenedOn: call.happenedOn, reason: call.reason as RetrainingReason } satisfies RetrainingCall : null, today)
}

/**
 * The class check for someone who inspects or takes a truck (an operator at the site: the person who will
 * drive it). Under the site's policy 'block' it refuses with 409 and the reason; under 'warn' it answers
 * the reason, which the record keeps in its audit row and the screen shows.
 */
export async function checkTruckAuthorisation(db: DbOrTx, actor: Actor, truck: TruckRow): Promise<AuthorisationReason | null> {
  if (!rolesAt(actor, truck.siteId).includes('operator')) return null
  const site = await cachedBatteryRoomSettings(actor, truck.siteId, db)
  const problem = await truckAuthorisationFor(db, actor.user.id, truck, localDate(new Date(), site.timeZone))
  if (!problem) return null
  if (site.truckAuthorisationPolicy === 'block') {
    throw createError({ statusCode: 409, message: problem.message, data: { reasons: [problem], overridable: false } })
  }
  return problem
}

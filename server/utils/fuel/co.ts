import type { CoReadingsInput } from '#shared/utils/fuel-schemas'
import type { Actor } from '../auth'

type AreaRow = typeof tables.areas.$inferSelect

// A day's indoor CO readings in one area: stored, judged as an 8-hour TWA (effective readings of that day),
// a reading above the NIOSH ceiling stored as an alert and passed to the alert hook; the area's CO
// monitoring obligation follows.
export async function recordCoReadings(actor: Actor, area: AreaRow, body: CoReadingsInput) {
  const db = useDb()
  const facts = await fuelSiteFacts(db, area.siteId)
  if (body.takenOn > facts.today) throw createError({ statusCode: 400, message: 'The date is in the future.', data: { code: 'future_date', fields: { takenOn: 'Not after today.' } } })
  const ceiling = CO_LIMITS.nioshCeiling.ppm
  const r = tables.coReadings
  const result = await db.transaction(async (tx) => {
    const items = await tx.insert(r).values(body.readings.map(x => ({
      siteId: area.siteId, userId: actor.user.id, areaId: area.id, takenOn: body.takenOn, ppm: x.ppm, durationHours: x.durationHours, note: body.note,
    }))).returning()
    const day = await tx.select({ ppm: r.ppm, durationHours: r.durationHours }).from(r)
      .where(and(eq(r.areaId, area.id), eq(r.takenOn, body.takenOn), sql`${isEffectiveRecord('co_readings', 'co_readings')}`))
    const assessment = coDayAssessment(day, facts.settings.coSiteLimitPpm)
    const above = items.filter(i => i.ppm > ceiling)
    for (const item of items) {
      await writeAudit(tx, { actor, siteId: area.siteId, action: item.ppm > ceiling ? 'co_ceiling_exceeded' : 'create', entity: 'co_reading', entityId: item.id, after: item, note: item.ppm > ceiling ? `${item.ppm} ppm in ${area.name}, above the ${ceiling} ppm ceiling` : undefined })
    }
    await recomputeSubjects(tx, area.siteId, [{ kind: 'area', id: area.id }])
    return { items, assessment, above }
  })
  if (result.above.length) {
    await notifyCoCeilingExceeded({
      siteId: area.siteId, areaId: area.id, areaName: area.name, takenOn: body.takenOn,
      peakPpm: Math.max(...result.above.map(a => a.ppm)), ceilingPpm: ceiling, readingIds: result.above.map(a => a.id),
    })
  }
  return { items: result.items, assessment: result.assessment, alert: result.above.length > 0, limits: coLimitsFor(facts.settings.coSiteLimitPpm) }
}

import { coReadingsSchema } from '#shared/utils/fuel-schemas'

// Record a day's indoor CO readings in one area (safety leads, technicians, admins). The answer
// carries that day's 8-hour TWA against the OSHA PEL, the site limit and the NIOSH ceiling; a reading
// above the ceiling is stored as an alert (audit row) and passed to the alert hook.
export default defineAbilityHandler('co.record', async (event) => {
  const body = await validateBody(event, coReadingsSchema)
  const actor = await requireAbility(event, 'co.record', body.siteId)
  const db = useDb()
  const [area] = await db.select().from(tables.areas).where(and(eq(tables.areas.id, body.areaId), eq(tables.areas.siteId, body.siteId)))
  if (!area) throw createError({ statusCode: 400, message: 'Pick an area at this site.', data: { fields: { areaId: 'Pick an area at this site.' } } })
  const facts = await fuelSiteFacts(db, body.siteId)
  if (body.takenOn > facts.today) throw createError({ statusCode: 400, message: 'The date is in the future.', data: { fields: { takenOn: 'Not after today.' } } })
  const ceiling = CO_LIMITS.nioshCeiling.ppm
  const result = await db.transaction(async (tx) => {
    const items = await tx.insert(tables.coReadings).values(body.readings.map(r => ({
      siteId: body.siteId, userId: actor.user.id, areaId: area.id, takenOn: body.takenOn, ppm: r.ppm, durationHours: r.durationHours, note: body.note,
    }))).returning()
    const day = await tx.select({ ppm: tables.coReadings.ppm, durationHours: tables.coReadings.durationHours }).from(tables.coReadings)
      .where(and(eq(tables.coReadings.areaId, area.id), eq(tables.coReadings.takenOn, body.takenOn)))
    const assessment = coDayAssessment(day, facts.settings.coSiteLimitPpm)
    const above = items.filter(i => i.ppm > ceiling)
    for (const item of items) {
      await writeAudit(tx, { actor, siteId: body.siteId, action: item.ppm > ceiling ? 'co_ceiling_exceeded' : 'create', entity: 'co_reading', entityId: item.id, after: item, note: item.ppm > ceiling ? `${item.ppm} ppm in ${area.name}, above the ${ceiling} ppm ceiling` : undefined })
    }
    return { items, assessment, above }
  })
  if (result.above.length) {
    await notifyCoCeilingExceeded({
      siteId: body.siteId, areaId: area.id, areaName: area.name, takenOn: body.takenOn,
      peakPpm: Math.max(...result.above.map(a => a.ppm)), ceilingPpm: ceiling, readingIds: result.above.map(a => a.id),
    })
  }
  setResponseStatus(event, 201)
  return { items: result.items, assessment: result.assessment, alert: result.above.length > 0, limits: coLimitsFor(facts.settings.coSiteLimitPpm) }
})

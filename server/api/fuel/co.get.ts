import { coQuerySchema } from '#shared/utils/fuel-schemas'

// Indoor CO by area and day for the last N days: the readings, the 8-hour TWA and how it compares
// with the limits (safety leads, technicians, facilities leads, admins).
export default defineAbilityHandler('co.view', async (event) => {
  const { siteId, areaId, days } = validateQuery(event, coQuerySchema)
  await requireAbility(event, 'co.view', siteId)
  const db = useDb()
  const facts = await fuelSiteFacts(db, siteId)
  const from = addCalendarInterval(facts.today, -(days - 1), 'day')
  const c = tables.coReadings
  const rows = await db.select({ id: c.id, areaId: c.areaId, areaName: tables.areas.name, takenOn: c.takenOn, ppm: c.ppm, durationHours: c.durationHours, note: c.note, recordedBy: tables.users.name, at: c.at })
    .from(c)
    .innerJoin(tables.areas, eq(tables.areas.id, c.areaId))
    .innerJoin(tables.users, eq(tables.users.id, c.userId))
    .where(and(eq(c.siteId, siteId), gte(c.takenOn, from), areaId ? eq(c.areaId, areaId) : undefined))
    .orderBy(desc(c.takenOn), asc(tables.areas.name), asc(c.at))
  const groups = new Map<string, { areaId: string, areaName: string, takenOn: string, readings: typeof rows }>()
  for (const r of rows) {
    const key = `${r.takenOn}|${r.areaId}`
    const g = groups.get(key) ?? { areaId: r.areaId, areaName: r.areaName, takenOn: r.takenOn, readings: [] }
    g.readings.push(r)
    groups.set(key, g)
  }
  return {
    limits: coLimitsFor(facts.settings.coSiteLimitPpm),
    days: [...groups.values()].map(g => ({ ...g, assessment: coDayAssessment(g.readings, facts.settings.coSiteLimitPpm) })),
  }
})

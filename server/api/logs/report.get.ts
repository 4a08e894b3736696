import { logRangeQuerySchema } from '#shared/utils/area-checklists'

// The audit report: every area (or one) and every day in a range, with entries, corrections and signatures.
export default defineAbilityHandler('log.view', async (event) => {
  const query = validateQuery(event, logRangeQuerySchema)
  await requireAbility(event, 'log.view', query.siteId)
  const db = useDb()
  const site = await loadDueSite(db, query.siteId)
  const areas = query.areaId
    ? [await areaAtSite(db, query.siteId, query.areaId)]
    : await db.select().from(tables.areas).where(and(eq(tables.areas.siteId, query.siteId), eq(tables.areas.archived, false))).orderBy(asc(tables.areas.name))
  const sections = []
  for (const area of areas) {
    sections.push({ area: { id: area.id, name: area.name, kind: area.kind }, days: await areaLogDays(db, query.siteId, area, query.from, query.to) })
  }
  return { site: { id: site.id, name: site.name, timeZone: site.timeZone }, from: query.from, to: query.to, generatedAt: new Date(), sections }
})

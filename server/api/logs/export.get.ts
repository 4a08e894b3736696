import { logRangeQuerySchema } from '#shared/utils/area-checklists'

// The area logs of a range as CSV: one row per item and day, with who, when, corrections and signatures.
export default defineAbilityHandler('log.view', async (event) => {
  const query = validateQuery(event, logRangeQuerySchema)
  await requireAbility(event, 'log.view', query.siteId)
  const db = useDb()
  const areas = query.areaId
    ? [await areaAtSite(db, query.siteId, query.areaId)]
    : await db.select().from(tables.areas).where(and(eq(tables.areas.siteId, query.siteId), eq(tables.areas.archived, false))).orderBy(asc(tables.areas.name))
  const rows: string[][] = []
  for (const area of areas) rows.push(...entryCsvRows(area, await areaLogDays(db, query.siteId, area, query.from, query.to)))
  return sendCsv(event, `area-logs-${query.from}-to-${query.to}.csv`, csvText(LOG_CSV_HEADER, rows))
})

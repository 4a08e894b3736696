import Papa from 'papaparse'
import { logRangeQuerySchema } from '#shared/utils/area-checklists'

// The area logs of a range as CSV: one row per item and day, with who, when, corrections and signatures.
export default defineEventHandler(async (event) => {
  const query = validateQuery(event, logRangeQuerySchema)
  await requireSiteRole(event, query.siteId, LOG_VIEW_ROLES)
  const db = useDb()
  const areas = query.areaId
    ? [await areaAtSite(db, query.siteId, query.areaId)]
    : await db.select().from(tables.areas).where(and(eq(tables.areas.siteId, query.siteId), eq(tables.areas.archived, false))).orderBy(asc(tables.areas.name))
  const rows: string[][] = []
  for (const area of areas) rows.push(...entryCsvRows(area, await areaLogDays(db, query.siteId, area, query.from, query.to)))
  setResponseHeaders(event, {
    'content-type': 'text/csv; charset=utf-8',
    'content-disposition': `attachment; filename="area-logs-${query.from}-to-${query.to}.csv"`,
  })
  return Papa.unparse({ fields: LOG_CSV_HEADER, data: rows })
})

import Papa from 'papaparse'
import { dueQuerySchema } from '#shared/utils/schedule-schemas'

// The same due list as CSV, every row (no limit).
export default defineEventHandler(async (event) => {
  const query = validateQuery(event, dueQuerySchema)
  const actor = await requireSiteRole(event, query.siteId)
  const scope = dueScopeFor(actor, query.siteId, query.role)
  const list = await computeDueList(query.siteId, { ...dueOptionsFrom(query, scope), limit: Number.MAX_SAFE_INTEGER })
  setResponseHeaders(event, {
    'content-type': 'text/csv; charset=utf-8',
    'content-disposition': `attachment; filename="due-list-${list.today}.csv"`,
  })
  return Papa.unparse({ fields: [...DUE_CSV_COLUMNS], data: dueCsvRows(list.items) })
})

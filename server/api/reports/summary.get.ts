import { reportQuerySchema } from '#shared/utils/report-schemas'

// The facilities lead's figures for this month, each linking to its report (?siteId=<id>|all).
export default defineAbilityHandler('report.fleet', async (event) => {
  const query = validateQuery(event, reportQuerySchema)
  // the home shows figures, not charts: the reports it reads are built without them
  const scope = { ...await reportScope(event, 'report.fleet', query), charts: false }
  const today = new Date().toISOString().slice(0, 10)
  return facilitiesSummary({ ...scope, from: today, to: query.to > today ? today : query.to })
})

import { reportQuerySchema } from '#shared/utils/report-schemas'

// The facilities lead's figures for this month so far, each linking to its report (?siteId=<id>|all).
export default defineAbilityHandler('report.fleet', async (event) => {
  const query = validateQuery(event, reportQuerySchema)
  // the home shows figures, not charts: the reports it reads are built without them
  const scope = { ...await reportScope(event, 'report.fleet', query), charts: false }
  // "this month so far" ends on the sites' own today, not UTC's: at 7 PM in Chicago on the 30th it is still that month there
  const today = scopeToday(scope)
  return facilitiesSummary({ ...scope, from: today, to: today })
})

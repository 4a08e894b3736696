import { reportQuerySchema } from '#shared/utils/report-schemas'

// The facilities lead's figures for this month, each linking to its report (?siteId=<id>|all).
export default defineAbilityHandler('report.fleet', async (event) => {
  const query = validateQuery(event, reportQuerySchema)
  const [scope] = await Promise.all([reportScope(event, 'report.fleet', query), loadCharts()])
  const today = new Date().toISOString().slice(0, 10)
  return facilitiesSummary({ ...scope, from: today, to: query.to > today ? today : query.to })
})

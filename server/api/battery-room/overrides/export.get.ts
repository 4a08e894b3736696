import { overridesQuerySchema } from '#shared/utils/battery-room-schemas'

/** The most rows one export carries; past this it refuses in words rather than leave the oldest out. */
const OVERRIDES_EXPORT_LIMIT = 50_000

// The overrides of a range of the site's days as CSV (?siteId=&from=&to=, the last 90 unless given), for leads
// and inspectors: every one in the range, newest first, not only the 500 the page lists.
export default defineAbilityHandler('report.view', async (event) => {
  const query = validateQuery(event, overridesQuerySchema)
  const actor = await requireAbility(event, 'report.view', query.siteId)
  const { timeZone } = await cachedSiteContext(actor, query.siteId)
  const { from, to, items, more } = await batteryRoomOverrides(query.siteId, timeZone, query, OVERRIDES_EXPORT_LIMIT)
  if (more) {
    throw codedError(422, 'overrides_too_many', `These dates hold more than ${OVERRIDES_EXPORT_LIMIT} overrides, more than one export carries; pick fewer days.`, { params: { limit: OVERRIDES_EXPORT_LIMIT } })
  }
  return sendCsv(event, `overrides-${from}-to-${to}.csv`, csvText(OVERRIDES_CSV_COLUMNS, overridesCsvRows(items)))
})

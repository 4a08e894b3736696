import { overridesQuerySchema } from '#shared/utils/battery-room-schemas'

// Swaps and charges recorded despite a refused check or with a warning (?siteId=&from=&to=, the site's days; the
// last 90 unless given), for leads: the newest 500 of the range, and `more` when it holds others.
export default defineAbilityHandler('report.view', async (event) => {
  const query = validateQuery(event, overridesQuerySchema)
  const actor = await requireAbility(event, 'report.view', query.siteId)
  const { timeZone } = await cachedSiteContext(actor, query.siteId)
  return batteryRoomOverrides(query.siteId, timeZone, query)
})

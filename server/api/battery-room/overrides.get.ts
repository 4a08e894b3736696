import { siteQuerySchema } from '#shared/utils/battery-room-schemas'

// Swaps and charges recorded despite a refused check or with a warning (?siteId=), for leads.
export default defineAbilityHandler('report.view', async (event) => {
  const query = validateQuery(event, siteQuerySchema)
  await requireAbility(event, 'report.view', query.siteId)
  return batteryRoomOverrides(query.siteId)
})

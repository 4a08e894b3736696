import { siteQuerySchema } from '#shared/utils/battery-room-schemas'

// Swaps and charges recorded despite a refused check or with a warning (?siteId=), for leads.
export default defineEventHandler(async (event) => {
  const query = validateQuery(event, siteQuerySchema)
  await requireSiteRole(event, query.siteId, BATTERY_ROOM_LEAD_ROLES)
  return batteryRoomOverrides(query.siteId)
})

import { electrolyteCheckSchema } from '#shared/utils/battery-room-schemas'

// Record an electrolyte check and watering (technicians and leads).
export default defineEventHandler(async (event) => {
  const body = await validateBody(event, electrolyteCheckSchema)
  const { row } = await findAssetForActor(event, 'battery', body.batteryId)
  const actor = await requireSiteRole(event, row.siteId, BATTERY_ROOM_FLOOR_ROLES)
  const result = await recordElectrolyteCheck(actor, row as unknown as typeof tables.batteries.$inferSelect, body)
  if (!result.replayed) setResponseStatus(event, 201)
  return result
})

import { chargeStartSchema } from '#shared/utils/battery-room-schemas'

// Put a battery on a charger (technicians and leads).
export default defineEventHandler(async (event) => {
  const body = await validateBody(event, chargeStartSchema)
  const { row } = await findAssetForActor(event, 'battery', body.batteryId)
  const actor = await requireSiteRole(event, row.siteId, BATTERY_ROOM_FLOOR_ROLES)
  const result = await startChargeSession(actor, { id: row.id, siteId: row.siteId }, body)
  if (!result.replayed) setResponseStatus(event, 201)
  return result
})

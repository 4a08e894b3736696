import { chargeStartSchema } from '#shared/utils/battery-room-schemas'

// Put a battery on a charger (technicians and leads).
export default defineAbilityHandler('charge.record', async (event): Promise<ChargeOnAnswer> => {
  const body = await validateBody(event, chargeStartSchema)
  const { row } = await findAssetForActor(event, 'battery', body.batteryId)
  const actor = await requireAbility(event, 'charge.record', row.siteId)
  const result = await startChargeSession(actor, { id: row.id, siteId: row.siteId }, body)
  if (!result.replayed) setResponseStatus(event, 201)
  return result
})

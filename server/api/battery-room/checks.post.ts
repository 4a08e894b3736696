import { electrolyteCheckSchema } from '#shared/utils/battery-room-schemas'

// Record an electrolyte check and watering (technicians and leads).
export default defineAbilityHandler('reading.record', async (event): Promise<CheckAnswer> => {
  const body = await validateBody(event, electrolyteCheckSchema)
  const { row } = await findAssetForActor(event, 'battery', body.batteryId)
  const actor = await requireAbility(event, 'reading.record', row.siteId)
  const result = await recordElectrolyteCheck(actor, row as unknown as typeof tables.batteries.$inferSelect, body)
  if (!result.replayed) setResponseStatus(event, 201)
  return result
})

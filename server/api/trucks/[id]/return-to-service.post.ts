import { returnToServiceSchema } from '#shared/utils/truck-inspection'

// Put a truck on an inspection hold back in service, saying what was done (technicians and leads).
export default defineAbilityHandler('inspection.return', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, returnToServiceSchema)
  const { actor, row } = await findAssetForActor(event, 'truck', id)
  requireActorCan(actor, 'inspection.return', row.siteId)
  const result = await returnTruckToService(actor, row as typeof tables.trucks.$inferSelect, body)
  setResponseStatus(event, 201)
  return result
})

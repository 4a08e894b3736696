import { requalificationSchema } from '#shared/utils/fuel-schemas'

// Record a requalification (49 CFR 180.209): passed sets the next date by method from the site's
// table; condemned takes the cylinder out of use for good (technicians, leads, admins).
export default defineAbilityHandler('cylinder.requalify', async (event): Promise<RequalificationAnswer> => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, requalificationSchema)
  const { actor, row } = await findAssetForActor(event, 'cylinder', id)
  requireActorCan(actor, 'cylinder.requalify', row.siteId)
  const result = await recordRequalification(actor, row as unknown as FuelCylinderRow, body)
  setResponseStatus(event, 201)
  return result
})

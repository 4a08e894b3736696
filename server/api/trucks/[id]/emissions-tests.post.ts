import { emissionsTestSchema } from '#shared/utils/fuel-schemas'

// Record a yearly tailpipe test of a combustion truck (facilities leads and admins): pass or fail
// against the site's policy, the next date one emissions-schedule interval on, or its retest window after a fail.
export default defineAbilityHandler('emissions.record', async (event): Promise<EmissionsTestAnswer> => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, emissionsTestSchema)
  const { actor, truck } = await requireCombustionTruck(event, id)
  requireActorCan(actor, 'emissions.record', truck.siteId)
  if (!isCombustionPower(truck.power)) {
    throw createError({ statusCode: 409, message: `Truck ${truck.fleetNumber} is electric; it has no tailpipe to test.`, data: { reasons: [{ code: 'emissions_electric', message: `Truck ${truck.fleetNumber} is electric; it has no tailpipe to test.`, params: { truck: truck.fleetNumber } }] } })
  }
  const result = await recordEmissionsTest(actor, truck, body)
  setResponseStatus(event, 201)
  return result
})

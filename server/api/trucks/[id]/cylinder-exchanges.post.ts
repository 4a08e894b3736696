import { exchangeSchema } from '#shared/utils/fuel-schemas'

// Change the LP cylinder on a truck (everyone at the site): the one coming off goes to the cage as
// empty, the one going on must be full, in service and in date for requalification.
export default defineAbilityHandler('cylinder.exchange', async (event): Promise<ExchangeAnswer> => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, exchangeSchema)
  const { actor, row } = await findAssetForActor(event, 'truck', id)
  requireActorCan(actor, 'cylinder.exchange', row.siteId)
  const truck = row as unknown as FuelTruckRow
  if (truck.power !== 'lp_gas') {
    throw createError({ statusCode: 409, message: `Truck ${truck.fleetNumber} does not run on LP-gas; it takes no cylinder.`, data: { reasons: [{ code: 'exchange_not_lp', message: `Truck ${truck.fleetNumber} does not run on LP-gas; it takes no cylinder.`, params: { truck: truck.fleetNumber } }] } })
  }
  let cylinderOnId = body.cylinderOnId
  if (!cylinderOnId && body.cylinderOnCode) {
    const found = await findCylinderByCode(useDb(), truck.siteId, body.cylinderOnCode)
    if (!found) throw createError({ statusCode: 400, message: `No cylinder "${body.cylinderOnCode}" at this site.`, data: { code: 'exchange_no_cylinder', params: { code: body.cylinderOnCode }, fields: { cylinderOnCode: 'No such cylinder at this site.' } } })
    cylinderOnId = found.id
  }
  const request = { truck, cylinderOnId: cylinderOnId!, cylinderOffId: body.cylinderOffId, at: body.at, idempotencyKey: body.idempotencyKey, note: body.note, hourMeter: body.hourMeter }
  let result: Awaited<ReturnType<typeof recordExchange>>
  try {
    result = await recordExchange(actor, request)
  }
  catch (error) {
    if (body.idempotencyKey && isUniqueViolation(error)) result = await recordExchange(actor, request)
    else throw error
  }
  setResponseStatus(event, result.repeated ? 200 : 201)
  return { item: result.exchange, repeated: result.repeated, ...('authorisation' in result && result.authorisation ? { authorisation: result.authorisation } : {}) }
})

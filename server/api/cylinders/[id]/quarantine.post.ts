import { quarantineSchema } from '#shared/utils/fuel-schemas'

// Set a cylinder aside in the cage as quarantined, with the reason (technicians, leads, admins).
export default defineAbilityHandler('cylinder.quarantine', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const { reason } = await validateBody(event, quarantineSchema)
  const { actor, row } = await findAssetForActor(event, 'cylinder', id)
  requireActorCan(actor, 'cylinder.quarantine', row.siteId)
  return { item: await quarantineCylinder(actor, row as unknown as FuelCylinderRow, reason) }
})

import { quarantineSchema } from '#shared/utils/fuel-schemas'

// Set a cylinder aside in the cage as quarantined, with the reason (technicians, leads, admins).
export default defineEventHandler(async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const { reason } = await validateBody(event, quarantineSchema)
  const { actor, row } = await findAssetForActor(event, 'cylinder', id)
  if (!hasRole(actor, row.siteId, QUARANTINE_ROLES)) {
    throw createError({ statusCode: 403, message: 'Technicians, leads and admins quarantine cylinders.' })
  }
  return { item: await quarantineCylinder(actor, row as unknown as FuelCylinderRow, reason) }
})

import { fuelSiteQuerySchema } from '#shared/utils/fuel-schemas'

// The site's LP-gas trucks with the cylinder each carries, for the cylinder change form.
export default defineAbilityHandler('cylinder.exchange', async (event) => {
  const { siteId } = validateQuery(event, fuelSiteQuerySchema)
  await requireAbility(event, 'cylinder.exchange', siteId)
  const t = tables.trucks
  const items = await useDb().select({
    id: t.id, fleetNumber: t.fleetNumber, model: t.model, outOfService: t.outOfService,
    cylinderId: tables.lpCylinders.id, cylinderSerial: tables.lpCylinders.serial,
    cylinderTagCode: sql<string | null>`(SELECT code FROM tags WHERE tags.asset_kind = 'cylinder' AND tags.asset_id = ${tables.lpCylinders.id} AND tags.retired_at IS NULL)`,
  }).from(t)
    .leftJoin(tables.lpCylinders, eq(tables.lpCylinders.currentTruckId, t.id))
    .where(and(eq(t.siteId, siteId), eq(t.power, 'lp_gas')))
    .orderBy(asc(natural(t.fleetNumber)))
  return { items }
})

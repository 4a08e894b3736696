import { cylinderLookupQuerySchema } from '#shared/utils/fuel-schemas'

// A scanned or typed cylinder code at the site, with what a refill or a cylinder change would meet:
// its requalification date, the reasons it may not be filled or fitted, and the user's LP-gas standing.
export default defineAbilityHandler('site.member', async (event): Promise<CylinderLookup> => {
  const { siteId, code } = validateQuery(event, cylinderLookupQuerySchema)
  const actor = await requireAbility(event, 'site.member', siteId)
  const db = useDb()
  const cylinder = await findCylinderByCode(db, siteId, code)
  if (!cylinder) throw codedError(404, 'cylinder_not_found', `No cylinder "${code}" at this site. Check the label and type it again.`, { params: { code } })
  const facts = await fuelSiteFacts(db, siteId)
  const tagCode = await liveCylinderTag(db, cylinder.id)
  const [truck] = cylinder.currentTruckId
    ? await db.select({ id: tables.trucks.id, fleetNumber: tables.trucks.fleetNumber }).from(tables.trucks).where(eq(tables.trucks.id, cylinder.currentTruckId))
    : []
  return {
    item: { ...cylinder, tagCode },
    truck: truck ?? null,
    requalification: cylinderRequalification(cylinder, facts),
    fillBlocks: await cylinderFillBlocks(db, cylinder, facts),
    mountBlocks: cylinderMountBlocks(cylinder, facts, tagCode ?? cylinder.serial),
    fillLimitLb: fillLimitLb(cylinder.waterCapacityLb),
    lpTransfer: await lpTransferStanding(db, actor.user.id, facts.today),
    roles: rolesAt(actor, siteId),
  }
})

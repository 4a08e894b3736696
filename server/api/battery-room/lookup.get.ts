import { lookupQuerySchema } from '#shared/utils/battery-room-schemas'

// A typed or scanned code at a site (?siteId=&code=) with what the swap, charge and check forms need.
export default defineAbilityHandler('site.member', async (event): Promise<FloorLookup> => {
  const query = validateQuery(event, lookupQuerySchema)
  await requireAbility(event, 'site.member', query.siteId)
  return lookupFloorCode(query)
})

import { boardQuerySchema } from '#shared/utils/battery-room-schemas'

// The Bay board for a site or one charging area (?siteId=&areaId=&truckId=): every battery by state, and the suggested battery for a truck.
export default defineAbilityHandler('site.member', async (event) => {
  const query = validateQuery(event, boardQuerySchema)
  const actor = await requireAbility(event, 'site.member', query.siteId)
  return cachedJsonForSite(event, actor, query.siteId, boardCacheKey(query), BOARD_CACHE_MS, () => computeBoard(actor, query))
})

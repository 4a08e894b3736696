import { lookupQuerySchema } from '#shared/utils/battery-room-schemas'

// A typed or scanned code at a site (?siteId=&code=) with what the swap, charge and check forms need.
export default defineEventHandler(async (event) => {
  const query = validateQuery(event, lookupQuerySchema)
  await requireSiteRole(event, query.siteId)
  return lookupFloorCode(query)
})

import { fuelSiteQuerySchema } from '#shared/utils/fuel-schemas'

// The Cylinder cage of every fuel station at a site: counts by state, stored propane against the
// station's limit, requalification due within 90 days, and a reorder hint (anyone at the site).
export default defineAbilityHandler('site.member', async (event) => {
  const { siteId } = validateQuery(event, fuelSiteQuerySchema)
  await requireAbility(event, 'site.member', siteId)
  return cylinderCage(siteId)
})

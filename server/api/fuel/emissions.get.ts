import { z } from 'zod'

const QuerySchema = z.object({ siteId: z.uuid('Pick a site.').optional() })

// The facilities view of tailpipe tests: every combustion truck by site, overdue, failed and awaiting
// retest, due within 30 / 60 / 90 days (facilities leads, safety leads, admins; one site or all theirs).
export default defineAbilityHandler('emissions.view', async (event) => {
  const { siteId } = validateQuery(event, QuerySchema)
  let siteIds: string[]
  if (siteId) {
    await requireAbility(event, 'emissions.view', siteId)
    siteIds = [siteId]
  }
  else {
    siteIds = sitesWhere(await requireActor(event), 'emissions.view')
    if (siteIds.length === 0) throw forbidden('emissions.view')
  }
  return { ...(await emissionsOverview(siteIds)), source: EMISSIONS_POLICY_SOURCE }
})

import { z } from 'zod'

const QuerySchema = z.object({ siteId: z.uuid('Pick a site.').optional() })

// The facilities view of tailpipe tests: every combustion truck by site, overdue, failed and awaiting
// retest, due within 30 / 60 / 90 days (facilities leads, safety leads, admins; one site or all theirs).
export default defineEventHandler(async (event) => {
  const { siteId } = validateQuery(event, QuerySchema)
  let siteIds: string[]
  if (siteId) {
    await requireSiteRole(event, siteId, EMISSIONS_VIEW_ROLES)
    siteIds = [siteId]
  }
  else {
    const actor = await requireActor(event)
    siteIds = actor.memberships.filter(m => m.roles.some(r => EMISSIONS_VIEW_ROLES.includes(r))).map(m => m.siteId)
    if (siteIds.length === 0) throw createError({ statusCode: 403, message: 'Facilities leads, safety leads and admins see the emissions view.' })
  }
  return { ...(await emissionsOverview(siteIds)), source: EMISSIONS_POLICY_SOURCE }
})

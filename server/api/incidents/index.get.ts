import { z } from 'zod'

const QuerySchema = z.object({ siteId: z.uuid() })

// The incidents of a site, newest first, for leads.
export default defineEventHandler(async (event) => {
  const { siteId } = validateQuery(event, QuerySchema)
  await requireSiteRole(event, siteId, INCIDENT_VIEW_ROLES)
  return { items: await listIncidents(siteId) }
})

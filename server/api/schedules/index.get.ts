import { z } from 'zod'

const QuerySchema = z.object({ siteId: z.uuid() })

// The site's schedules (the built-in ones with the site's own changes, then those its leads added), with their sources; anyone at the site.
export default defineEventHandler(async (event) => {
  const { siteId } = validateQuery(event, QuerySchema)
  await requireSiteRole(event, siteId)
  return { items: await siteSchedules(siteId) }
})

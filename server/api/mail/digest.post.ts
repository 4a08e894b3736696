import { z } from 'zod'

const BodySchema = z.object({ siteId: z.uuid() })

// Admins send the site's daily digest now (it is also sent once a day at the site's digest hour).
export default defineEventHandler(async (event) => {
  const { siteId } = await validateBody(event, BodySchema)
  await requireSiteRole(event, siteId, ['admin'])
  return sendDigests({ siteIds: [siteId], force: true })
})

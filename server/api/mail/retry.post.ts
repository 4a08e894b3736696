import { z } from 'zod'

const BodySchema = z.object({ siteId: z.uuid() })

// Admins send the site's queued and failed messages now, whatever their backoff.
export default defineEventHandler(async (event) => {
  const { siteId } = await validateBody(event, BodySchema)
  await requireSiteRole(event, siteId, ['admin'])
  return deliverDueMail({ force: true, siteId, limit: 500 })
})

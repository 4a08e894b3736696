import { z } from 'zod'

const BodySchema = z.object({ siteId: z.uuid() })

// Admins send the site's queued and failed messages now, whatever their backoff.
export default defineAbilityHandler('mail.manage', async (event) => {
  const { siteId } = await validateBody(event, BodySchema)
  await requireAbility(event, 'mail.manage', siteId)
  return deliverDueMail({ force: true, siteId, limit: 500 })
})

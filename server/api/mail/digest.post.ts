import { z } from 'zod'

const BodySchema = z.object({ siteId: z.uuid() })

// Admins send the site's daily digest now (it is also sent once a day at the site's digest hour).
export default defineAbilityHandler('mail.manage', async (event) => {
  const { siteId } = await validateBody(event, BodySchema)
  await requireAbility(event, 'mail.manage', siteId)
  return sendDigests({ siteIds: [siteId], force: true })
})

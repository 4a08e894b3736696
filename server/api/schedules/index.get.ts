import { z } from 'zod'

const QuerySchema = z.object({ siteId: z.uuid() })

// The site's schedules (the built-in ones with the site's own changes, then those its leads added), with their sources; anyone at the site.
export default defineAbilityHandler('site.member', async (event) => {
  const { siteId } = validateQuery(event, QuerySchema)
  await requireAbility(event, 'site.member', siteId)
  return { items: await siteSchedules(siteId) }
})

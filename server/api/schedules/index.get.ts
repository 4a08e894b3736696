import { z } from 'zod'

const QuerySchema = z.object({ siteId: z.uuid() })

// The site's schedules (defaults with the site's own changes), with their sources; anyone at the site.
export default defineAbilityHandler('site.member', async (event) => {
  const { siteId } = validateQuery(event, QuerySchema)
  await requireAbility(event, 'site.member', siteId)
  const db = useDb()
  const site = await loadDueSite(db, siteId)
  return { items: await siteSchedules(db, site) }
})

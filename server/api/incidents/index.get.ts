import { z } from 'zod'

const QuerySchema = z.object({ siteId: z.uuid() })

// The incidents of a site, newest first, for leads.
export default defineAbilityHandler('incident.view', async (event) => {
  const { siteId } = validateQuery(event, QuerySchema)
  await requireAbility(event, 'incident.view', siteId)
  return { items: await listIncidents(siteId) }
})

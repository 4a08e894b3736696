import { dueQuerySchema } from '#shared/utils/schedule-schemas'

// The due list of a site: the caller's roles by default; a lead may ask for any role, or all.
// ?state=overdue,due_soon&kind=…&sort=due|kind|subject|role&limit= (the first 200 by default; `total` says how many)
export default defineAbilityHandler('site.member', async (event) => {
  const query = validateQuery(event, dueQuerySchema)
  const actor = await requireAbility(event, 'site.member', query.siteId)
  const scope = dueScopeFor(actor, query.siteId, query.role)
  return cachedDueListJson(event, actor, query.siteId, dueOptionsFrom(query, scope))
})

import { dueQuerySchema } from '#shared/utils/schedule-schemas'

// The same due list as CSV, every row (no limit).
export default defineAbilityHandler('site.member', async (event) => {
  const query = validateQuery(event, dueQuerySchema)
  const actor = await requireAbility(event, 'site.member', query.siteId)
  const scope = dueScopeFor(actor, query.siteId, query.role)
  const list = await computeDueList(query.siteId, { ...dueOptionsFrom(query, scope), limit: Number.MAX_SAFE_INTEGER })
  return sendCsv(event, `due-list-${list.today}.csv`, csvText(DUE_CSV_COLUMNS, dueCsvRows(list.items)))
})

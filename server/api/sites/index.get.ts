// The sites the user belongs to, with their settings and areas.
export default defineAbilityHandler('account.self', async (event) => {
  const actor = await requireAbility(event, 'account.self')
  if (actor.siteIds.length === 0) return { items: [] }
  const rows = await useDb().query.sites.findMany({
    where: inArray(tables.sites.id, actor.siteIds),
    with: { areas: { columns: { id: true, name: true, kind: true } } },
    orderBy: asc(tables.sites.name),
  })
  return { items: rows.map(s => ({ ...s, roles: rolesAt(actor, s.id) })) }
})

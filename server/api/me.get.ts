// The signed-in user, their sites and roles, and each site's display settings.
export default defineAbilityHandler('account.self', async (event) => {
  const actor = await requireAbility(event, 'account.self')
  const sites = actor.siteIds.length
    ? await useDb().select({ id: tables.sites.id, name: tables.sites.name, timeZone: tables.sites.timeZone, unitSystem: tables.sites.unitSystem })
        .from(tables.sites).where(inArray(tables.sites.id, actor.siteIds))
    : []
  return { user: actor.user, memberships: actor.memberships, sites }
})

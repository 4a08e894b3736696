// The signed-in user, their sites and roles, and each site's display settings.
export default defineAbilityHandler('account.self', async (event) => {
  const actor = await requireAbility(event, 'account.self')
  const sites = actor.siteIds.length
    ? await useDb().select({ id: tables.sites.id, name: tables.sites.name, timeZone: tables.sites.timeZone, unitSystem: tables.sites.unitSystem })
        .from(tables.sites).where(inArray(tables.sites.id, actor.siteIds))
    : []
  const [row] = await useDb().select({ language: tables.users.language }).from(tables.users).where(eq(tables.users.id, actor.user.id))
  return { user: { ...actor.user, language: isLanguage(row?.language) ? row.language : null }, memberships: actor.memberships, sites }
})

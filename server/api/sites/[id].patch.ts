import { siteUpdateSchema } from '#shared/utils/admin-schemas'

// Edit a site's name, zone, units and policy settings (admins of that site). Only the keys sent change.
export default defineAbilityHandler('site.edit', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const { settings: settingsPatch, ...fields } = await validateBody(event, siteUpdateSchema)
  const actor = await requireAbility(event, 'site.edit', id)
  return useDb().transaction(async (tx) => {
    const [before] = await tx.select().from(tables.sites).where(eq(tables.sites.id, id)).for('update')
    if (!before) throw codedError(404, 'no_such_site', 'No such site.')
    const settings = siteSettingsSchema.safeParse({ ...before.settings, ...settingsPatch })
    if (!settings.success) throw schemaFieldsError(settings.error, 'Check the site settings.', 'settings')
    const [site] = await tx.update(tables.sites).set({ ...fields, settings: settings.data }).where(eq(tables.sites.id, id)).returning()
    await writeAudit(tx, { actor, siteId: id, action: 'update', entity: 'site', entityId: id, before, after: site })
    // cool-down, thresholds, requalification years, time zone: every read model of the site follows
    await rebuildSiteReadModels(tx, id)
    return { item: site }
  })
})

import { siteUpdateSchema } from '#shared/utils/admin-schemas'

// Edit a site's name, zone, units and policy settings (admins of that site).
export default defineEventHandler(async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, siteUpdateSchema)
  const actor = await requireSiteRole(event, id, ['admin'])
  return useDb().transaction(async (tx) => {
    const [before] = await tx.select().from(tables.sites).where(eq(tables.sites.id, id)).for('update')
    if (!before) throw createError({ statusCode: 404, message: 'No such site.' })
    const settings = siteSettingsSchema.parse({ ...before.settings, ...body.settings })
    const [site] = await tx.update(tables.sites).set({ ...body, settings }).where(eq(tables.sites.id, id)).returning()
    await writeAudit(tx, { actor, siteId: id, action: 'update', entity: 'site', entityId: id, before, after: site })
    return { item: site }
  })
})

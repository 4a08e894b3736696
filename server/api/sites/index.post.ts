import { siteCreateSchema } from '#shared/utils/admin-schemas'

// Create a site in the admin's organisation; the creating admin becomes its admin.
export default defineAbilityHandler('site.create', async (event) => {
  const body = await validateBody(event, siteCreateSchema)
  const actor = await requireAbility(event, 'site.create')
  const adminSites = sitesWhere(actor, 'site.create')
  const db = useDb()
  const [anchor] = await db.select({ organizationId: tables.sites.organizationId }).from(tables.sites).where(eq(tables.sites.id, adminSites[0]!))
  try {
    return await db.transaction(async (tx) => {
      const [site] = await tx.insert(tables.sites).values({ ...body, organizationId: anchor!.organizationId, settings: { ...defaultSiteSettings(), sgReferenceTempF: defaultSgReferenceTempF(body.unitSystem ?? 'us') } }).returning()
      await tx.insert(tables.memberships).values({ userId: actor.user.id, siteId: site!.id, role: 'admin' })
      await writeAudit(tx, { actor, siteId: site!.id, action: 'create', entity: 'site', entityId: site!.id, after: site })
      setResponseStatus(event, 201)
      return { item: site }
    })
  }
  catch (error) {
    if (isUniqueViolation(error)) throw codedError(409, 'site_name_taken', `A site named "${body.name}" already exists.`, { params: { name: body.name }, fields: { name: 'Already used.' } })
    throw error
  }
})

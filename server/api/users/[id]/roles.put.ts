import { userRolesSchema } from '#shared/utils/admin-schemas'

// Replace a person's roles at one site (admins of that site). An empty list removes them from it. The
// person must already share a site where the caller is admin, and nobody changes their own roles.
export default defineAbilityHandler('role.assign', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, userRolesSchema)
  const actor = await requireAbility(event, 'role.assign', body.siteId)
  if (id === actor.user.id) throw codedError(403, 'own_roles', 'Nobody changes their own roles; ask another admin of the site.')
  await requirePersonInReach(event, id, 'role.assign')
  const db = useDb()
  return db.transaction(async (tx) => {
    const before = await tx.select({ role: tables.memberships.role }).from(tables.memberships)
      .where(and(eq(tables.memberships.userId, id), eq(tables.memberships.siteId, body.siteId)))
    await tx.delete(tables.memberships).where(and(eq(tables.memberships.userId, id), eq(tables.memberships.siteId, body.siteId)))
    const roles = [...new Set(body.roles)]
    if (roles.length) await tx.insert(tables.memberships).values(roles.map(role => ({ userId: id, siteId: body.siteId, role })))
    await writeAudit(tx, { actor, siteId: body.siteId, action: 'set_roles', entity: 'user', entityId: id, before: before.map(r => r.role), after: roles })
    await recomputePersonAtSites(tx, id, [body.siteId])
    return { roles }
  })
})

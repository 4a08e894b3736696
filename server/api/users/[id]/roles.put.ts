import { userRolesSchema } from '#shared/utils/admin-schemas'

// Replace a user's roles at one site (admins of that site). An empty list removes them from it.
export default defineEventHandler(async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, userRolesSchema)
  const actor = await requireSiteRole(event, body.siteId, ['admin'])
  // The user must already be one this admin manages (a shared site), or any admin could claim anyone.
  await requireManagedUser(event, id)
  const db = useDb()
  const [user] = await db.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.id, id))
  if (!user) throw createError({ statusCode: 404, message: 'No such user.' })
  if (id === actor.user.id && !body.roles.includes('admin')) throw createError({ statusCode: 400, message: 'You cannot remove your own admin role.' })
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

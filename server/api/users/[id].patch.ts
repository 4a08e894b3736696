import { userUpdateSchema } from '#shared/utils/admin-schemas'

// Rename, deactivate or reactivate a user, or set a new password (admins who share a site).
// A deactivated user's existing session stops working at its next request, and so do sessions from
// before a password an admin set (the admin's own session is sealed again when it is their password).
export default defineEventHandler(async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, userUpdateSchema)
  const { actor, sharedSiteIds } = await requireManagedUser(event, id)
  if (body.active === false && id === actor.user.id) throw createError({ statusCode: 400, message: 'You cannot deactivate yourself.' })
  const set: Partial<typeof tables.users.$inferInsert> = {}
  if (body.name !== undefined) set.name = body.name
  if (body.active !== undefined) set.active = body.active
  const changedAt = new Date()
  if (body.password !== undefined) {
    set.passwordHash = await hashPassword(body.password)
    set.passwordChangedAt = changedAt
  }
  if (Object.keys(set).length === 0) throw createError({ statusCode: 400, message: 'Nothing to change.' })
  return useDb().transaction(async (tx) => {
    const [before] = await tx.select(publicUserColumns).from(tables.users).where(eq(tables.users.id, id))
    const [user] = await tx.update(tables.users).set(set).where(eq(tables.users.id, id)).returning(publicUserColumns)
    if (!user) throw createError({ statusCode: 404, message: 'No such user.' })
    await writeAudit(tx, { actor, siteId: sharedSiteIds[0] ?? null, action: body.active === false ? 'deactivate' : 'update', entity: 'user', entityId: id, before, after: { ...user, passwordChanged: body.password !== undefined } })
    if (body.name !== undefined || body.active !== undefined) await recomputePersonAtSites(tx, id)
    if (body.password !== undefined && id === actor.user.id) await startSession(event, actor.user, changedAt.getTime())
    return { item: user }
  })
})

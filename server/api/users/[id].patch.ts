import { userUpdateSchema } from '#shared/utils/admin-schemas'

// Rename, re-address, deactivate or reactivate a person, or set a new password. These reach every site the
// person belongs to, so the caller must be admin at every one of them (otherwise 403, pointing to a password
// link). A deactivated person's sessions stop at their next request, and so do sessions from before a new
// password (the caller's own session is sealed again when it is their password).
export default defineAbilityHandler('user.manage', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, userUpdateSchema)
  const { actor, personSites } = await requireAccountAuthority(event, id)
  if (body.active === false && id === actor.user.id) throw codedError(400, 'own_deactivation', 'You cannot deactivate yourself.')
  const set: Partial<typeof tables.users.$inferInsert> = {}
  if (body.name !== undefined) set.name = body.name
  if (body.email !== undefined) set.email = body.email
  if (body.active !== undefined) set.active = body.active
  const changedAt = new Date()
  if (body.password !== undefined) {
    set.passwordHash = await hashPassword(body.password)
    set.passwordChangedAt = changedAt
  }
  if (Object.keys(set).length === 0) throw codedError(400, 'nothing_to_change', 'Nothing to change.')
  try {
    const item = await useDb().transaction(async (tx) => {
      const [before] = await tx.select(publicUserColumns).from(tables.users).where(eq(tables.users.id, id))
      const [user] = await tx.update(tables.users).set(set).where(eq(tables.users.id, id)).returning(publicUserColumns)
      if (!user) throw codedError(404, 'no_such_person', 'No such person.')
      if (body.password !== undefined) await revokeOtherSessions(tx, id)
      await writeAudit(tx, { actor, siteId: personSites[0] ?? null, action: body.active === false ? 'deactivate' : 'update', entity: 'user', entityId: id, before, after: { ...user, passwordChanged: body.password !== undefined } })
      if (body.name !== undefined || body.active !== undefined) await recomputePersonAtSites(tx, id)
      return user
    })
    if (body.password !== undefined && id === actor.user.id) await startSession(event, item, changedAt.getTime())
    return { item }
  }
  catch (error) {
    if (isUniqueViolation(error)) throw codedError(409, 'email_taken', 'That e-mail already has an account.', { fields: { email: 'Already has an account.' } })
    throw error
  }
})

import { userCreateSchema } from '#shared/utils/admin-schemas'

// Create a user with roles at one site (admins of that site).
export default defineAbilityHandler('user.manage', async (event) => {
  const body = await validateBody(event, userCreateSchema)
  const actor = await requireAbility(event, 'user.manage', body.siteId)
  const passwordHash = await hashPassword(body.password)
  try {
    return await useDb().transaction(async (tx) => {
      const [user] = await tx.insert(tables.users).values({ email: body.email, name: body.name, passwordHash }).returning(publicUserColumns)
      await tx.insert(tables.memberships).values([...new Set(body.roles)].map(role => ({ userId: user!.id, siteId: body.siteId, role })))
      await writeAudit(tx, { actor, siteId: body.siteId, action: 'create', entity: 'user', entityId: user!.id, after: { ...user, roles: body.roles } })
      setResponseStatus(event, 201)
      return { item: { ...user, roles: body.roles } }
    })
  }
  catch (error) {
    if (isUniqueViolation(error)) throw codedError(409, 'email_taken', 'That e-mail already has an account.', { fields: { email: 'Already has an account.' } })
    throw error
  }
})

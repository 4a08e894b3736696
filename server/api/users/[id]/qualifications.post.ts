import { qualificationCreateSchema } from '#shared/utils/admin-schemas'

// Record a training and evaluation (admins and safety leads who share a site with the user).
export default defineEventHandler(async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, qualificationCreateSchema)
  const actor = await requireActor(event)
  const reach = actor.memberships.filter(m => m.roles.includes('admin') || m.roles.includes('safety_lead')).map(m => m.siteId)
  const db = useDb()
  const shared = reach.length
    ? await db.select({ siteId: tables.memberships.siteId }).from(tables.memberships).where(and(eq(tables.memberships.userId, id), inArray(tables.memberships.siteId, reach)))
    : []
  if (shared.length === 0) {
    if (reach.length === 0) throw createError({ statusCode: 403, message: 'Admins and safety leads record training.' })
    throw createError({ statusCode: 404, message: 'No such user.' })
  }
  try {
    return await db.transaction(async (tx) => {
      const [q] = await tx.insert(tables.qualifications).values({ ...body, userId: id }).returning()
      await writeAudit(tx, { actor, siteId: shared[0]!.siteId, action: 'create', entity: 'qualification', entityId: q!.id, after: q })
      await recomputePersonAtSites(tx, id)
      setResponseStatus(event, 201)
      return { item: q }
    })
  }
  catch (error) {
    throw unstorableValueError(error, body) ?? error
  }
})

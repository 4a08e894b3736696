import { qualificationCreateSchema } from '#shared/utils/admin-schemas'

// Record someone's training and evaluation (safety leads and admins at a site the person belongs to).
// Nobody records their own; the audit log keeps who recorded it and when, and the People page shows it.
export default defineAbilityHandler('qualification.grant', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, qualificationCreateSchema)
  const { actor, reach } = await requirePersonInReach(event, id, 'qualification.grant')
  if (id === actor.user.id) throw codedError(403, 'own_training', 'Nobody records their own training or evaluation; ask a safety lead or an admin at your site.')
  try {
    return await useDb().transaction(async (tx) => {
      const [q] = await tx.insert(tables.qualifications).values({ ...body, userId: id }).returning()
      await writeAudit(tx, { actor, siteId: reach[0]!, action: 'create', entity: 'qualification', entityId: q!.id, after: q })
      await recomputePersonAtSites(tx, id)
      setResponseStatus(event, 201)
      return { item: { ...q!, recordedBy: actor.user.name, recordedAt: new Date() } }
    })
  }
  catch (error) {
    throw unstorableValueError(error, body) ?? error
  }
})

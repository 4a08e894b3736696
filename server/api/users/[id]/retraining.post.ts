import { retrainingSchema } from '#shared/utils/truck-inspection'

// Record an event that calls for an operator's refresher training and evaluation (29 CFR 1910.178(l)(4)(ii)):
// an incident, a near miss, a different type of truck. Safety leads and admins at a site the person belongs
// to; it makes their evaluation due in the due list.
export default defineAbilityHandler('retraining.record', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, retrainingSchema)
  const { actor, reach } = await requirePersonInReach(event, id, 'retraining.record')
  if (id === actor.user.id) throw codedError(403, 'own_retraining', 'Nobody records their own retraining; ask a safety lead or an admin at your site.')
  return useDb().transaction(async (tx) => {
    const [item] = await tx.insert(tables.retrainingTriggers).values({
      siteId: reach[0]!, userId: actor.user.id, personId: id, reason: body.reason, truckClass: body.truckClass ?? null, happenedOn: body.happenedOn, note: body.note,
    }).returning()
    await writeAudit(tx, { actor, siteId: reach[0]!, action: 'create', entity: 'retraining_trigger', entityId: item!.id, after: item })
    await recomputePersonAtSites(tx, id)
    setResponseStatus(event, 201)
    return { item: item! }
  })
})

import { followUpCloseSchema } from '#shared/utils/area-checklists'

// Close a follow-up with what was done: its owner, or a lead.
export default defineAbilityHandler('followup.close', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, followUpCloseSchema)
  const actor = await requireAbility(event, 'account.self')
  const f = tables.followUps
  const [found] = await useDb().select().from(f).where(and(eq(f.id, id), inArray(f.siteId, actor.siteIds.length ? actor.siteIds : ['00000000-0000-0000-0000-000000000000'])))
  if (!found) throw codedError(404, 'no_such_follow_up', 'No such follow-up.')
  if (found.ownerUserId !== actor.user.id) requireActorCan(actor, 'followup.close', found.siteId)
  return closeFollowUp(actor, found, body.note)
})

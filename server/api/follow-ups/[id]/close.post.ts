import { followUpCloseSchema } from '#shared/utils/area-checklists'

// Close a follow-up with what was done: its owner, or a lead.
export default defineEventHandler(async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, followUpCloseSchema)
  const actor = await requireActor(event)
  const f = tables.followUps
  const [found] = await useDb().select().from(f).where(and(eq(f.id, id), inArray(f.siteId, actor.siteIds.length ? actor.siteIds : ['00000000-0000-0000-0000-000000000000'])))
  if (!found) throw createError({ statusCode: 404, message: 'No such follow-up.' })
  if (found.ownerUserId !== actor.user.id && !hasRole(actor, found.siteId, LEAD_ROLES)) throw createError({ statusCode: 403, message: 'Its owner or a lead closes a follow-up.' })
  return closeFollowUp(actor, found, body.note)
})

import { customScheduleUpdateSchema } from '#shared/utils/schedule-schemas'

// A lead changes or pauses (active: false) a schedule a lead added.
export default defineEventHandler(async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, customScheduleUpdateSchema)
  const actor = await requireSiteRole(event, body.siteId, SCHEDULE_EDIT_ROLES)
  return updateCustomSchedule(actor, id, body)
})

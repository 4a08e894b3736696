import { customScheduleUpdateSchema } from '#shared/utils/schedule-schemas'

// A lead changes or pauses (active: false) a schedule a lead added.
export default defineAbilityHandler('schedule.edit', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, customScheduleUpdateSchema)
  const actor = await requireAbility(event, 'schedule.edit', body.siteId)
  return updateCustomSchedule(actor, id, body)
})

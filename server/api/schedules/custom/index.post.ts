import { scheduleCreateSchema } from '#shared/utils/schedule-schemas'

// A lead adds a schedule of their own (yearly extinguisher maintenance, charger service every N months …).
export default defineAbilityHandler('schedule.edit', async (event) => {
  const body = await validateBody(event, scheduleCreateSchema)
  const actor = await requireAbility(event, 'schedule.edit', body.siteId)
  const result = await createCustomSchedule(actor, body)
  setResponseStatus(event, 201)
  return result
})

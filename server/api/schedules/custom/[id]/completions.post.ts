import { completionSchema } from '#shared/utils/schedule-schemas'

// "Record it done" for a lead-added schedule: the day, a note, an optional certificate, a truck's hour meter.
export default defineAbilityHandler('schedule.complete', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, completionSchema)
  const actor = await requireActor(event)
  const schedule = await findCustomSchedule(actor, id)
  await requireAbility(event, 'schedule.complete', schedule.siteId)
  const result = await recordCompletion(actor, schedule, body)
  setResponseStatus(event, result.replayed ? 200 : 201)
  return result
})

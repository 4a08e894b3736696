import { logEntriesSchema } from '#shared/utils/area-checklists'

// Technicians (and leads) fill in an area's checklist; a signed log answers 409.
export default defineAbilityHandler('log.record', async (event): Promise<LogEntriesAnswer> => {
  const body = await validateBody(event, logEntriesSchema)
  const actor = await requireAbility(event, 'log.record', body.siteId)
  const site = await loadDueSite(useDb(), body.siteId)
  let result: Awaited<ReturnType<typeof recordLogEntries>>
  try {
    result = await recordLogEntries(actor, body, site.today)
  }
  catch (error) {
    // the same idempotency key sent twice at once: the first one stored it
    if (body.idempotencyKey && isUniqueViolation(error)) result = await recordLogEntries(actor, body, site.today)
    else throw error
  }
  setResponseStatus(event, result.replayed ? 200 : 201)
  return result
})

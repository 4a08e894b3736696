import { inspectionBodySchema } from '#shared/utils/truck-inspection'
import type { InspectionRecorded } from '#shared/types/inspection'

// Record a truck's pre-shift inspection (anyone at the site; an operator's class authorisation is
// checked per the site's policy). Stored once per idempotency key: 201, a repeat 200.
export default defineAbilityHandler('inspection.record', async (event): Promise<InspectionRecorded> => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, inspectionBodySchema)
  const { actor, row } = await findAssetForActor(event, 'truck', id)
  requireActorCan(actor, 'inspection.record', row.siteId)
  const truck = row as typeof tables.trucks.$inferSelect
  let result: Awaited<ReturnType<typeof recordInspection>>
  try {
    result = await recordInspection(actor, truck, body)
  }
  catch (error) {
    // the same key sent twice at once: the first one stored it
    if (isUniqueViolation(error)) result = await recordInspection(actor, truck, body)
    else throw error
  }
  if (!result.repeated) deliverMailSoon()
  setResponseStatus(event, result.repeated ? 200 : 201)
  return result
})

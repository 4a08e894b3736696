import { refillSchema } from '#shared/utils/fuel-schemas'

// Record a refill by weight (technicians and leads with a current LP-gas transfer qualification).
// Filled: 201. Refused, and stored as refused: 409 when the cylinder's state forbids filling,
// 422 when this fill failed its checks (inspection, overfill, tare loss), with data.reasons.
export default defineAbilityHandler('refill.record', async (event): Promise<RefillAnswer> => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, refillSchema)
  const { actor, row } = await findAssetForActor(event, 'cylinder', id)
  requireActorCan(actor, 'refill.record', row.siteId)
  const facts = await fuelSiteFacts(useDb(), row.siteId)
  const refusal = lpTransferReason(await lpTransferStanding(useDb(), actor.user.id, facts.today))
  if (refusal) throw createError({ statusCode: 403, message: refusal.message, data: { reasons: [refusal] } })
  let outcome: RefillOutcome
  try {
    outcome = await recordRefill(actor, id, body)
  }
  catch (error) {
    // the same idempotency key sent twice at once: the first one stored it
    if (body.idempotencyKey && isUniqueViolation(error)) outcome = await recordRefill(actor, id, body)
    else throw error
  }
  if (outcome.status === 409 || outcome.status === 422) {
    deliverMailSoon()
    throw createError({
      statusCode: outcome.status,
      message: outcome.reasons[0]?.message ?? 'Refill refused.',
      data: { reasons: outcome.reasons, refillId: outcome.refill.id, offerQuarantine: outcome.offerQuarantine },
    })
  }
  setResponseStatus(event, outcome.status)
  return { item: outcome.refill, cylinder: outcome.cylinder, repeated: outcome.status === 200 }
})

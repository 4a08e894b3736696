import type { EngineFuel } from '#shared/utils/emissions'
import { emissionsTestSchema } from '#shared/utils/fuel-schemas'

// Record a yearly tailpipe test of a combustion truck (facilities leads and admins): pass or fail
// against the site's policy, the next date one interval on, or the retest date after a fail.
export default defineAbilityHandler('emissions.record', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, emissionsTestSchema)
  const { actor, truck } = await requireCombustionTruck(event, id)
  requireActorCan(actor, 'emissions.record', truck.siteId)
  if (!isCombustionPower(truck.power)) {
    throw createError({ statusCode: 409, message: `Truck ${truck.fleetNumber} is electric; it has no tailpipe to test.`, data: { reasons: ['Not a combustion truck.'] } })
  }
  const db = useDb()
  const facts = await fuelSiteFacts(db, truck.siteId)
  if (body.testedOn > facts.today) throw createError({ statusCode: 400, message: 'The test date is in the future.', data: { fields: { testedOn: 'Not after today.' } } })
  if (body.certificateUploadId) {
    const [upload] = await db.select({ id: tables.uploads.id }).from(tables.uploads)
      .where(and(eq(tables.uploads.id, body.certificateUploadId), eq(tables.uploads.siteId, truck.siteId)))
    if (!upload) throw createError({ statusCode: 400, message: 'Upload the certificate again.', data: { fields: { certificateUploadId: 'No such file at this site.' } } })
  }
  const policy = emissionsPolicyFromSettings(facts.settings)
  const verdict = assessEmissionsTest({
    fuel: truck.power as EngineFuel, coIdlePercent: body.coIdlePct, coHighIdlePercent: body.coHighIdlePct,
    hcPpm: body.hcPpm, co2Percent: body.co2Pct, o2Percent: body.o2Pct,
  }, policy)
  const nextDueOn = nextEmissionsDue(body.testedOn, verdict.pass, policy)
  const result = await db.transaction(async (tx) => {
    const [item] = await tx.insert(tables.emissionsTests).values({
      ...body, siteId: truck.siteId, userId: actor.user.id, truckId: truck.id, passed: verdict.pass, reasons: verdict.reasons, nextDueOn,
    }).returning()
    await writeAudit(tx, { actor, siteId: truck.siteId, action: verdict.pass ? 'emissions_passed' : 'emissions_failed', entity: 'emissions_test', entityId: item!.id, after: item })
    if (!verdict.pass) {
      await notifyFailedEmissionsTest(tx, { siteId: truck.siteId, truckId: truck.id, fleetNumber: truck.fleetNumber, testedOn: body.testedOn, reasons: verdict.reasons, retestBy: nextDueOn })
    }
    setResponseStatus(event, 201)
    return { item, verdict, policy, source: EMISSIONS_POLICY_SOURCE }
  })
  if (!verdict.pass) deliverMailSoon()
  return result
})

import type { ReasonParams } from '#shared/utils/battery-fit'
import type { EngineFuel } from '#shared/utils/emissions'
import type {
  CoReadingCorrection, EmissionsCorrection, ExchangeCorrection, RefillCorrection, RequalificationCorrection,
} from '#shared/utils/correction-schemas'
import type { Actor } from '../auth'
import type { CorrectionKindSpec } from '../corrections'

type WithId<T> = T & { id: string }
const fail = (statusCode: number, code: string, message: string, field?: string, params?: ReasonParams) => codedError(statusCode, code, message, { params, fields: field ? [field] : [] })

const refillSpec: CorrectionKindSpec<typeof tables.cylinderRefills.$inferSelect> = {
  kind: 'cylinder-refill', table: tables.cylinderRefills, subjects: r => [{ kind: 'cylinder', id: r.cylinderId }],
}

// A refill's weights corrected: the net added, the fill limit, gallons and the tare flag are worked out
// again. A correction does not turn a fill into a refusal or back: those are new records. Whoever corrects
// the figures of a fill needs a current LP-gas transfer qualification, as whoever records one does.
export async function correctRefill(actor: Actor, input: WithId<RefillCorrection>) {
  return correctRecord(actor, refillSpec, input.id, input, async (tx, original) => {
    const refusal = lpTransferReason(await lpTransferStanding(tx, actor.user.id, (await fuelSiteFacts(tx, original.siteId)).today))
    if (refusal) throw createError({ statusCode: 403, message: refusal.message, data: { reasons: [refusal] } })
    if (original.refused) throw fail(409, 'refused_refill_kept', 'A refused refill stays as recorded: nothing went into the cylinder. Record a new refill if it was filled.')
    if (input.grossBeforeLb === null || input.grossAfterLb === null) throw fail(400, 'weigh_before_after', 'Weigh the cylinder before and after filling.', input.grossBeforeLb === null ? 'grossBeforeLb' : 'grossAfterLb')
    const [cylinder] = await tx.select().from(tables.lpCylinders).where(eq(tables.lpCylinders.id, original.cylinderId))
    const sg = input.productSg ?? original.productSg ?? PROPANE_DEFAULT_SG
    const fill = assessFill({ waterCapacityLb: cylinder!.waterCapacityLb, tareLb: cylinder!.tareLb, grossBeforeLb: input.grossBeforeLb, grossAfterLb: input.grossAfterLb, sg })
    if (!fill.ok) throw fillInputError(fill.errors)
    const tareFlagged = input.measuredTareLb !== null && input.measuredTareLb > 0 && tareLossFlagsRequalification(cylinder!.tareLb, input.measuredTareLb)
    if (fill.overfilled || tareFlagged) {
      const variant = fill.overfilled ? 'overfilled' : 'tare_loss'
      throw fail(409, 'correction_fails_fill', `These figures fail the fill's checks (${fill.overfilled ? 'overfilled' : 'tare loss'}). A correction does not turn a fill into a refusal: quarantine the cylinder and record what was done.`, undefined, { variant })
    }
    return {
      values: {
        cylinderId: original.cylinderId, inspection: original.inspection, refused: false, refusalReasons: [],
        grossBeforeLb: input.grossBeforeLb, grossAfterLb: input.grossAfterLb, measuredTareLb: input.measuredTareLb, productSg: sg,
        netAddedLb: fill.netAddedLb, fillLimitLb: fill.fillLimitLb, overfilled: false, gallonsAt60F: fill.gallonsAt60F, tareFlagged: false,
        // a corrected weight keeps the price of the day the cylinder was filled
        pricePerGal: original.pricePerGal,
      },
    }
  })
}

const exchangeSpec: CorrectionKindSpec<typeof tables.cylinderExchanges.$inferSelect> = {
  kind: 'cylinder-exchange', table: tables.cylinderExchanges,
  subjects: e => [{ kind: 'truck', id: e.truckId }, { kind: 'cylinder', id: e.cylinderOnId }, ...(e.cylinderOffId ? [{ kind: 'cylinder' as const, id: e.cylinderOffId }] : [])],
}

// A cylinder change corrected: the hour meter, or the cylinder that went on. Another cylinder only on the
// truck's latest change (where each cylinder is now follows from it): the one named by mistake goes back
// to the cage full, the right one is on the truck.
export async function correctCylinderExchange(actor: Actor, input: WithId<ExchangeCorrection>) {
  return correctRecord(actor, exchangeSpec, input.id, input, async (tx, original) => {
    if (input.hourMeter !== null) await hourMeterInOrder(tx, original.truckId, original.id, original.at, input.hourMeter)
    if (input.cylinderOnId === original.cylinderOnId) return { values: { truckId: original.truckId, cylinderOffId: original.cylinderOffId, cylinderOnId: original.cylinderOnId, hourMeter: input.hourMeter } }
    const x = tables.cylinderExchanges
    const [latest] = await tx.select({ id: x.id }).from(x)
      .where(and(eq(x.truckId, original.truckId), sql`${isEffectiveRecord('cylinder_exchanges', 'cylinder_exchanges')}`))
      .orderBy(desc(x.at), desc(x.recordedAt)).limit(1)
    if (latest?.id !== original.id) throw fail(409, 'exchange_not_latest', 'Only the truck\'s latest cylinder change can name another cylinder; later changes were made from it.', 'cylinderOnId')
    const ids = [original.cylinderOnId, input.cylinderOnId].sort()
    const locked = await tx.select().from(tables.lpCylinders).where(and(inArray(tables.lpCylinders.id, ids), eq(tables.lpCylinders.siteId, original.siteId))).orderBy(asc(tables.lpCylinders.id)).for('update')
    const right = locked.find(c => c.id === input.cylinderOnId)
    if (!right) throw fail(400, 'exchange_pick_cylinder', 'Pick a cylinder at this site.', 'cylinderOnId')
    if (right.id === original.cylinderOffId) throw fail(400, 'exchange_cylinder_came_off', 'That is the cylinder that came off.', 'cylinderOnId')
    const reasons = cylinderMountBlocks(right, await fuelSiteFacts(tx, original.siteId), (await liveCylinderTag(tx, right.id)) ?? right.serial)
    if (reasons.length) throw createError({ statusCode: 409, message: reasons[0]!.message, data: { reasons } })
    const now = new Date()
    return {
      values: { truckId: original.truckId, cylinderOffId: original.cylinderOffId, cylinderOnId: right.id, hourMeter: input.hourMeter },
      after: async () => {
        await tx.update(tables.lpCylinders).set({ status: 'full', currentTruckId: null, statusChangedAt: now }).where(eq(tables.lpCylinders.id, original.cylinderOnId))
        await tx.update(tables.lpCylinders).set({ status: 'in_use', currentTruckId: original.truckId, statusChangedAt: now }).where(eq(tables.lpCylinders.id, right.id))
      },
    }
  })
}

const requalSpec: CorrectionKindSpec<typeof tables.requalifications.$inferSelect> = {
  kind: 'requalification', table: tables.requalifications, subjects: q => [{ kind: 'cylinder', id: q.cylinderId }],
}

// A requalification's method or marking corrected (the next date follows the method). Pass or fail is
// not corrected: a lead returns a condemned cylinder to use, with the reason.
export async function correctRequalification(actor: Actor, input: WithId<RequalificationCorrection>) {
  return correctRecord(actor, requalSpec, input.id, input, async (tx, original) => {
    if (input.passed !== undefined && input.passed !== original.passed) {
      throw fail(409, 'requal_result_kept', original.passed
        ? 'Pass or fail of a requalification is not corrected. To condemn the cylinder, record a new requalification.'
        : 'Pass or fail of a requalification is not corrected. A lead returns a condemned cylinder to use (Return to use, with the reason).', 'passed', original.passed ? undefined : { variant: 'failed' })
    }
    const suffix = REQUALIFICATION_MARK_SUFFIX[input.method]
    const marking = input.marking || `${original.performedOn.slice(5, 7)}-${original.performedOn.slice(2, 4)}${suffix ? ` ${suffix}` : ''}`
    if (suffix && !new RegExp(`\\b${suffix}\\b`).test(marking)) throw fail(400, 'requal_marking_suffix', `An ${REQUALIFICATION_METHOD_LABELS[input.method].toLowerCase()} is marked with "${suffix}" after the date.`, 'marking', { suffix })
    const facts = await fuelSiteFacts(tx, original.siteId)
    const nextDueOn = original.passed ? nextRequalificationDue(original.performedOn, input.method, requalificationYearsFromSettings(facts.settings)) : null
    return {
      values: { cylinderId: original.cylinderId, performedOn: original.performedOn, method: input.method, marking, passed: original.passed, nextDueOn },
      after: async () => {
        if (!original.passed) return
        await tx.update(tables.lpCylinders).set({ lastRequalificationMethod: input.method })
          .where(and(eq(tables.lpCylinders.id, original.cylinderId), eq(tables.lpCylinders.lastRequalifiedOn, original.performedOn)))
      },
    }
  })
}

const emissionsSpec: CorrectionKindSpec<typeof tables.emissionsTests.$inferSelect> = {
  kind: 'emissions-test', table: tables.emissionsTests, subjects: e => [{ kind: 'truck', id: e.truckId }],
}

// An emissions test's figures corrected: pass or fail and the next test date follow from them again. A
// pass corrected to a fail sends the failure notice a failed test sends.
export async function correctEmissionsTest(actor: Actor, input: WithId<EmissionsCorrection>) {
  let noticeQueued = false
  const result = await correctRecord(actor, emissionsSpec, input.id, input, async (tx, original) => {
    const [truck] = await tx.select().from(tables.trucks).where(eq(tables.trucks.id, original.truckId))
    const facts = await fuelSiteFacts(tx, original.siteId)
    if (input.certificateUploadId) {
      const [upload] = await tx.select({ id: tables.uploads.id }).from(tables.uploads).where(and(eq(tables.uploads.id, input.certificateUploadId), eq(tables.uploads.siteId, original.siteId)))
      if (!upload) throw fail(400, 'certificate_missing', 'Upload the certificate again.', 'certificateUploadId')
    }
    const verdict = assessEmissionsTest({
      fuel: truck!.power as EngineFuel, coIdlePercent: input.coIdlePct, coHighIdlePercent: input.coHighIdlePct,
      hcPpm: input.hcPpm, co2Percent: input.co2Pct, o2Percent: input.o2Pct,
    }, emissionsPolicyFromSettings(facts.settings))
    const schedule = (await loadSiteSchedules(tx, original.siteId)).find(s => s.kind === 'emissions_test')!
    const nextDueOn = emissionsNextDue(original.testedOn, verdict.pass, schedule)
    return {
      values: {
        truckId: original.truckId, testedOn: original.testedOn, testerName: input.testerName, coIdlePct: input.coIdlePct, coHighIdlePct: input.coHighIdlePct,
        hcPpm: input.hcPpm, co2Pct: input.co2Pct, o2Pct: input.o2Pct, idleRpm: input.idleRpm, highIdleRpm: input.highIdleRpm,
        certificateUploadId: input.certificateUploadId, passed: verdict.pass, reasons: verdict.reasons, nextDueOn,
      },
      after: async () => {
        if (verdict.pass || !original.passed) return
        await notifyFailedEmissionsTest(tx, { siteId: original.siteId, truckId: original.truckId, fleetNumber: truck!.fleetNumber, testedOn: original.testedOn, reasons: verdict.findings, retestBy: nextDueOn })
        noticeQueued = true
      },
    }
  })
  if (noticeQueued) deliverMailSoon()
  return result
}

const coSpec: CorrectionKindSpec<typeof tables.coReadings.$inferSelect> = {
  kind: 'co-reading', table: tables.coReadings, subjects: r => [{ kind: 'area', id: r.areaId }],
}

// One indoor CO reading corrected; the day's 8-hour average and the area's monitoring follow.
export async function correctCoReading(actor: Actor, input: WithId<CoReadingCorrection>) {
  return correctRecord(actor, coSpec, input.id, input, async (_tx, original) => ({
    values: { areaId: original.areaId, takenOn: original.takenOn, ppm: input.ppm, durationHours: input.durationHours },
  }))
}

import type { FitReason } from '#shared/utils/battery-fit'
import type { RefillInput } from '#shared/utils/fuel-schemas'
import type { FillInputError } from '#shared/utils/lp-gas'
import type { DbOrTx } from '../db'
import type { Actor } from '../auth'

// Reasons the cylinder's own state forbids a fill (answered 409): condemned, quarantined, out of
// service, on a truck, or past its requalification date.
export async function cylinderFillBlocks(db: DbOrTx, cylinder: FuelCylinderRow, facts: FuelSiteFacts): Promise<FitReason[]> {
  const [truck] = cylinder.status === 'in_use' && cylinder.currentTruckId
    ? await db.select({ fleetNumber: tables.trucks.fleetNumber }).from(tables.trucks).where(eq(tables.trucks.id, cylinder.currentTruckId))
    : []
  return fillStateReasons(cylinder, cylinderRequalification(cylinder, facts), truck?.fleetNumber ?? null)
}

// Weights a fill cannot have, as a 400: each field's own words, and the first problem's code
// (refusal.fill_<problem>, the weight after filling below the tare as its `after` variant).
export function fillInputError(errors: FillInputError[]) {
  const coded = (e: FillInputError) => ({ code: `fill_${e.problem}`, ...(e.problem === 'gross_below_tare' && e.field === 'grossAfterLb' ? { params: { variant: 'after' } } : {}) })
  const field = (e: FillInputError) => (e.field === 'sg' ? 'productSg' : e.field)
  const first = coded(errors[0]!)
  return codedError(400, first.code, errors[0]!.message, {
    params: first.params, fields: Object.fromEntries(errors.map(e => [field(e), e.message])), fieldCodes: Object.fromEntries(errors.map(e => [field(e), coded(e)])),
  })
}

export interface RefillOutcome {
  refill: typeof tables.cylinderRefills.$inferSelect
  cylinder: FuelCylinderRow
  /** 409: the cylinder's state forbids filling; 422: this fill failed its checks; 201: filled */
  status: 201 | 409 | 422 | 200
  reasons: FitReason[]
  /** the technician should be offered to quarantine the cylinder */
  offerQuarantine: boolean
}

function inspectionFailures(inspection: RefillInput['inspection']) {
  return PREFILL_INSPECTION_ITEMS.filter(i => inspection[i.key] === 'fail')
}

// One refill attempt, stored whether it passes or not. A refused attempt leaves the cylinder's status
// as it was; a passed one makes it full. The cylinder row is locked for the whole check.
export async function recordRefill(actor: Actor, cylinderId: string, input: RefillInput): Promise<RefillOutcome> {
  const db = useDb()
  return db.transaction(async (tx) => {
    const [cylinder] = await tx.select().from(tables.lpCylinders).where(eq(tables.lpCylinders.id, cylinderId)).for('update')
    if (!cylinder) throw codedError(404, 'no_such_cylinder', 'No such LP cylinder.')
    if (input.idempotencyKey) {
      const [earlier] = await tx.select().from(tables.cylinderRefills).where(eq(tables.cylinderRefills.idempotencyKey, input.idempotencyKey))
      if (earlier) {
        if (earlier.cylinderId !== cylinderId || earlier.userId !== actor.user.id) throw codedError(409, 'retry_key_taken', 'That idempotency key was used for another record.')
        return { refill: earlier, cylinder, status: 200 as const, reasons: storedRefusals(earlier), offerQuarantine: false }
      }
    }
    const at = eventTime(input.at, 'at')
    const facts = await fuelSiteFacts(tx, cylinder.siteId)
    const stateReasons = await cylinderFillBlocks(tx, cylinder, facts)
    const failed = inspectionFailures(input.inspection)
    const checkReasons: FitReason[] = []
    if (failed.length) checkReasons.push(prefillFailedReason(failed.map(i => i.key), failed.map(i => i.label)))

    const sg = input.productSg ?? PROPANE_DEFAULT_SG
    let fill: FillAssessment | null = null
    if (input.grossBeforeLb !== null && input.grossAfterLb !== null) {
      const assessed = assessFill({ waterCapacityLb: cylinder.waterCapacityLb, tareLb: cylinder.tareLb, grossBeforeLb: input.grossBeforeLb, grossAfterLb: input.grossAfterLb, sg })
      if (!assessed.ok) {
        throw fillInputError(assessed.errors)
      }
      fill = assessed
      if (assessed.overfilled) {
        checkReasons.push(overfillReason(assessed.overfillLb, assessed.fillLimitLb, cylinder.waterCapacityLb, maxFillingDensityPercent(sg)))
      }
    }
    let tareFlagged = false
    if (input.measuredTareLb !== null) {
      if (input.measuredTareLb <= 0) throw createError({ statusCode: 400, message: 'Measured tare must be above 0.', data: { code: 'tare_not_positive', fields: { measuredTareLb: 'Above 0.' } } })
      tareFlagged = tareLossFlagsRequalification(cylinder.tareLb, input.measuredTareLb)
      if (tareFlagged) {
        checkReasons.push(tareLossReason(input.measuredTareLb, cylinder.tareLb, TARE_LOSS_REQUALIFICATION_PERCENT))
      }
    }
    const reasons = [...stateReasons, ...checkReasons]
    const refused = reasons.length > 0
    const [refill] = await tx.insert(tables.cylinderRefills).values({
      siteId: cylinder.siteId,
      userId: actor.user.id,
      cylinderId,
      at,
      idempotencyKey: input.idempotencyKey ?? null,
      note: input.note,
      inspection: input.inspection,
      refused,
      refusalReasons: reasons.map(r => r.message),
      refusalWords: reasons.map(r => (r.params ? { code: r.code, params: r.params } : { code: r.code })),
      grossBeforeLb: input.grossBeforeLb,
      grossAfterLb: input.grossAfterLb,
      measuredTareLb: input.measuredTareLb,
      productSg: sg,
      netAddedLb: fill?.netAddedLb ?? null,
      fillLimitLb: fill?.fillLimitLb ?? fillLimitLb(cylinder.waterCapacityLb, sg),
      overfilled: fill?.overfilled ?? false,
      gallonsAt60F: fill?.gallonsAt60F ?? null,
      // the price of the day, so the propane report costs this refill as it was bought
      pricePerGal: facts.settings.propanePerGal > 0 ? facts.settings.propanePerGal : null,
      tareFlagged,
    }).returning()
    let after = cylinder
    if (!refused) {
      const [updated] = await tx.update(tables.lpCylinders).set({ status: 'full', statusChangedAt: new Date() })
        .where(eq(tables.lpCylinders.id, cylinderId)).returning()
      after = updated!
    }
    await writeAudit(tx, {
      actor, siteId: cylinder.siteId, action: refused ? 'refill_refused' : 'refill', entity: 'cylinder_refill', entityId: refill!.id,
      after: refill, note: refused ? reasons.map(r => r.message).join(' ') : undefined,
    })
    // the safety leads hear of a refused cylinder at once (queued with the record, sent after the answer)
    if (refused) {
      const [tag] = await tx.select({ code: tables.tags.code }).from(tables.tags)
        .where(and(eq(tables.tags.assetKind, 'cylinder'), eq(tables.tags.assetId, cylinderId), isNull(tables.tags.retiredAt)))
      await notifyRefusedCylinder(tx, { siteId: cylinder.siteId, cylinderId, code: tag?.code ?? cylinder.serial, reasons, by: actor.user.name })
    }
    await recomputeSubjects(tx, cylinder.siteId, [{ kind: 'cylinder', id: cylinderId }], { lock: false })
    return {
      refill: refill!,
      cylinder: after,
      status: refused ? (stateReasons.length ? 409 : 422) : 201,
      reasons,
      offerQuarantine: refused && (failed.length > 0 || tareFlagged) && cylinder.status !== 'condemned' && cylinder.status !== 'quarantined',
    }
  })
}

/** A stored refusal's reasons as the screen takes them: coded where the codes were kept, else the English as stored. */
export function storedRefusals(r: { refusalReasons: string[], refusalWords: { code: string, params?: FitReason['params'] }[] | null }): FitReason[] {
  return r.refusalReasons.map((message, i) => {
    const w = r.refusalWords?.[i]
    return w ? { ...w, message } : { code: 'refill_refused', message }
  })
}

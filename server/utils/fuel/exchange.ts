import type { FitReason } from '#shared/utils/battery-fit'
import type { Actor } from '../auth'

// Why a cylinder may not go on a truck; empty when it may.
export function cylinderMountBlocks(cylinder: FuelCylinderRow, facts: FuelSiteFacts, code: string): FitReason[] {
  return mountReasons(cylinder, cylinderRequalification(cylinder, facts), code)
}

interface ExchangeRequest {
  truck: FuelTruckRow
  cylinderOnId: string
  cylinderOffId: string | null
  /** when Save was pressed, for a record sent late */
  at?: string
  idempotencyKey?: string
  note: string
  /** the truck's hour meter at the change, when read */
  hourMeter: number | null
}

// A cylinder change on an LP-gas truck in one transaction: the truck and both cylinders are locked,
// the one coming off goes to the cage as empty, the one going on is in use on the truck. The hour meter
// read at the change moves the truck's hours (and its hours-based schedules) like a swap's.
export async function recordExchange(actor: Actor, req: ExchangeRequest) {
  const { truck } = req
  return useDb().transaction(async (tx) => {
    // the truck lock first, so a copy of the same request sent at once finds the first one's row
    await tx.select({ id: tables.trucks.id }).from(tables.trucks).where(eq(tables.trucks.id, truck.id)).for('update')
    if (req.idempotencyKey) {
      const [earlier] = await tx.select().from(tables.cylinderExchanges).where(eq(tables.cylinderExchanges.idempotencyKey, req.idempotencyKey))
      if (earlier) {
        if (earlier.truckId !== truck.id || earlier.userId !== actor.user.id) throw codedError(409, 'retry_key_taken', 'That idempotency key was used for another record.')
        return { exchange: earlier, repeated: true }
      }
    }
    const at = eventTime(req.at, 'at')
    // a truck that failed a critical item of its pre-shift check stays out of service (29 CFR 1910.178(q)(7))
    const [held] = await tx.select({ reason: tables.truckStatus.holdReason }).from(tables.truckStatus).where(eq(tables.truckStatus.truckId, truck.id))
    if (held?.reason) {
      const message = holdRefusal(truck.fleetNumber, held.reason)
      throw createError({ statusCode: 409, message, data: { reasons: [{ code: 'inspection_hold', message, params: { truck: truck.fleetNumber, reason: held.reason } }], code: 'inspection_hold' } })
    }
    const authorisation = await checkTruckAuthorisation(tx, actor, truck)
    const ids = [...new Set([req.cylinderOnId, req.cylinderOffId].filter((v): v is string => !!v))].sort()
    const locked = await tx.select().from(tables.lpCylinders)
      .where(and(inArray(tables.lpCylinders.id, ids), eq(tables.lpCylinders.siteId, truck.siteId)))
      .orderBy(asc(tables.lpCylinders.id)).for('update')
    const [current] = await tx.select().from(tables.lpCylinders).where(eq(tables.lpCylinders.currentTruckId, truck.id)).for('update')
    const on = locked.find(c => c.id === req.cylinderOnId)
    if (!on) throw createError({ statusCode: 400, message: 'Pick a cylinder at this site.', data: { code: 'exchange_pick_cylinder', fields: { cylinderOnCode: 'No such cylinder at this site.' } } })
    if ((current?.id ?? null) !== req.cylinderOffId) {
      const currentCode = current ? (await liveCylinderTag(tx, current.id)) ?? current.serial : null
      throw createError({
        statusCode: 409,
        message: current ? `Truck ${truck.fleetNumber} carries cylinder ${currentCode}; take that one off.` : `Truck ${truck.fleetNumber} has no cylinder on record; there is none to take off.`,
        data: {
          reasons: [current
            ? { code: 'exchange_off_mismatch', message: `Truck ${truck.fleetNumber} carries cylinder ${currentCode}; take that one off.`, params: { truck: truck.fleetNumber, cylinder: currentCode! } }
            : { code: 'exchange_off_none', message: `Truck ${truck.fleetNumber} has no cylinder on record; there is none to take off.`, params: { truck: truck.fleetNumber } }],
          currentCylinderId: current?.id ?? null,
        },
      })
    }
    if (on.id === current?.id) throw createError({ statusCode: 400, message: 'The cylinder going on is the one already on the truck.', data: { code: 'exchange_same_cylinder', fields: { cylinderOnCode: 'Already on this truck.' } } })
    if (req.hourMeter !== null) {
      const [now] = await tx.select({ hourMeter: tables.truckStatus.hourMeter }).from(tables.truckStatus).where(eq(tables.truckStatus.truckId, truck.id))
      const meter = now?.hourMeter ?? truck.hourMeter
      if (req.hourMeter < meter) throw createError({ statusCode: 400, message: `The hour meter last read ${meter} h; check the reading.`, data: { code: 'hour_meter_back', params: { meter }, fields: { hourMeter: `The hour meter last read ${meter} h; check the reading.` } } })
    }
    const facts = await fuelSiteFacts(tx, truck.siteId)
    const onCode = (await liveCylinderTag(tx, on.id)) ?? on.serial
    const reasons = cylinderMountBlocks(on, facts, onCode)
    if (reasons.length) throw createError({ statusCode: 409, message: reasons[0]!.message, data: { reasons } })
    const now = new Date()
    if (current) {
      await tx.update(tables.lpCylinders).set({ status: 'empty', currentTruckId: null, statusChangedAt: now }).where(eq(tables.lpCylinders.id, current.id))
    }
    await tx.update(tables.lpCylinders).set({ status: 'in_use', currentTruckId: truck.id, statusChangedAt: now }).where(eq(tables.lpCylinders.id, on.id))
    const [exchange] = await tx.insert(tables.cylinderExchanges).values({
      siteId: truck.siteId, userId: actor.user.id, at, truckId: truck.id, cylinderOffId: current?.id ?? null, cylinderOnId: on.id,
      idempotencyKey: req.idempotencyKey ?? null, note: req.note, hourMeter: req.hourMeter,
    }).returning()
    await writeAudit(tx, { actor, siteId: truck.siteId, action: 'exchange', entity: 'cylinder_exchange', entityId: exchange!.id, after: exchange, note: authorisation?.message })
    await recomputeSubjects(tx, truck.siteId, [
      { kind: 'truck', id: truck.id }, { kind: 'cylinder', id: on.id }, ...(current ? [{ kind: 'cylinder' as const, id: current.id }] : []),
    ], { lock: false })
    return { exchange: exchange!, repeated: false, authorisation }
  })
}

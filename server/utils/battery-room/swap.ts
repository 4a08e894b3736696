import { randomUUID } from 'node:crypto'
import type { z } from 'zod'
import type { FitReason } from '#shared/utils/battery-fit'
import { batteryTruckFit } from '#shared/utils/battery-fit'
import { OVERRIDE_REASON_MIN_LENGTH, type swapBodySchema } from '#shared/utils/battery-room-schemas'
import type { DbOrTx } from '../db'
import type { Actor } from '../auth'
import type { SubjectRef } from '../due/rules'
import { uuidArray } from '../due/effective'

export type SwapInput = z.output<typeof swapBodySchema>

/** Whether the person holds a battery-changing qualification current on the day of `at` where the truck is. */
async function holdsBatteryChangingQualification(db: DbOrTx, userId: string, at: Date, truckId: string): Promise<boolean> {
  const rows = await db.execute(sql`
    SELECT 1 FROM qualifications
    WHERE user_id = ${userId} AND kind = 'battery_changing'
      AND expires_on >= (${at.toISOString()}::timestamptz AT TIME ZONE (
        SELECT s.time_zone FROM trucks t JOIN sites s ON s.id = t.site_id WHERE t.id = ${truckId}))::date
    LIMIT 1`)
  return (rows as unknown[]).length > 0
}

async function storedSwap(db: DbOrTx, key: string, actor: Actor) {
  const [row] = await db.select().from(tables.batterySwaps).where(eq(tables.batterySwaps.idempotencyKey, key))
  return ownRecord(row, actor)
}

// A battery swap: one transaction that locks the truck and the batteries, checks fit, readiness, place
// and qualification, records the swap, then recomputes both batteries' status and the truck's (where
// each battery is comes from the swap records, so the record is all the swap writes itself). Statements
// that do not need each other's answers go together (postgres.js pipelines them on the transaction's
// connection, and PostgreSQL runs them in order): the actor, BEGIN, the locked reads, the record with
// its audit row and the facts, the read models, COMMIT.
export async function recordBatterySwap(actor: Actor, body: SwapInput) {
  if (actor.siteIds.length === 0) throw codedError(404, 'no_such_truck', 'No such truck.')
  // a late copy of a stored swap is answered with the record however old it is, so the time is checked after the replay
  let at = new Date()
  let atError: unknown
  try {
    at = eventTime(body.at, 'at')
  }
  catch (error) {
    atError = error
  }
  const t = tables.batteries
  const bs = tables.batteryStatus
  try {
    return await useDb().transaction(async (tx) => {
      // the truck, then both batteries and whichever battery the truck holds now (in id order), all locked
      const ids = [body.batteryInId, ...(body.batteryOutId ? [body.batteryOutId] : [])].sort()
      // (each statement starts after the one before has its locks, so the places read after the battery
      // locks are those the last swap of these batteries committed)
      // (one IN over a union, not an OR of two: the planner then reads the battery ids by index, not every battery of the sites)
      const lockIds = sql`${t.id} IN (SELECT x FROM unnest(${uuidArray(ids)}) x UNION ALL SELECT ${bs.batteryId} FROM ${bs} WHERE ${bs.truckId} = ${body.truckId})`
      // every statement of a swap reads or writes a few rows by id: one generic plan each (see computeReadModels).
      // Sent before the array below is built: two of its look-ups are async functions that send their
      // statement as soon as they are called, and planned without it they were planned anew at every swap.
      const generic = tx.execute(sql`SET LOCAL plan_cache_mode = force_generic_plan`).then(() => undefined)
      const [, [truck], lockedRows, places, [stored], rowsIn, qualified, [truckNow]] = await Promise.all([
        generic,
        tx.select().from(tables.trucks)
          .where(and(eq(tables.trucks.id, body.truckId), inArray(tables.trucks.siteId, actor.siteIds))).for('update'),
        tx.select({ id: t.id, siteId: t.siteId, serial: t.serial }).from(t)
          .where(and(inArray(t.siteId, actor.siteIds), lockIds)).orderBy(asc(t.id)).for('update'),
        tx.select({ batteryId: bs.batteryId, truckId: bs.truckId }).from(bs).where(or(inArray(bs.batteryId, ids), eq(bs.truckId, body.truckId))),
        tx.select().from(tables.batterySwaps).where(eq(tables.batterySwaps.idempotencyKey, body.idempotencyKey)),
        loadBatteryRows(tx, { siteId: actor.siteIds, batteryIds: [body.batteryInId] }),
        holdsBatteryChangingQualification(tx, actor.user.id, at, body.truckId),
        tx.select({ hourMeter: tables.truckStatus.hourMeter, holdReason: tables.truckStatus.holdReason }).from(tables.truckStatus).where(eq(tables.truckStatus.truckId, body.truckId)),
      ])
      if (!truck) throw codedError(404, 'no_such_truck', 'No such truck.')
      const siteId = truck.siteId
      requireActorCan(actor, 'swap.record', siteId)
      checkOverrideRole(actor, siteId, body.overrideReason)
      const placeOf = new Map(places.map(p => [p.batteryId, p.truckId]))
      const locked = lockedRows.filter(b => b.siteId === siteId).map(b => ({ ...b, currentTruckId: placeOf.get(b.id) ?? null }))
      const batteryIn = locked.find(b => b.id === body.batteryInId)
      if (!batteryIn) throw codedError(404, 'no_such_battery', 'No such battery at this site.', { fields: ['batteryInId'] })
      if (body.batteryOutId && !locked.some(b => b.id === body.batteryOutId)) {
        throw codedError(404, 'no_such_battery', 'No such battery at this site.', { fields: ['batteryOutId'] })
      }
      // a retry of a swap already stored (read under the locks, so two copies in flight store one)
      const again = ownRecord(stored, actor)
      if (again) return { item: again, replayed: true, warnings: [] as FitReason[] }
      if (atError) throw atError
      const ctx = await cachedSiteContext(actor, siteId, tx)
      const settings = ctx.settings
      if (truck.power !== 'electric') throw badField('truckId', 'truck_not_electric', `Truck ${truck.fleetNumber} is not electric; it takes no battery.`, { truck: truck.fleetNumber })
      // a truck that failed a critical item of its pre-shift check stays out of service (29 CFR 1910.178(q)(7))
      if (truckNow?.holdReason) throw refusal([{ code: 'inspection_hold', message: holdRefusal(truck.fleetNumber, truckNow.holdReason), params: { truck: truck.fleetNumber, reason: truckNow.holdReason } }], { overridable: false })
      const authorisation = await checkTruckAuthorisation(tx, actor, truck)
      const meter = truckNow?.hourMeter ?? truck.hourMeter
      if (body.hourMeter < meter) throw badField('hourMeter', 'hour_meter_back', `The hour meter last read ${meter} h; check the reading.`, { meter })

      // Hard stops: nobody overrides a battery that is somewhere else or a truck holding another battery.
      const hard: FitReason[] = []
      const current = locked.find(b => b.currentTruckId === truck.id)
      if (body.batteryOutId && current?.id !== body.batteryOutId) {
        hard.push({ code: 'battery_out_not_in_truck', params: { truck: truck.fleetNumber, battery: current?.serial ?? '', ...(current ? {} : { variant: 'empty_truck' }) }, message: current ? `Truck ${truck.fleetNumber} holds battery ${current.serial}, not the one scanned as coming out.` : `Truck ${truck.fleetNumber} has no battery recorded in it; leave "battery out" empty.` })
      }
      if (!body.batteryOutId && current) {
        hard.push({ code: 'truck_has_battery', params: { truck: truck.fleetNumber, battery: current.serial }, message: `Truck ${truck.fleetNumber} holds battery ${current.serial}; scan it as the battery coming out.` })
      }
      const row = rowsIn.find(f => f.id === batteryIn.id)
      if (!row) throw codedError(404, 'no_such_battery', 'No such battery at this site.')
      if (batteryIn.currentTruckId) {
        hard.push(batteryIn.currentTruckId === truck.id
          ? { code: 'already_in_this_truck', params: { battery: batteryIn.serial, truck: truck.fleetNumber }, message: `Battery ${batteryIn.serial} is already in truck ${truck.fleetNumber}.` }
          : { code: 'in_another_truck', params: { battery: batteryIn.serial, truck: row.truckFleetNumber ?? '' }, message: `Battery ${batteryIn.serial} is already in truck ${row.truckFleetNumber ?? 'another truck'}; someone has just taken it. Pick another battery.` })
      }
      const warnings: FitReason[] = []
      if (!qualified) {
        const q = { code: 'qualification_missing', message: 'You hold no current battery-changing qualification; ask a lead to record it.' }
        if (settings.qualificationPolicy === 'block') hard.push(q)
        else warnings.push(q)
      }
      if (hard.length) throw refusal(hard, { overridable: false })

      const status = batteryRoomStatus(row, ctx.timeZone, at)
      const soft = [
        ...batteryTruckFit(truckSpec(truck), row),
        ...status.readiness.filter(r => r.code !== 'already_in_truck'),
      ]
      const mayOverride = actorCan(actor, 'swap.override', siteId)
      if (soft.length && !body.overrideReason) {
        throw refusal(soft, { overridable: mayOverride, overrideReasonMinLength: OVERRIDE_REASON_MIN_LENGTH })
      }
      const overridden = soft.length ? soft : []
      const recorded = [...overridden, ...warnings]
      // The record and its audit row (its id and time made here so both go in one batch), then the read
      // models of both batteries and the truck from their records, this one included.
      const values = {
        id: randomUUID(), siteId, userId: actor.user.id, at, recordedAt: new Date(), idempotencyKey: body.idempotencyKey, note: body.note,
        truckId: truck.id, batteryOutId: body.batteryOutId ?? null, batteryInId: batteryIn.id, hourMeter: body.hourMeter,
        overrideReason: overridden.length ? body.overrideReason ?? null : null,
        overriddenChecks: recorded.length ? recorded : null,
        correctsId: null,
      }
      // Sent in this order on the transaction's connection (each call below sends its statement at once):
      // the record, its audit row, then the facts the read models come from, which see the record.
      const inserted = tx.insert(tables.batterySwaps).values(values).returning().then(rows => rows)
      const audited = writeAudit(tx, {
        actor, siteId, action: overridden.length ? 'swap_override' : 'swap', entity: 'battery_swap', entityId: values.id,
        after: values, note: overridden.length ? body.overrideReason : [...warnings.map(w => w.message), authorisation?.message ?? ''].join(' ').trim() || undefined,
      })
      const subjects: SubjectRef[] = [
        { kind: 'battery', id: batteryIn.id }, ...(body.batteryOutId ? [{ kind: 'battery' as const, id: body.batteryOutId }] : []), { kind: 'truck', id: truck.id },
      ]
      const computed = computeReadModels(tx, ctx, { battery: subjects.filter(x => x.kind === 'battery').map(x => x.id), truck: [truck.id] })
      const [[swap], , models] = await Promise.all([inserted, audited, computed])
      await writeReadModels(tx, { siteId, subjectIds: subjects.map(x => x.id) }, models)
      return { item: swap!, replayed: false, warnings, overridden, ...(authorisation ? { authorisation } : {}) }
    })
  }
  catch (error) {
    if (pgConstraint(error) === 'battery_swaps_idem') {
      const row = await storedSwap(useDb(), body.idempotencyKey, actor)
      if (row) return { item: row, replayed: true, warnings: [] as FitReason[] }
    }
    if (pgConstraint(error) === 'battery_status_one_per_truck') {
      throw refusal([{ code: 'in_another_truck', params: { variant: 'same_moment' }, message: 'That battery or truck changed at the same moment; someone has just taken it. Pick another battery.' }], { overridable: false })
    }
    throw error
  }
}

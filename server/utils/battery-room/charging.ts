import type { z } from 'zod'
import type { FitReason } from '#shared/utils/battery-fit'
import { chargerBatteryMatch } from '#shared/utils/battery-fit'
import { CHARGER_PROFILE_UNRECORDED, NO_EQUALIZE, chargesInTruck, isLithiumIon, takesEqualize } from '#shared/utils/chemistry-rules'
import { gridEnergyKwh, energyCost, isCountedCycle, ranHot } from '#shared/utils/charging'
import { OVERRIDE_REASON_MIN_LENGTH, type chargeEndSchema, type chargeStartSchema } from '#shared/utils/battery-room-schemas'
import type { DbOrTx } from '../db'
import type { Actor } from '../auth'

type BatteryRow = typeof tables.batteries.$inferSelect
type ChargeSession = typeof tables.chargeSessions.$inferSelect
export type ChargeStartInput = z.output<typeof chargeStartSchema>
export type ChargeEndInput = z.output<typeof chargeEndSchema>

/** One battery's card read in a transaction (after its read models were recomputed). */
async function cardOf(tx: DbOrTx, siteId: string, batteryId: string, timeZone: string) {
  const [row] = await loadBatteryRows(tx, { siteId, batteryIds: [batteryId] })
  return batteryRoomStatus(row!, timeZone, new Date())
}

// A battery goes on a charger: the pair must match (or a written override), the battery must be out
// of any truck and off every other charger.
export async function startChargeSession(actor: Actor, battery: Pick<BatteryRow, 'id' | 'siteId'>, body: ChargeStartInput) {
  const siteId = battery.siteId
  const cs = tables.chargeSessions
  const stored = async (db: DbOrTx) => ownRecord((await db.select().from(cs).where(eq(cs.idempotencyKey, body.idempotencyKey)))[0], actor)
  const replay = await stored(useDb())
  if (replay) return { item: replay, replayed: true }
  const at = eventTime(body.at, 'at')
  try {
    return await useDb().transaction(async (tx) => {
      // Statements that do not need each other's answers go together (postgres.js pipelines them on the
      // transaction's connection and PostgreSQL runs them in order, so the reads after the locks see what the
      // last write of this battery or charger committed): the locks and the reads, then the record with the
      // read models' facts (which see it), then its audit row with the read models.
      // (each builder is sent by its own then(), in the order written: given to Promise.all as it is, it would
      // be sent after the async look-ups, and a retry's "stored already?" would run before the locks)
      const lockedRows = tx.select().from(tables.batteries).where(eq(tables.batteries.id, battery.id)).for('update').then(rows => rows)
      const chargerRows = tx.select().from(tables.chargers).where(and(eq(tables.chargers.id, body.chargerId), eq(tables.chargers.siteId, siteId))).for('update').then(rows => rows)
      const [[locked], [charger], again, [row], [busy]] = await Promise.all([
        lockedRows,
        chargerRows,
        stored(tx),
        loadBatteryRows(tx, { siteId, batteryIds: [battery.id] }),
        tx.select({ id: cs.id }).from(cs).where(and(eq(cs.chargerId, body.chargerId), isNull(cs.endedAt), isNull(cs.correctsId))).then(rows => rows),
      ])
      if (!locked) throw codedError(404, 'no_such_battery', 'No such battery at this site.')
      if (!charger) throw codedError(404, 'no_such_charger', 'No such charger at this site.', { fields: ['chargerId'] })
      if (again) return { item: again, replayed: true }
      const hard: FitReason[] = []
      // lithium-ion charges in the truck during breaks (opportunity charging); lead-acid comes out first
      if (row?.truckId && !chargesInTruck(locked.chemistry)) hard.push({ code: 'in_truck', params: { battery: locked.serial, truck: row.truckFleetNumber ?? '' }, message: `Battery ${locked.serial} is in truck ${row.truckFleetNumber}; change it out of the truck first.` })
      if (row?.chargeSessionId) hard.push({ code: 'already_on_charge', params: { battery: locked.serial, charger: row.chargerName ?? '' }, message: `Battery ${locked.serial} is already on charger ${row.chargerName}.` })
      if (locked.outOfService) hard.push({ code: 'battery_out_of_service', params: { battery: locked.serial }, message: `Battery ${locked.serial} is out of service; return it to service first.` })
      if (charger.outOfService) hard.push({ code: 'charger_out_of_service', params: { charger: charger.name }, message: `Charger ${charger.name} is out of service.` })
      if (busy) hard.push({ code: 'charger_busy', params: { charger: charger.name }, message: `Charger ${charger.name} already has a battery on it; take that one off first.` })
      if (hard.length) throw refusal(hard, { overridable: false })
      const soft = chargerBatteryMatch(charger, locked)
      if (soft.length && !body.overrideReason) throw refusal(soft, { overridable: true, overrideReasonMinLength: OVERRIDE_REASON_MIN_LENGTH })
      const warnings = isLithiumIon(locked.chemistry) && charger.chemistryProfiles.length === 0 ? [CHARGER_PROFILE_UNRECORDED] : []
      // the site's kept context, asked for once the locks are held, so a load this request starts on its
      // transaction is not queued behind its own lock wait (inside a transaction it never waits for another
      // request's load: cachedConfigForSite's `inTransaction`)
      const ctx = await cachedSiteContext(actor, siteId, tx)
      const [[session], models] = await Promise.all([
        tx.insert(cs).values({
          siteId, userId: actor.user.id, at, idempotencyKey: body.idempotencyKey, note: body.note,
          batteryId: locked.id, chargerId: charger.id, overrideReason: soft.length ? body.overrideReason : null,
        }).returning().then(rows => rows),
        computeReadModels(tx, ctx, { battery: [locked.id] }),
      ])
      await Promise.all([
        writeAudit(tx, { actor, siteId, action: 'charge_on', entity: 'charge_session', entityId: session!.id, after: session, note: soft.length ? body.overrideReason : undefined }),
        writeReadModels(tx, { siteId, subjectIds: [locked.id] }, models),
      ])
      return { item: session!, replayed: false, overridden: soft, warnings }
    })
  }
  catch (error) {
    const constraint = pgConstraint(error)
    if (constraint === 'charge_sessions_idem') {
      const row = await stored(useDb())
      if (row) return { item: row, replayed: true }
    }
    if (constraint === 'charge_sessions_open_battery' || constraint === 'charge_sessions_open_charger') {
      throw refusal([{ code: 'charger_busy', params: { variant: 'same_moment' }, message: 'That battery or charger went on charge at the same moment; reload and check.' }], { overridable: false })
    }
    throw error
  }
}

// Ending a charge happens once: the same user sending the same readings again is a retry of that end.
function sameChargeEnd(row: ChargeSession, userId: string, body: ChargeEndInput): boolean {
  return row.endedAt !== null && row.endedBy === userId && row.ampHoursReturned === body.ampHoursReturned
    && row.endTempF === body.endTempF && row.outcome === body.outcome && row.equalize === body.equalize
}

async function chargeEndReplay(row: ChargeSession, db: DbOrTx = useDb()) {
  const settings = await batteryRoomSettings(db, row.siteId)
  const status = await cardOf(db, row.siteId, row.batteryId, settings.timeZone)
  return { item: row, status, currency: settings.currency, replayed: true }
}

/** A charge session at one of the user's sites; anything else is 404. */
export async function findChargeSession(actor: Actor, id: string): Promise<ChargeSession> {
  const cs = tables.chargeSessions
  const [found] = actor.siteIds.length ? await useDb().select().from(cs).where(and(eq(cs.id, id), inArray(cs.siteId, actor.siteIds))) : []
  if (!found) throw codedError(404, 'no_such_charge', 'No such charge session.')
  return found
}

// A battery comes off charge: energy and cost from the amp-hours, whether it counts as a cycle, the hot
// flag; the battery's status (cycles, charges since watering and equalize) follows from the record.
export async function endChargeSession(actor: Actor, found: ChargeSession, body: ChargeEndInput) {
  const cs = tables.chargeSessions
  if (found.endedAt) {
    if (sameChargeEnd(found, actor.user.id, body)) return chargeEndReplay(found)
    throw codedError(409, 'charge_already_ended', 'This charge has already been ended.')
  }
  const endedAt = eventTime(body.endedAt, 'endedAt')
  if (endedAt.getTime() < found.at.getTime()) throw badField('endedAt', 'charge_end_before_start', 'The charge cannot end before it started.')
  const settings = await cachedBatteryRoomSettings(actor, found.siteId)
  return useDb().transaction(async (tx) => {
    // the locked battery and its charger together, then the record with the read models' facts (which see
    // it), then its audit row with the read models (see startChargeSession)
    const [[battery], [charger]] = await Promise.all([
      tx.select().from(tables.batteries).where(eq(tables.batteries.id, found.batteryId)).for('update').then(rows => rows),
      tx.select().from(tables.chargers).where(eq(tables.chargers.id, found.chargerId)).then(rows => rows),
    ])
    // once the lock is held (see startChargeSession)
    const ctx = await cachedSiteContext(actor, found.siteId, tx)
    if (body.equalize && !takesEqualize(battery!.chemistry)) throw refusal([NO_EQUALIZE], { overridable: false, fields: { equalize: NO_EQUALIZE.message } }, 400)
    const gridKwh = gridEnergyKwh(body.ampHoursReturned, battery!.voltage, charger!.efficiency)
    const countedCycle = isCountedCycle({ complete: body.outcome === 'complete', ampHoursReturned: body.ampHoursReturned, ratedAh: battery!.capacityAh })
    const [[session], models] = await Promise.all([
      tx.update(cs).set({
        endedAt, endedBy: actor.user.id, ampHoursReturned: body.ampHoursReturned, endTempF: body.endTempF, packStateOfChargePct: body.packStateOfChargePct,
        equalize: body.equalize, outcome: body.outcome, gridKwh, energyCost: energyCost(gridKwh, settings.tariffPerKwh),
        countedCycle, ranHot: ranHot(body.endTempF, settings.maxChargeTempF),
        note: body.note ? [found.note, body.note].filter(Boolean).join('\n') : found.note,
      }).where(and(eq(cs.id, found.id), isNull(cs.endedAt))).returning().then(rows => rows),
      computeReadModels(tx, ctx, { battery: [battery!.id] }),
    ])
    if (!session) {
      const [now] = await tx.select().from(cs).where(eq(cs.id, found.id))
      if (now && sameChargeEnd(now, actor.user.id, body)) return chargeEndReplay(now, tx)
      throw codedError(409, 'charge_ended_same_moment', 'Someone ended this charge at the same moment; reload.')
    }
    await Promise.all([
      writeAudit(tx, { actor, siteId: found.siteId, action: 'charge_off', entity: 'charge_session', entityId: found.id, before: found, after: session }),
      writeReadModels(tx, { siteId: found.siteId, subjectIds: [battery!.id] }, models),
    ])
    const status = await cardOf(tx, found.siteId, battery!.id, settings.timeZone)
    return { item: session, status, currency: settings.currency }
  })
}

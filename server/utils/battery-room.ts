import type { H3Event } from 'h3'
import { randomUUID } from 'node:crypto'
import type { FitReason } from '#shared/utils/battery-fit'
import { batteryTruckFit, chargerBatteryMatch, rankBatteriesForTruck, isIssuableBattery } from '#shared/utils/battery-fit'
import { siteSettingsSchema, defaultSiteSettings, type SiteSettings } from '#shared/utils/site-settings'
import { gridEnergyKwh, energyCost, isCountedCycle, ranHot } from '#shared/utils/charging'
import {
  OVERRIDE_REASON_MIN_LENGTH, WATER_AFTER_CHARGE_CAUTION,
  boardQuerySchema, chargeEndSchema, chargeStartSchema, electrolyteCheckSchema, lookupQuerySchema, siteQuerySchema, swapBodySchema,
  justFinishedCharge, summarizeElectrolyteReadings, wateringBeforeChargeCaution,
} from '#shared/utils/battery-room-schemas'
import { normalizeTagCode } from '#shared/utils/tag-codes'
import { z } from 'zod'
import type { DbOrTx } from './db'
import type { Actor } from './auth'
import type { BatteryFactsRow } from './battery-room-facts'

/** The site's policy with defaults filled in; a stored value that no longer parses falls back to its default. */
export async function batteryRoomSettings(db: DbOrTx, siteId: string): Promise<SiteSettings & { timeZone: string }> {
  const [row] = await db.select({ settings: tables.sites.settings, timeZone: tables.sites.timeZone }).from(tables.sites).where(eq(tables.sites.id, siteId))
  const parsed = siteSettingsSchema.safeParse(row?.settings ?? {})
  const settings = parsed.success ? parsed.data : { ...defaultSiteSettings(), ...validSettingKeys(row?.settings) }
  return { ...settings, timeZone: row?.timeZone ?? 'UTC' }
}

/** The same, kept per site revision: settings only change by a write to the site, which moves the revision. */
export function cachedBatteryRoomSettings(actor: Actor, siteId: string) {
  return cachedForSite(actor, siteId, 'battery-room-settings', 60_000, () => batteryRoomSettings(useDb(), siteId))
}

function validSettingKeys(stored: unknown): Partial<SiteSettings> {
  if (!stored || typeof stored !== 'object') return {}
  const shape = siteSettingsSchema.shape as Record<string, z.ZodType>
  return Object.fromEntries(Object.entries(stored).filter(([k, v]) => shape[k]?.safeParse(v).success)) as Partial<SiteSettings>
}

/** A refused action: 409 with every reason in words. */
function refusal(reasons: FitReason[], extra: Record<string, unknown> = {}, statusCode = 409) {
  return createError({ statusCode, message: reasons.map(r => r.message).join(' '), data: { reasons, ...extra } })
}

function badField(field: string, message: string) {
  return createError({ statusCode: 400, message, data: { fields: { [field]: message } } })
}

function checkOverrideRole(actor: Actor, siteId: string, overrideReason: string | undefined) {
  if (overrideReason) requireActorCan(actor, 'swap.override', siteId)
}

async function oneBatteryFacts(db: DbOrTx, siteId: string, batteryId: string): Promise<BatteryFactsRow> {
  const [facts] = await loadBatteryFacts(db, { siteId, batteryIds: [batteryId] })
  if (!facts) throw createError({ statusCode: 404, message: 'No such battery at this site.' })
  return facts
}

const nullable = (v: number | null) => v ?? 0
const truckSpec = (t: typeof tables.trucks.$inferSelect) => ({
  systemVoltage: nullable(t.systemVoltage),
  connector: t.connector ?? '',
  allowedChemistries: t.allowedChemistries,
  compartmentLengthIn: nullable(t.compartmentLengthIn),
  compartmentWidthIn: nullable(t.compartmentWidthIn),
  compartmentHeightIn: nullable(t.compartmentHeightIn),
  minBatteryWeightLb: nullable(t.minBatteryWeightLb),
  maxBatteryWeightLb: nullable(t.maxBatteryWeightLb),
})

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

/** A record found by its retry key, refused when someone else made it. */
function ownRecord<R extends { userId: string }>(row: R | undefined, actor: Actor): R | undefined {
  if (row && row.userId !== actor.user.id) throw createError({ statusCode: 409, message: 'That retry key belongs to someone else\'s record; reload the form.' })
  return row
}

async function storedSwap(db: DbOrTx, key: string, actor: Actor) {
  const [row] = await db.select().from(tables.batterySwaps).where(eq(tables.batterySwaps.idempotencyKey, key))
  return ownRecord(row, actor)
}

// A battery swap: one transaction that locks the truck and the batteries, checks fit, readiness,
// place and qualification, then moves the batteries and records the swap. Statements that do not need
// each other's answers go together (postgres.js pipelines them on the transaction's connection, and
// PostgreSQL runs them in order), so a swap costs five round trips to the database: the actor, BEGIN,
// the locked reads, the writes, COMMIT.
export async function recordBatterySwap(event: H3Event) {
  const body = await validateBody(event, swapBodySchema)
  const actor = await requireActor(event)
  if (actor.siteIds.length === 0) throw createError({ statusCode: 404, message: 'No such truck.' })
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
  const s = tables.batterySwaps
  try {
    return await useDb().transaction(async (tx) => {
      // the truck, then both batteries and whichever battery the truck holds now (in id order), all locked
      const ids = [body.batteryInId, ...(body.batteryOutId ? [body.batteryOutId] : [])].sort()
      const [[truck], lockedAnywhere, [stored], factsRows, qualified] = await Promise.all([
        tx.select().from(tables.trucks)
          .where(and(eq(tables.trucks.id, body.truckId), inArray(tables.trucks.siteId, actor.siteIds))).for('update'),
        tx.select().from(t)
          .where(and(inArray(t.siteId, actor.siteIds), or(inArray(t.id, ids), eq(t.currentTruckId, body.truckId)))).orderBy(asc(t.id)).for('update'),
        tx.select().from(s).where(eq(s.idempotencyKey, body.idempotencyKey)),
        loadBatteryFacts(tx, { siteId: actor.siteIds, batteryIds: [body.batteryInId] }),
        holdsBatteryChangingQualification(tx, actor.user.id, at, body.truckId),
      ])
      if (!truck) throw createError({ statusCode: 404, message: 'No such truck.' })
      const siteId = truck.siteId
      await requireAbility(event, 'swap.record', siteId)
      checkOverrideRole(actor, siteId, body.overrideReason)
      const locked = lockedAnywhere.filter(b => b.siteId === siteId)
      const batteryIn = locked.find(b => b.id === body.batteryInId)
      if (!batteryIn) throw createError({ statusCode: 404, message: 'No such battery at this site.', data: { fields: { batteryInId: 'Not a battery at this site.' } } })
      if (body.batteryOutId && !locked.some(b => b.id === body.batteryOutId)) {
        throw createError({ statusCode: 404, message: 'No such battery at this site.', data: { fields: { batteryOutId: 'Not a battery at this site.' } } })
      }
      // a retry of a swap already stored (read under the locks, so two copies in flight store one)
      const again = ownRecord(stored, actor)
      if (again) return { item: again, replayed: true, warnings: [] as FitReason[] }
      if (atError) throw atError
      const settings = await cachedBatteryRoomSettings(actor, siteId)
      if (truck.power !== 'electric') throw badField('truckId', `Truck ${truck.fleetNumber} is not electric; it takes no battery.`)
      if (body.hourMeter < truck.hourMeter) {
        throw badField('hourMeter', `The hour meter last read ${truck.hourMeter} h; check the reading.`)
      }

      // Hard stops: nobody overrides a battery that is somewhere else or a truck holding another battery.
      const hard: FitReason[] = []
      const current = locked.find(b => b.currentTruckId === truck.id)
      if (body.batteryOutId && current?.id !== body.batteryOutId) {
        hard.push({ code: 'battery_out_not_in_truck', message: current ? `Truck ${truck.fleetNumber} holds battery ${current.serial}, not the one scanned as coming out.` : `Truck ${truck.fleetNumber} has no battery recorded in it; leave "battery out" empty.` })
      }
      if (!body.batteryOutId && current) {
        hard.push({ code: 'truck_has_battery', message: `Truck ${truck.fleetNumber} holds battery ${current.serial}; scan it as the battery coming out.` })
      }
      const facts = factsRows.find(f => f.id === batteryIn.id)
      if (!facts) throw createError({ statusCode: 404, message: 'No such battery at this site.' })
      if (batteryIn.currentTruckId) {
        hard.push(batteryIn.currentTruckId === truck.id
          ? { code: 'already_in_this_truck', message: `Battery ${batteryIn.serial} is already in truck ${truck.fleetNumber}.` }
          : { code: 'in_another_truck', message: `Battery ${batteryIn.serial} is already in truck ${facts.truckFleetNumber ?? 'another truck'}; someone has just taken it. Pick another battery.` })
      }
      const warnings: FitReason[] = []
      if (!qualified) {
        const q = { code: 'qualification_missing', message: 'You hold no current battery-changing qualification; ask a lead to record it.' }
        if (settings.qualificationPolicy === 'block') hard.push(q)
        else warnings.push(q)
      }
      if (hard.length) throw refusal(hard, { overridable: false })

      const status = batteryRoomStatus(facts, settings, at)
      const soft = [
        ...batteryTruckFit(truckSpec(truck), { ...batteryIn }),
        ...status.readiness.filter(r => r.code !== 'already_in_truck'),
      ]
      const mayOverride = actorCan(actor, 'swap.override', siteId)
      if (soft.length && !body.overrideReason) {
        throw refusal(soft, { overridable: mayOverride, overrideReasonMinLength: OVERRIDE_REASON_MIN_LENGTH })
      }
      const overridden = soft.length ? soft : []
      const recorded = [...overridden, ...warnings]
      // The moves, the record and its audit row, in this order (the battery coming out leaves first, so
      // the one-battery-per-truck index never sees two). The record's id and time are made here so the
      // audit row can go in the same batch.
      const values = {
        id: randomUUID(), siteId, userId: actor.user.id, at, recordedAt: new Date(), idempotencyKey: body.idempotencyKey, note: body.note,
        truckId: truck.id, batteryOutId: body.batteryOutId ?? null, batteryInId: batteryIn.id, hourMeter: body.hourMeter,
        overrideReason: overridden.length ? body.overrideReason ?? null : null,
        overriddenChecks: recorded.length ? recorded : null,
        correctsId: null,
      }
      const [, , , [swap]] = await Promise.all([
        body.batteryOutId ? tx.update(t).set({ currentTruckId: null }).where(eq(t.id, body.batteryOutId)) : null,
        tx.update(t).set({ currentTruckId: truck.id }).where(eq(t.id, batteryIn.id)),
        tx.update(tables.trucks).set({ hourMeter: body.hourMeter }).where(eq(tables.trucks.id, truck.id)),
        tx.insert(s).values(values).returning(),
        writeAudit(tx, {
          actor, siteId, action: overridden.length ? 'swap_override' : 'swap', entity: 'battery_swap', entityId: values.id,
          after: values, note: overridden.length ? body.overrideReason : warnings.map(w => w.message).join(' ') || undefined,
        }),
      ])
      setResponseStatus(event, 201)
      return { item: swap!, replayed: false, warnings, overridden }
    })
  }
  catch (error) {
    if (pgConstraint(error) === 'battery_swaps_idem') {
      const row = await storedSwap(useDb(), body.idempotencyKey, actor)
      if (row) return { item: row, replayed: true, warnings: [] as FitReason[] }
    }
    if (pgConstraint(error) === 'batteries_one_per_truck') {
      throw refusal([{ code: 'in_another_truck', message: 'That battery or truck changed at the same moment; someone has just taken it. Pick another battery.' }], { overridable: false })
    }
    throw error
  }
}

// A battery goes on a charger: the pair must match (or a written override), the battery must be out
// of any truck and off every other charger.
export async function startChargeSession(event: H3Event) {
  const body = await validateBody(event, chargeStartSchema)
  const { row: batteryRow } = await findAssetForActor(event, 'battery', body.batteryId)
  const siteId = batteryRow.siteId
  const actor = await requireAbility(event, 'charge.record', siteId)
  const cs = tables.chargeSessions
  const stored = async (db: DbOrTx) => ownRecord((await db.select().from(cs).where(eq(cs.idempotencyKey, body.idempotencyKey)))[0], actor)
  const replay = await stored(useDb())
  if (replay) return { item: replay, replayed: true }
  const at = eventTime(body.at, 'at')
  try {
    return await useDb().transaction(async (tx) => {
      const [battery] = await tx.select().from(tables.batteries).where(eq(tables.batteries.id, body.batteryId)).for('update')
      const [charger] = await tx.select().from(tables.chargers)
        .where(and(eq(tables.chargers.id, body.chargerId), eq(tables.chargers.siteId, siteId))).for('update')
      if (!battery) throw createError({ statusCode: 404, message: 'No such battery.' })
      if (!charger) throw createError({ statusCode: 404, message: 'No such charger at this site.', data: { fields: { chargerId: 'Not a charger at this site.' } } })
      const again = await stored(tx)
      if (again) return { item: again, replayed: true }
      const facts = await oneBatteryFacts(tx, siteId, battery.id)
      const hard: FitReason[] = []
      if (battery.currentTruckId) hard.push({ code: 'in_truck', message: `Battery ${battery.serial} is in truck ${facts.truckFleetNumber}; change it out of the truck first.` })
      if (facts.openChargeId) hard.push({ code: 'already_on_charge', message: `Battery ${battery.serial} is already on charger ${facts.openChargerName}.` })
      if (battery.outOfService) hard.push({ code: 'battery_out_of_service', message: `Battery ${battery.serial} is out of service; return it to service first.` })
      if (charger.outOfService) hard.push({ code: 'charger_out_of_service', message: `Charger ${charger.name} is out of service.` })
      const [busy] = await tx.select({ id: cs.id }).from(cs).where(and(eq(cs.chargerId, charger.id), isNull(cs.endedAt), isNull(cs.correctsId)))
      if (busy) hard.push({ code: 'charger_busy', message: `Charger ${charger.name} already has a battery on it; take that one off first.` })
      if (hard.length) throw refusal(hard, { overridable: false })
      const soft = chargerBatteryMatch(charger, battery)
      if (soft.length && !body.overrideReason) throw refusal(soft, { overridable: true, overrideReasonMinLength: OVERRIDE_REASON_MIN_LENGTH })
      const [session] = await tx.insert(cs).values({
        siteId, userId: actor.user.id, at, idempotencyKey: body.idempotencyKey, note: body.note,
        batteryId: battery.id, chargerId: charger.id, overrideReason: soft.length ? body.overrideReason : null,
      }).returning()
      await writeAudit(tx, { actor, siteId, action: 'charge_on', entity: 'charge_session', entityId: session!.id, after: session, note: soft.length ? body.overrideReason : undefined })
      setResponseStatus(event, 201)
      return { item: session!, replayed: false, overridden: soft }
    })
  }
  catch (error) {
    const constraint = pgConstraint(error)
    if (constraint === 'charge_sessions_idem') {
      const row = await stored(useDb())
      if (row) return { item: row, replayed: true }
    }
    if (constraint === 'charge_sessions_open_battery' || constraint === 'charge_sessions_open_charger') {
      throw refusal([{ code: 'charger_busy', message: 'That battery or charger went on charge at the same moment; reload and check.' }], { overridable: false })
    }
    throw error
  }
}

const sessionParams = z.object({ id: z.uuid() })

// Ending a charge happens once: the same user sending the same readings again is a retry of that end.
function sameChargeEnd(row: typeof tables.chargeSessions.$inferSelect, userId: string, body: z.output<typeof chargeEndSchema>): boolean {
  return row.endedAt !== null && row.endedBy === userId && row.ampHoursReturned === body.ampHoursReturned
    && row.endTempF === body.endTempF && row.outcome === body.outcome && row.equalize === body.equalize
}

async function chargeEndReplay(row: typeof tables.chargeSessions.$inferSelect) {
  const settings = await batteryRoomSettings(useDb(), row.siteId)
  const status = batteryRoomStatus(await oneBatteryFacts(useDb(), row.siteId, row.batteryId), settings, new Date())
  return { item: row, status, currency: settings.currency, replayed: true }
}

// A battery comes off charge: energy and cost from the amp-hours, the cycle count, the hot flag.
export async function endChargeSession(event: H3Event) {
  const { id } = validateParams(event, sessionParams)
  const body = await validateBody(event, chargeEndSchema)
  const actorSeen = await requireActor(event)
  const cs = tables.chargeSessions
  const [found] = actorSeen.siteIds.length
    ? await useDb().select().from(cs).where(and(eq(cs.id, id), inArray(cs.siteId, actorSeen.siteIds)))
    : []
  if (!found) throw createError({ statusCode: 404, message: 'No such charge session.' })
  const actor = await requireAbility(event, 'charge.record', found.siteId)
  if (found.endedAt) {
    if (sameChargeEnd(found, actor.user.id, body)) return chargeEndReplay(found)
    throw createError({ statusCode: 409, message: 'This charge has already been ended.' })
  }
  const endedAt = eventTime(body.endedAt, 'endedAt')
  if (endedAt.getTime() < found.at.getTime()) throw badField('endedAt', 'The charge cannot end before it started.')
  const settings = await batteryRoomSettings(useDb(), found.siteId)
  return useDb().transaction(async (tx) => {
    const [battery] = await tx.select().from(tables.batteries).where(eq(tables.batteries.id, found.batteryId)).for('update')
    const [charger] = await tx.select().from(tables.chargers).where(eq(tables.chargers.id, found.chargerId))
    const gridKwh = gridEnergyKwh(body.ampHoursReturned, battery!.voltage, charger!.efficiency)
    const countedCycle = isCountedCycle({ complete: body.outcome === 'complete', ampHoursReturned: body.ampHoursReturned, ratedAh: battery!.capacityAh })
    const [session] = await tx.update(cs).set({
      endedAt, endedBy: actor.user.id, ampHoursReturned: body.ampHoursReturned, endTempF: body.endTempF,
      equalize: body.equalize, outcome: body.outcome, gridKwh, energyCost: energyCost(gridKwh, settings.tariffPerKwh),
      countedCycle, ranHot: ranHot(body.endTempF, settings.maxChargeTempF),
      note: body.note ? [found.note, body.note].filter(Boolean).join('\n') : found.note,
    }).where(and(eq(cs.id, id), isNull(cs.endedAt))).returning()
    if (!session) {
      const [now] = await tx.select().from(cs).where(eq(cs.id, id))
      if (now && sameChargeEnd(now, actor.user.id, body)) return chargeEndReplay(now)
      throw createError({ statusCode: 409, message: 'Someone ended this charge at the same moment; reload.' })
    }
    if (countedCycle) {
      await tx.update(tables.batteries).set({ cycleCount: sql`${tables.batteries.cycleCount} + 1` }).where(eq(tables.batteries.id, battery!.id))
    }
    await writeAudit(tx, { actor, siteId: found.siteId, action: 'charge_off', entity: 'charge_session', entityId: id, before: found, after: session })
    const status = batteryRoomStatus(await oneBatteryFacts(tx, found.siteId, battery!.id), settings, new Date())
    return { item: session, status, currency: settings.currency }
  })
}

// An electrolyte check: level, water, and pilot-cell or every-cell readings corrected to the site's
// reference temperature; warns when water goes in before a charge.
export async function recordElectrolyteCheck(event: H3Event) {
  const body = await validateBody(event, electrolyteCheckSchema)
  const { row } = await findAssetForActor(event, 'battery', body.batteryId)
  const siteId = row.siteId
  const actor = await requireAbility(event, 'reading.record', siteId)
  const ec = tables.electrolyteChecks
  const stored = async (db: DbOrTx) => ownRecord((await db.select().from(ec).where(eq(ec.idempotencyKey, body.idempotencyKey)))[0], actor)
  const replay = await stored(useDb())
  if (replay) return { item: replay, replayed: true, warnings: [] as FitReason[] }
  if (row.chemistry !== 'flooded_lead_acid') throw badField('batteryId', 'Only flooded lead-acid batteries take water and hydrometer readings.')
  const cellCount = Number(row.cellCount)
  const outside = body.cells.findIndex(c => c.cellNumber > cellCount)
  if (outside >= 0) throw badField(`cells.${outside}.cellNumber`, `This battery has ${cellCount} cells.`)
  if (body.scope === 'every_cell' && body.cells.length !== cellCount) {
    throw badField('cells', `Enter all ${cellCount} cells (${body.cells.length} entered).`)
  }
  const at = eventTime(body.at, 'at')
  const settings = await batteryRoomSettings(useDb(), siteId)
  const summary = summarizeElectrolyteReadings(body.cells, { referenceTempF: settings.sgReferenceTempF, correctionPerDegF: settings.sgCorrectionPerDegF }, settings.cellSpreadThreshold)
  try {
    return await useDb().transaction(async (tx) => {
      await tx.select({ id: tables.batteries.id }).from(tables.batteries).where(eq(tables.batteries.id, row.id)).for('update')
      const facts = await oneBatteryFacts(tx, siteId, row.id)
      const timing = {
        waterAddedGal: body.waterAddedGal,
        chargeOpen: facts.openChargeId !== null,
        lastChargeEndedAt: facts.lastChargeEndedMs === null ? null : new Date(facts.lastChargeEndedMs),
        lastInstalledAt: facts.lastInstalledMs === null ? null : new Date(facts.lastInstalledMs),
      }
      const warnings: FitReason[] = []
      if (wateringBeforeChargeCaution(timing, at)) warnings.push({ code: 'water_before_charge', message: WATER_AFTER_CHARGE_CAUTION })
      const [check] = await tx.insert(ec).values({
        siteId, userId: actor.user.id, at, idempotencyKey: body.idempotencyKey, note: body.note,
        batteryId: row.id, level: body.level, waterAddedGal: body.waterAddedGal, scope: body.cells.length ? body.scope : null,
        referenceTempF: settings.sgReferenceTempF, correctionPerDegF: settings.sgCorrectionPerDegF,
        meanCorrectedSg: summary.meanCorrectedSg, spread: body.scope === 'every_cell' ? summary.spread : null,
        lowCellCount: summary.lowCells.length, stateOfChargePct: summary.stateOfChargePct,
        afterCharge: justFinishedCharge(timing, at),
      }).returning()
      if (summary.cells.length) {
        await tx.insert(tables.cellReadings).values(summary.cells.map(c => ({ checkId: check!.id, ...c })))
      }
      await writeAudit(tx, { actor, siteId, action: 'electrolyte_check', entity: 'electrolyte_check', entityId: check!.id, after: { ...check, cells: summary.cells }, note: warnings.map(w => w.message).join(' ') || undefined })
      const status = batteryRoomStatus(await oneBatteryFacts(tx, siteId, row.id), settings, new Date())
      setResponseStatus(event, 201)
      return { item: check!, cells: summary.cells, lowCells: summary.lowCells, replayed: false, warnings, status }
    })
  }
  catch (error) {
    if (pgConstraint(error) === 'electrolyte_checks_idem') {
      const again = await stored(useDb())
      if (again) return { item: again, replayed: true, warnings: [] as FitReason[] }
    }
    throw error
  }
}

/** A battery as the board and the floor forms show it. */
export function batteryCard(f: BatteryFactsRow, settings: SiteSettings, now: Date) {
  const status = batteryRoomStatus(f, settings, now)
  return {
    id: f.id, serial: f.serial, tagCode: f.tagCode, homeAreaId: f.homeAreaId, chemistry: f.chemistry,
    voltage: f.voltage, cellCount: f.cellCount, capacityAh: f.capacityAh, weightLb: f.weightLb, connector: f.connector,
    cycleCount: f.cycleCount, ratedCycles: f.ratedCycles, outOfServiceReason: f.outOfService ? f.outOfServiceReason : null,
    state: status.state, label: status.label, coolingMinutesLeft: status.coolingMinutesLeft,
    readyAt: status.readyAt?.toISOString() ?? null, flags: status.flagList, readiness: status.readiness,
    truck: f.currentTruckId ? { id: f.currentTruckId, fleetNumber: f.truckFleetNumber, tagCode: f.truckTagCode } : null,
    charge: f.openChargeId
      ? { id: f.openChargeId, chargerId: f.openChargerId, chargerName: f.openChargerName, since: new Date(f.openChargeSinceMs!).toISOString() }
      : null,
    lastChargeEndedAt: f.lastChargeEndedMs === null ? null : new Date(f.lastChargeEndedMs).toISOString(),
    justCharged: justFinishedCharge({
      chargeOpen: f.openChargeId !== null,
      lastChargeEndedAt: f.lastChargeEndedMs === null ? null : new Date(f.lastChargeEndedMs),
      lastInstalledAt: f.lastInstalledMs === null ? null : new Date(f.lastInstalledMs),
    }, now),
    lastStateOfChargePct: f.lastStateOfChargePct,
  }
}
export type BatteryCard = ReturnType<typeof batteryCard>

// The Bay board: every battery of an area (or the site) grouped by state, the electric trucks to
// pick from, and for a chosen truck the batteries in the order to take them.
// Wall screens and phones poll the board; one computation per site revision serves them all for a few
// seconds (the cooling countdown moves with the clock alone, so the time limit is short).
const BOARD_CACHE_MS = 5_000

export async function batteryBoard(event: H3Event) {
  const query = validateQuery(event, boardQuerySchema)
  const actor = await requireAbility(event, 'site.member', query.siteId)
  return cachedJsonForSite(event, actor, query.siteId, `board:${query.areaId ?? ''}:${query.truckId ?? ''}`, BOARD_CACHE_MS, () => computeBoard(query))
}

async function computeBoard(query: z.output<typeof boardQuerySchema>) {
  const db = useDb()
  const now = new Date()
  const [settings, areas, facts, trucks] = await Promise.all([
    batteryRoomSettings(db, query.siteId),
    db.select({ id: tables.areas.id, name: tables.areas.name }).from(tables.areas)
      .where(and(eq(tables.areas.siteId, query.siteId), eq(tables.areas.kind, 'charging_area'), eq(tables.areas.archived, false)))
      .orderBy(asc(tables.areas.name)),
    loadBatteryFacts(db, { siteId: query.siteId, areaId: query.areaId }),
    db.select().from(tables.trucks)
      .where(and(eq(tables.trucks.siteId, query.siteId), eq(tables.trucks.power, 'electric')))
      .orderBy(asc(tables.trucks.fleetNumber)),
  ])
  if (query.areaId && !areas.some(a => a.id === query.areaId)) throw createError({ statusCode: 404, message: 'No such charging area at this site.' })
  const cards = facts.map(f => batteryCard(f, settings, now))
  let suggestion = null
  if (query.truckId) {
    const truck = trucks.find(t => t.id === query.truckId)
    if (!truck) throw createError({ statusCode: 404, message: 'No such electric truck at this site.' })
    const spec = truckSpec(truck)
    const ranked = rankBatteriesForTruck(cards.filter(c => c.state !== 'in_truck').map((c) => {
      const f = facts.find(x => x.id === c.id)!
      return {
        id: c.id, ready: c.readiness.length === 0, cycleCount: c.cycleCount,
        restedSince: c.readyAt ? new Date(c.readyAt) : null,
        fitReasons: batteryTruckFit(spec, { ...f }),
      }
    }))
    const issuable = ranked.filter(isIssuableBattery)
    suggestion = {
      truckId: truck.id,
      choice: issuable[0]?.id ?? null,
      ranked: issuable.slice(0, 5).map(r => r.id),
      compatibleNotReady: ranked.filter(r => r.fitReasons.length === 0 && !r.ready).length,
    }
  }
  const byTruck = new Map(cards.filter(c => c.truck).map(c => [c.truck!.id, c]))
  return {
    now: now.toISOString(),
    areaId: query.areaId ?? null,
    areas,
    policy: { coolDownMinutes: settings.coolDownMinutes, cellSpreadThreshold: settings.cellSpreadThreshold },
    batteries: cards,
    trucks: trucks.map(t => ({ id: t.id, fleetNumber: t.fleetNumber, systemVoltage: t.systemVoltage, outOfService: t.outOfService, batteryId: byTruck.get(t.id)?.id ?? null })),
    suggestion,
  }
}

// A typed or scanned code (tag code, battery serial, truck fleet number or charger name) at a site,
// with what the floor forms need to know about it.
export async function lookupFloorCode(event: H3Event) {
  const query = validateQuery(event, lookupQuerySchema)
  await requireAbility(event, 'site.member', query.siteId)
  const db = useDb()
  const code = normalizeTagCode(query.code)
  let target: { kind: string, id: string } | undefined
  if (code) {
    const [tag] = await db.select().from(tables.tags).where(and(eq(tables.tags.code, code), eq(tables.tags.siteId, query.siteId)))
    if (tag) target = { kind: tag.assetKind, id: tag.assetId }
  }
  if (!target) {
    const typed = query.code.trim().toLowerCase()
    const [bat] = await db.select({ id: tables.batteries.id }).from(tables.batteries).where(and(eq(tables.batteries.siteId, query.siteId), sql`lower(${tables.batteries.serial}) = ${typed}`))
    const [trk] = bat ? [] : await db.select({ id: tables.trucks.id }).from(tables.trucks).where(and(eq(tables.trucks.siteId, query.siteId), sql`lower(${tables.trucks.fleetNumber}) = ${typed}`))
    const [chg] = bat || trk ? [] : await db.select({ id: tables.chargers.id }).from(tables.chargers).where(and(eq(tables.chargers.siteId, query.siteId), sql`lower(${tables.chargers.name}) = ${typed}`))
    target = bat ? { kind: 'battery', id: bat.id } : trk ? { kind: 'truck', id: trk.id } : chg ? { kind: 'charger', id: chg.id } : undefined
  }
  if (!target) throw createError({ statusCode: 404, message: `No battery, truck or charger "${query.code.trim()}" at this site. Check the label and type it again.` })
  const liveTag = async (kind: string, id: string) =>
    (await db.select({ code: tables.tags.code }).from(tables.tags).where(and(eq(tables.tags.assetKind, kind as never), eq(tables.tags.assetId, id), isNull(tables.tags.retiredAt))))[0]?.code ?? null
  if (target.kind === 'battery') {
    const settings = await batteryRoomSettings(db, query.siteId)
    const facts = await oneBatteryFacts(db, query.siteId, target.id)
    return { kind: 'battery' as const, id: target.id, code: facts.tagCode, label: facts.serial, battery: batteryCard(facts, settings, new Date()) }
  }
  if (target.kind === 'truck') {
    const [truck] = await db.select().from(tables.trucks).where(eq(tables.trucks.id, target.id))
    const [current] = await db.select({ id: tables.batteries.id, serial: tables.batteries.serial }).from(tables.batteries).where(eq(tables.batteries.currentTruckId, target.id))
    return {
      kind: 'truck' as const, id: target.id, code: await liveTag('truck', target.id), label: truck!.fleetNumber,
      truck: {
        fleetNumber: truck!.fleetNumber, power: truck!.power, systemVoltage: truck!.systemVoltage, hourMeter: truck!.hourMeter,
        outOfService: truck!.outOfService, currentBattery: current ? { ...current, tagCode: await liveTag('battery', current.id) } : null,
      },
    }
  }
  if (target.kind === 'charger') {
    const [charger] = await db.select().from(tables.chargers).where(eq(tables.chargers.id, target.id))
    const cs = tables.chargeSessions
    const [open] = await db.select({ id: cs.id, batteryId: cs.batteryId, at: cs.at, serial: tables.batteries.serial }).from(cs)
      .innerJoin(tables.batteries, eq(tables.batteries.id, cs.batteryId))
      .where(and(eq(cs.chargerId, target.id), isNull(cs.endedAt), isNull(cs.correctsId)))
    return {
      kind: 'charger' as const, id: target.id, code: await liveTag('charger', target.id), label: charger!.name,
      charger: { name: charger!.name, outputVoltage: charger!.outputVoltage, outOfService: charger!.outOfService, chemistryProfiles: charger!.chemistryProfiles, minCapacityAh: charger!.minCapacityAh, maxCapacityAh: charger!.maxCapacityAh, openSession: open ?? null },
    }
  }
  throw createError({ statusCode: 404, message: `"${query.code.trim()}" is not a battery, truck or charger.` })
}

// Swaps and charges that went ahead despite a refused check or with a recorded warning, newest first.
export async function batteryRoomOverrides(event: H3Event) {
  const query = validateQuery(event, siteQuerySchema)
  await requireAbility(event, 'report.view', query.siteId)
  const db = useDb()
  const [swaps, charges] = await Promise.all([
    db.execute(sql`
      SELECT s.id, (EXTRACT(EPOCH FROM s.at) * 1000)::float8 AS "atMs", s.override_reason AS "overrideReason", s.overridden_checks AS "checks",
             u.name AS "who", t.fleet_number AS "truck", bi.serial AS "batteryIn", bo.serial AS "batteryOut"
      FROM battery_swaps s
      JOIN users u ON u.id = s.user_id
      JOIN trucks t ON t.id = s.truck_id
      JOIN batteries bi ON bi.id = s.battery_in_id
      LEFT JOIN batteries bo ON bo.id = s.battery_out_id
      WHERE s.site_id = ${query.siteId} AND s.overridden_checks IS NOT NULL
      ORDER BY s.at DESC LIMIT 200`),
    db.execute(sql`
      SELECT c.id, (EXTRACT(EPOCH FROM c.at) * 1000)::float8 AS "atMs", c.override_reason AS "overrideReason", u.name AS "who", b.serial AS "battery", ch.name AS "charger"
      FROM charge_sessions c
      JOIN users u ON u.id = c.user_id
      JOIN batteries b ON b.id = c.battery_id
      JOIN chargers ch ON ch.id = c.charger_id
      WHERE c.site_id = ${query.siteId} AND c.override_reason IS NOT NULL
      ORDER BY c.at DESC LIMIT 200`),
  ])
  const iso = (v: unknown) => new Date(Number(v)).toISOString()
  const items = [
    ...(swaps as unknown as Record<string, unknown>[]).map(s => ({
      id: `swap-${s.id}`, kind: 'swap' as const, at: iso(s.atMs), who: s.who as string,
      what: `Battery ${s.batteryIn} into truck ${s.truck}${s.batteryOut ? ` (out: ${s.batteryOut})` : ''}`,
      reason: (s.overrideReason as string | null) ?? null, checks: (s.checks as FitReason[] | null) ?? [],
    })),
    ...(charges as unknown as Record<string, unknown>[]).map(c => ({
      id: `charge-${c.id}`, kind: 'charge' as const, at: iso(c.atMs), who: c.who as string,
      what: `Battery ${c.battery} on charger ${c.charger}`, reason: c.overrideReason as string, checks: [] as FitReason[],
    })),
  ].sort((a, b) => b.at.localeCompare(a.at))
  return { items }
}
